// Ticket attachments through the real server: hostile files refused on `file` (types from the
// bytes, per-kind size limits, a picture that claims too many pixels), names reduced to a plain
// base name, pending uploads seen and claimed by their uploader only, downloads that never run
// as content, the pending cap and the server-wide cap on uploads in flight.
import { request as httpRequest, type ClientRequest } from 'node:http'
import { beforeAll, describe, expect, it } from 'vitest'
import type { Client } from '../helpers/client'
import { PDF_BYTES, PNG_BYTES, newTeacher, signedIn } from '../helpers/shop'
import { openTicket, pngClaiming, ticketSpace, upload, uploaded } from '../helpers/tickets'
import {
  ATTACHMENT_LIMIT_BYTES,
  IMAGE_MAX_SIDE,
  PENDING_UPLOAD_HOURS,
  PENDING_UPLOADS_MAX,
} from '../../shared/utils/tickets'
import { sql, sweepRunsAgain } from '../helpers/db'

type World = Awaited<ReturnType<typeof ticketSpace>>
let w: World
let support: Client

beforeAll(async () => {
  w = await ticketSpace('up')
  support = await signedIn('support@tiltwright.test')
})

const fieldError = (r: { status: number, body: any }) => {
  expect(r.status, JSON.stringify(r.body)).toBe(422)
  return r.body.data.fields.file as string
}

describe('hostile uploads', () => {
  it('refuses HTML named .png and an SVG, whatever their names and types say', async () => {
    const html = Buffer.from('<!doctype html><html><script>alert(1)</script></html>')
    expect(fieldError(await upload(w.one.client, html, 'photo.png', 'image/png')))
      .toMatch(/whatever its name says/)
    const svg = Buffer.from(
      '<svg xmlns="http://www.w3.org/2000/svg"><script>alert(1)</script></svg>',
    )
    expect(fieldError(await upload(w.one.client, svg, 'rig.svg', 'image/svg+xml')))
      .toMatch(/not a photo, video or PDF/)
  })

  it('refuses a PDF over its kind\'s limit with 422 and a body over the upload limit with 413',
    async () => {
      // Within what the upload route receives (the video limit) but over the PDF limit: the
      // server sees the whole file, judges its kind from the bytes and says so on `file` (422).
      const big = Buffer.concat([PDF_BYTES, Buffer.alloc(ATTACHMENT_LIMIT_BYTES.pdf)])
      expect(fieldError(await upload(w.one.client, big, 'manual.pdf', 'application/pdf')))
        .toMatch(/the limit is 8\.0 MB/)
      // Past the largest kind's limit the body is refused while it streams in (413): nothing
      // past the limit is kept, so there is no file to judge.
      const huge = Buffer.concat([PDF_BYTES, Buffer.alloc(ATTACHMENT_LIMIT_BYTES.video + 70_000)])
      const r = await upload(w.one.client, huge, 'huge.pdf', 'application/pdf')
      expect(r.status).toBe(413)
    })

  it('refuses a small PNG that claims 50000 × 50000 pixels (a decompression bomb)', async () => {
    const bomb = pngClaiming(50_000, 50_000)
    expect(bomb.length).toBeLessThan(2_000)
    expect(fieldError(await upload(w.one.client, bomb, 'bomb.png'))).toMatch(/50000 × 50000/)
    // One side past the limit is refused too; a modest picture of the same make passes.
    expect(fieldError(await upload(w.one.client, pngClaiming(IMAGE_MAX_SIDE + 1, 10), 'w.png')))
      .toMatch(/more than Tiltwright opens/)
    const fine = await uploaded(w.one.client, pngClaiming(640, 480), 'fine.png')
    expect(fine.kind).toBe('image')
  })

  it('refuses a name with a folder path; a plain name keeps its words and gets its real ending',
    async () => {
      for (const name of ['../../etc/passwd.png', '..\\..\\windows\\evil.png', '..'])
        expect(fieldError(await upload(w.one.client, PNG_BYTES, name))).toMatch(/folder path/)
      // The extension comes from the bytes, not the name.
      const c = await uploaded(w.one.client, PDF_BYTES, 'notes (v2).png')
      expect(c.filename).toBe('notes (v2).pdf')
      expect(c.kind).toBe('pdf')
    })
})

