// Uploads through an S3-compatible bucket, chosen by configuration alone: a second instance of
// the same build started with TILTWRIGHT_UPLOADS_DRIVER=s3 keeps a purchase order in a local
// S3 server (s3rver, from npm) and serves it back byte for byte; nothing lands on local disk.
import { randomBytes } from 'node:crypto'
import { existsSync, readdirSync, readFileSync, rmSync, statSync } from 'node:fs'
import { join, resolve } from 'node:path'
import S3rver from 's3rver'
// s3rver's one account; the test gives it throwaway keys and revokes the built-in pair, so
// every request the app signs is checked against keys made for this run.
import AWSAccount from 's3rver/lib/models/account.js'
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest'
import { projectRoot } from '../../scripts/lib/mariadb'
import { startAppInstance, type AppInstance } from '../helpers/instance'
import { sql } from '../helpers/db'
import { newTeacher, PDF_BYTES, poForm, productWithStock, signedIn } from '../helpers/shop'
import { SUFFIX } from '../setup/slot'

const appPort = Number(new URL(inject('baseUrl')).port)
const s3Port = appPort + 82
const bucket = 'tiltwright-uploads'
const s3Dir = resolve(projectRoot, `data/s3-test${SUFFIX}`)

function filesUnder(dir: string): string[] {
  if (!existsSync(dir)) return []
  return readdirSync(dir).flatMap((name) => {
    const p = join(dir, name)
    return statSync(p).isDirectory() ? filesUnder(p) : [p]
  })
}

let s3: S3rver
let app: AppInstance

beforeAll(async () => {
  rmSync(s3Dir, { recursive: true, force: true })
  const accessKeyId = `AK${randomBytes(8).toString('hex').toUpperCase()}`
  const secretAccessKey = randomBytes(24).toString('base64')
  AWSAccount.DUMMY_ACCOUNT.revokeAccessKey('S3RVER')
  AWSAccount.DUMMY_ACCOUNT.createKeyPair(accessKeyId, secretAccessKey)
  s3 = new S3rver({
    address: '127.0.0.1',
    port: s3Port,
    silent: true,
    directory: s3Dir,
    configureBuckets: [{ name: bucket, configs: [] }],
  })
  await s3.run()
  app = await startAppInstance(appPort + 81, {
    TILTWRIGHT_UPLOADS_DRIVER: 's3',
    TILTWRIGHT_S3_ENDPOINT: `http://127.0.0.1:${s3Port}`,
    TILTWRIGHT_S3_BUCKET: bucket,
    TILTWRIGHT_S3_ACCESS_KEY_ID: accessKeyId,
    TILTWRIGHT_S3_SECRET_ACCESS_KEY: secretAccessKey,
  })
}, 60_000)

afterAll(async () => {
  await app?.kill()
  await s3?.close()
})

describe('uploads on an S3-compatible bucket', () => {
  it('keeps a purchase order in the bucket and serves it back byte for byte', async () => {
    const admin = await signedIn('admin@tiltwright.test')
    const { productId } = await productWithStock(admin, 5)
    const t = await newTeacher('s3')
    const there = t.client.clone(app.url)
    await there.page('/')
    // A PDF of its own, so the bytes found in the bucket can only be this upload's.
    const mark = Buffer.from(`\n% ${randomBytes(12).toString('hex')}\n`)
    const bytes = Buffer.concat([PDF_BYTES, mark])
    const r = await there.post(
      '/api/checkout/purchase-order',
      poForm({
        lines: [{ productId, quantity: 1 }],
        poFile: { data: bytes, name: 'district order.pdf' },
      }),
    )
    expect(r.status).toBe(201)
    const order = (await there.get(`/api/orders/${r.body.orderId}`)).body
    const doc = order.documents.find((d: any) => d.kind === 'purchase-order')
    const file = await there.raw(doc.url)
    expect(file.status).toBe(200)
    expect(Buffer.from(await file.arrayBuffer()).equals(bytes)).toBe(true)

    const [row] = await sql<{ key: string }>(
      `SELECT storage_key AS \`key\` FROM stored_files
       WHERE order_id = ? AND kind = 'purchase-order'`,
      [r.body.orderId],
    )
    // In the bucket under its key (s3rver keeps an object as files named after the key)…
    const objects = filesUnder(join(s3Dir, bucket)).filter(f =>
      readFileSync(f).equals(bytes),
    )
    expect(objects).toHaveLength(1)
    expect(objects[0]).toContain(row!.key.replaceAll(':', '/'))
    // …and not in the local folder the build's own mount would use.
    const local = filesUnder(resolve(projectRoot, `data/uploads-test${SUFFIX}`))
    expect(local.filter(f => readFileSync(f).equals(bytes))).toEqual([])
    // The instance on local disk cannot read it: the driver decided where it went.
    expect((await t.client.raw(doc.url)).status).toBe(404)
  })

  it('refuses to start with a half-configured bucket, naming what is missing', async () => {
    const { runAppExpectingExit } = await import('../helpers/instance')
    const r = await runAppExpectingExit(appPort + 83, {
      TILTWRIGHT_UPLOADS_DRIVER: 's3',
      TILTWRIGHT_S3_ENDPOINT: `http://127.0.0.1:${s3Port}`,
    })
    expect(r.code).toBe(1)
    expect(r.log).toMatch(/TILTWRIGHT_S3_BUCKET is not set/)
    expect(r.log).toMatch(/TILTWRIGHT_S3_SECRET_ACCESS_KEY is not set/)
  })
})