describe('pending uploads and downloads', () => {
  it('deletes a file no message sent within a day, and keeps a newer one', async () => {
    const old = await uploaded(w.one.client, PNG_BYTES, 'left-behind.png')
    const fresh = await uploaded(w.one.client, PNG_BYTES, 'still-typing.png')
    await sql(
      'UPDATE ticket_attachments SET created_at = NOW(3) - INTERVAL ? HOUR WHERE id = ?',
      [PENDING_UPLOAD_HOURS + 1, old.id],
    )
    await sweepRunsAgain()
    const left = await sql<{ id: number }>(
      'SELECT id FROM ticket_attachments WHERE id IN (?, ?)', [old.id, fresh.id])
    expect(left.map(r => r.id)).toEqual([fresh.id])
    expect((await w.one.client.raw(old.url)).status).toBe(404)
    expect((await w.one.client.raw(fresh.url)).status).toBe(200)
    expect((await w.one.client.delete(fresh.url)).status).toBe(204)
  })

  it('shows a pending file to its uploader only, and only the uploader can send it', async () => {
    const photo = await uploaded(w.one.client, PNG_BYTES, 'rig.png')
    expect((await w.one.client.raw(photo.url)).status).toBe(200)
    for (const c of [w.teacher.client, w.two.client, support])
      expect((await c.raw(photo.url)).status).toBe(404)
    // Another person cannot send it with their message …
    const theirs = await openTicket(w.two.client, { rigId: w.rigs[1]!.id })
    const stolen = await w.two.client.post(`/api/tickets/${theirs}/messages`, {
      body: 'Look at this', attachmentIds: [photo.id],
    })
    expect(stolen.status).toBe(422)
    expect(stolen.body.data.fields.attachmentIds).toMatch(/no longer waiting to be sent/)
    // … nor delete it.
    expect((await w.two.client.delete(photo.url)).status).toBe(404)

    const pdf = await uploaded(w.one.client, PDF_BYTES, 'wiring.pdf')
    const id = await openTicket(w.one.client, {
      rigId: w.rigs[0]!.id, attachmentIds: [photo.id, pdf.id],
    })
    const thread = (await w.teacher.client.get(`/api/tickets/${id}`)).body
    expect(thread.messages[0].attachments.map((a: any) => a.id)).toEqual([photo.id, pdf.id])
    // Sent: whoever sees the ticket may download it; nobody else.
    for (const c of [w.teacher.client, support])
      expect((await c.raw(photo.url)).status).toBe(200)
    const outsider = (await newTeacher('up-out')).client
    for (const c of [w.two.client, outsider]) expect((await c.raw(photo.url)).status).toBe(404)
    // A sent file can no longer be removed or sent again.
    expect((await w.one.client.delete(photo.url)).status).toBe(404)
    const again = await w.one.client.post(`/api/tickets/${id}/messages`, {
      body: 'Again', attachmentIds: [photo.id],
    })
    expect(again.status).toBe(422)

    const res = await w.teacher.client.raw(pdf.url)
    expect(res.headers.get('content-disposition')).toBe('attachment; filename="wiring.pdf"')
    expect(res.headers.get('content-type')).toBe('application/pdf')
    expect(res.headers.get('x-content-type-options')).toBe('nosniff')
    expect(res.headers.get('content-security-policy')).toMatch(/^sandbox; default-src 'none'/)
    expect(res.headers.get('cache-control')).toContain('no-store')
    expect(Buffer.from(await res.arrayBuffer()).equals(PDF_BYTES)).toBe(true)
    // A preview may show a photo inline, never a PDF.
    const img = await w.teacher.client.raw(`${photo.url}?inline=1`)
    expect(img.headers.get('content-disposition')).toMatch(/^inline;/)
    expect(img.headers.get('content-security-policy')).toMatch(/sandbox/)
    const doc = await w.teacher.client.raw(`${pdf.url}?inline=1`)
    expect(doc.headers.get('content-disposition')).toMatch(/^attachment;/)
  })

  it('lets the uploader remove a pending file', async () => {
    const photo = await uploaded(w.one.client, PNG_BYTES, 'oops.png')
    expect((await w.one.client.delete(photo.url)).status).toBe(204)
    expect((await w.one.client.raw(photo.url)).status).toBe(404)
  })

  it('caps a person\'s pending files, however many arrive at once', async () => {
    const teacher = (await newTeacher('up-cap')).client
    const results = await Promise.all(
      Array.from({ length: PENDING_UPLOADS_MAX + 3 }, async (_, i) => {
        // Spaced a little so the server-wide cap on uploads in flight does not answer first.
        await new Promise(r => setTimeout(r, i * 15))
        return upload(teacher, PNG_BYTES, `p${i}.png`)
      }),
    )
    const codes = results.map(r => r.status)
    const took = codes.filter(s => s === 201).length
    expect(took).toBeLessThanOrEqual(PENDING_UPLOADS_MAX)
    for (const r of results.filter(x => x.status === 422))
      expect(r.body.data.fields.file).toMatch(/waiting to be sent/)
    // Keep going one by one until the cap answers: it never lets more than the cap through.
    for (let i = took; i < PENDING_UPLOADS_MAX; i++)
      expect((await upload(teacher, PNG_BYTES, 'more.png')).status).toBe(201)
    expect(fieldError(await upload(teacher, PNG_BYTES, 'one-too-many.png')))
      .toMatch(/waiting to be sent/)
  })

  it('answers 429 while four uploads are still arriving, and takes them again after',
    async () => {
      const headers = await w.teacher.client.authHeaders()
      const base = new URL(w.teacher.client.baseUrl)
      const boundary = 'slowboundary'
      const head = Buffer.from(
        `--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="s.png"\r\n`
        + 'Content-Type: image/png\r\n\r\n',
      )
      const tail = Buffer.from(`\r\n--${boundary}--\r\n`)
      const length = head.length + PNG_BYTES.length + tail.length
      const slow: { req: ClientRequest, done: Promise<number> }[] = []
      for (let i = 0; i < 4; i++) {
        let req!: ClientRequest
        const done = new Promise<number>((resolve, reject) => {
          req = httpRequest(
            {
              host: base.hostname,
              port: base.port,
              path: '/api/ticket-attachments',
              method: 'POST',
              headers: {
                ...headers,
                'content-type': `multipart/form-data; boundary=${boundary}`,
                'content-length': String(length),
              },
            },
            (res) => {
              res.resume()
              resolve(res.statusCode ?? 0)
            },
          )
          req.on('error', reject)
        })
        req.write(head)
        slow.push({ req, done })
      }
      await new Promise(r => setTimeout(r, 500))
      const busy = await upload(w.teacher.client, PNG_BYTES, 'busy.png')
      expect(busy.status).toBe(429)
      expect(busy.body.message).toMatch(/Try again in a moment/)
      expect(busy.headers.get('retry-after')).toBe('5')
      for (const s of slow) s.req.end(Buffer.concat([PNG_BYTES, tail]))
      expect(await Promise.all(slow.map(s => s.done))).toEqual([201, 201, 201, 201])
      expect((await upload(w.teacher.client, PNG_BYTES, 'after.png')).status).toBe(201)
    })
})
