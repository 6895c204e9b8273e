// Faults rehearsed as an operator meets them (docs/faults.md): the SMTP server gone while
// orders and tickets are placed, MariaDB killed under a load of writes, and an app process
// killed in the middle of checkouts. Each ends with every mail sent exactly once and the
// data whole: no order, reservation or ticket half-written, stock equal to what is held.
import { rmSync } from 'node:fs'
import { resolve } from 'node:path'
import { afterAll, afterEach, describe, expect, it } from 'vitest'
import { projectRoot, ping, startMariaDb } from '../../scripts/lib/mariadb'
import { startMailCatcher } from '../../scripts/mail-catcher'
import { Client } from '../helpers/client'
import { dataProblems, heldUnits } from '../helpers/consistency'
import { jobsSettled, sql } from '../helpers/db'
import {
  killDatabase,
  restartDatabase,
  startAppInstance,
  type AppInstance,
} from '../helpers/instance'
import { mailsTo, refuseMail } from '../helpers/mail'
import {
  APPROVE,
  newTeacher,
  payOnPage,
  poForm,
  productBySlug,
  productWithStock,
  signedIn,
  simulator,
} from '../helpers/shop'
import { APP_PORT, MAIL_HTTP_PORT, SMTP_PORT, SUFFIX, testDatabase } from '../setup/slot'

// A second app instance and a mail catcher of this file's own, on ports clear of the suite's
// and of the other files' second instance (APP_PORT + 50).
const OTHER_APP_PORT = APP_PORT + 60
const OWN_SMTP_PORT = SMTP_PORT + 40
const OWN_MAIL_HTTP_PORT = MAIL_HTTP_PORT + 40

/** The database's clock: what `created_at` is compared with (the app stamps rows with it). */
async function dbNow() {
  return (await sql<{ now: Date }>('SELECT NOW(3) AS now'))[0]!.now
}

/** With TILTWRIGHT_TEST_LOG set, what a fault test saw (how many writes, how many refused). */
const note = (line: string) => {
  if (process.env.TILTWRIGHT_TEST_LOG) console.info(`[faults] ${line}`)
}

const pause = (ms: number) => new Promise(r => setTimeout(r, ms))

/** A request that may not hang: anything slower than `ms` counts as no answer (status 0). */
async function answered<T>(work: Promise<{ status: number, body: T }>, ms = 10_000) {
  let timer: ReturnType<typeof setTimeout> | undefined
  const late = new Promise<{ status: number, body: null }>((r) => {
    timer = setTimeout(() => r({ status: 0, body: null }), ms)
  })
  try {
    return await Promise.race([
      work.catch(() => ({ status: -1, body: null })),
      late,
    ])
  } finally {
    clearTimeout(timer)
  }
}

/** Waits until the API answers three reads in a row (the pool drops dead connections on use). */
async function apiSteady(client = new Client(), timeoutMs = 30_000) {
  const deadline = Date.now() + timeoutMs
  let good = 0
  while (good < 3) {
    good = (await answered(client.get('/api/products'), 5000)).status === 200 ? good + 1 : 0
    if (Date.now() > deadline) throw new Error('the API did not answer steadily again')
    if (good < 3) await pause(150)
  }
}

/** A product of `initial` units, and a confirmed teacher of a new school for each tag. */
async function stockAndTeachers(initial: number, tags: string[]) {
  const admin = await signedIn('admin@tiltwright.test')
  const product = await productWithStock(admin, initial)
  return { ...product, teachers: await Promise.all(tags.map(t => newTeacher(t))) }
}

let other: AppInstance | null = null
afterEach(async () => {
  await other?.kill('SIGKILL')
  other = null
  await refuseMail(false)
  await simulator({ api: 'normal', webhooks: 'deliver' })
})
afterAll(async () => {
  if (!ping(testDatabase())) await startMariaDb(testDatabase())
  await apiSteady()
})

describe('SMTP down while orders and tickets are placed, then back', () => {
  it('holds every mail and delivers each exactly once when SMTP returns', async () => {
    // Confirmed before the outage: confirming needs the mailed link.
    const { productId, teachers } = await stockAndTeachers(40, ['smtp-a', 'smtp-b'])
    rmSync(resolve(projectRoot, `data/mail-faults${SUFFIX}.jsonl`), { force: true })
    // This instance's SMTP port is closed (connection refused) until its catcher starts; the
    // suite's server meanwhile refuses mail (451), so neither instance can deliver anything.
    // Both instances run the one queue of jobs.
    other = await startAppInstance(OTHER_APP_PORT, {
      NUXT_SMTP_PORT: String(OWN_SMTP_PORT),
      NUXT_OUTBOX_RETRY_BASE_MS: '200',
    })
    await refuseMail(true)
    const since = await dbNow()

    for (const t of teachers) {
      const c = t.client.clone(other.url)
      for (const quantity of [1, 2]) {
        const r = await c.post('/api/checkout/card', { lines: [{ productId, quantity }] })
        expect(r.status, JSON.stringify(r.body)).toBe(201)
        const ticket = await c.post('/api/tickets', {
          orderId: r.body.orderId,
          subject: `Parts of order ${r.body.orderId}`,
          message: 'Which washer goes under the pivot?',
        })
        expect(ticket.status, JSON.stringify(ticket.body)).toBe(201)
      }
      // One purchase order through the suite's own instance too.
      const po = await t.client.post(
        '/api/checkout/purchase-order',
        poForm({ lines: [{ productId, quantity: 3 }] }),
      )
      expect(po.status, JSON.stringify(po.body)).toBe(201)
    }

    const queued = () =>
      sql<{ to: string, subject: string, state: string, attempts: number, error: string | null }>(
        `SELECT JSON_VALUE(payload, '$.to') AS \`to\`, JSON_VALUE(payload, '$.subject') AS subject,
         state, attempts, last_error AS error FROM jobs WHERE kind = 'mail' AND created_at >= ?`,
        [since],
      )
    // Two orders and two tickets per teacher, and a purchase order: at least a mail each, each
    // tried, and both outages met (an error is overwritten by the next try, so they add up).
    const seen = new Set<string>()
    await expect.poll(async () => {
      const jobs = await queued()
      for (const j of jobs) {
        if (/ECONNREFUSED/.test(j.error ?? '')) seen.add('closed port')
        if (/451|temporarily/.test(j.error ?? '')) seen.add('refusing server')
      }
      return jobs.length >= 9 && jobs.every(j => j.attempts > 0) && seen.size === 2
    }, { timeout: 20_000, interval: 100 }).toBe(true)
    const waiting = await queued()
    expect(waiting.every(j => j.state === 'pending')).toBe(true)
    // The suite's server caught only each teacher's confirmation, from before the outage.
    for (const t of teachers) expect(await mailsTo(t.email)).toHaveLength(1)

    // SMTP is back for both: the closed port opens, the refusing server accepts again.
    const catcher = await startMailCatcher({
      smtpPort: OWN_SMTP_PORT,
      httpPort: OWN_MAIL_HTTP_PORT,
      name: `faults${SUFFIX}`,
      quiet: true,
    })
    try {
      await refuseMail(false)
      await jobsSettled({ kind: 'mail', since }, 60_000)
      const jobs = await queued()
      note(`SMTP: ${jobs.length} mails held, up to ${Math.max(
        ...waiting.map(j => j.attempts),
      )} tries each before SMTP was back`)
      expect(jobs.every(j => j.state === 'done')).toBe(true)
      // Each held mail reached one of the two servers exactly once (whichever instance ran
      // its job). The suite's server holds older mail too: only these jobs' mails count.
      const key = (to: string, subject: string) => `${to.toLowerCase()} | ${subject}`
      const expected = jobs.map(j => key(j.to, j.subject)).sort()
      const own = await mailsTo('', `http://127.0.0.1:${OWN_MAIL_HTTP_PORT}`)
      const suites = (
        await Promise.all([...new Set(jobs.map(j => j.to))].map(to => mailsTo(to)))
      ).flat().filter(m => expected.includes(key(m.to.join(','), m.subject)))
      const caught = [...own, ...suites]
      expect(caught.map(m => key(m.to.join(','), m.subject)).sort()).toEqual(expected)
      for (const t of teachers) {
        const placed = caught.filter(m => m.to.includes(t.email) && /placed$/.test(m.subject))
        expect(placed).toHaveLength(3)
      }
    } finally {
      await catcher.close()
    }
  }, 120_000)
})

interface Outcome {
  op: string
  startedAt: number
  status: number
  code?: string
  id?: number
}

describe('MariaDB killed and restarted under a load of writes', () => {
  it(
    'answers "briefly unavailable" while it is down, recovers in the same process and '
    + 'leaves no half-written order, ticket or reservation', async () => {
      const initial = 300
      const tags = ['db-a', 'db-b', 'db-c']
      const { productId, slug, teachers } = await stockAndTeachers(initial, tags)
      const since = await dbNow()
      // Each teacher's first order, for the tickets to be about.
      const firsts = await Promise.all(teachers.map(async (t) => {
        const r = await t.client.post(
          '/api/checkout/purchase-order',
          poForm({ lines: [{ productId, quantity: 2 }] }),
        )
        expect(r.status, JSON.stringify(r.body)).toBe(201)
        return r.body.orderId as number
      }))

      const outcomes: Outcome[] = []
      let stop = false
      const write = async (c: Client, orderId: number, n: number): Promise<Outcome> => {
        const startedAt = Date.now()
        const kind = ['purchase-order', 'ticket', 'card'][n % 3]!
        const r = await answered(
          kind === 'purchase-order'
            ? c.post(
                '/api/checkout/purchase-order',
                poForm({ lines: [{ productId, quantity: 1 }] }),
              )
            : kind === 'ticket'
              ? c.post('/api/tickets', {
                  orderId,
                  subject: `Load ticket ${n}`,
                  message: 'The beam tips to one side.',
                })
              : c.post('/api/checkout/card', { lines: [{ productId, quantity: 1 }] }),
        )
        const body = r.body as { orderId?: number, id?: number, data?: { code?: string } } | null
        return {
          op: kind,
          startedAt,
          status: r.status,
          code: body?.data?.code,
          id: body?.orderId ?? body?.id,
        }
      }
      const workers = teachers.map(async (t, w) => {
        for (let n = 0; !stop; n++) {
          const o = await write(t.client, firsts[w]!, n)
          outcomes.push(o)
          // A card order is cancelled at once, giving its stock back (and keeping the school
          // under its cap of unpaid card orders).
          if (o.op === 'card' && o.status === 201) {
            const startedAt = Date.now()
            const c = await answered(t.client.post(`/api/orders/${o.id}/cancel`, {}))
            outcomes.push({ op: 'cancel', startedAt, status: c.status, id: o.id })
          }
          // A refused write is retried after a breath, as a page's "try again" would be.
          if (o.status >= 500) await pause(100)
        }
      })

      await expect.poll(() => outcomes.filter(o => o.status === 201).length, {
        timeout: 20_000,
        interval: 50,
      }).toBeGreaterThanOrEqual(6)
      killDatabase()
      const killedAt = Date.now()
      await pause(2500)
      const probe = await answered(new Client().get('/api/products'))
      expect(probe.status).toBe(503)
      const restartAt = Date.now()
      await restartDatabase()
      const upAt = Date.now()
      await apiSteady()
      // Every writer gets through again, on the same app process.
      const succeededAfter = (t: number) =>
        new Set(outcomes.filter(o => o.startedAt > t && o.status === 201).map(o => o.op))
      await expect.poll(() => succeededAfter(upAt).size, { timeout: 30_000 }).toBe(3)
      stop = true
      await Promise.all(workers)

      // While it was down (after the connections in flight had failed): the envelope, fast.
      const down = outcomes.filter(o => o.startedAt > killedAt + 500 && o.startedAt < restartAt)
      expect(down.length).toBeGreaterThan(3)
      for (const o of down) expect({ op: o.op, status: o.status, code: o.code })
        .toEqual({ op: o.op, status: 503, code: 'unavailable' })
      // Never a hang or a dropped connection; a write either succeeded or was refused clearly.
      for (const o of outcomes)
        expect(o.op === 'cancel' ? [200, 503] : [201, 409, 502, 503], JSON.stringify(o))
          .toContain(o.status)

      const tally = (list: Outcome[]) =>
        JSON.stringify(list.reduce<Record<number, number>>((n, o) => {
          n[o.status] = (n[o.status] ?? 0) + 1
          return n
        }, {}))
      note(`database: ${outcomes.length} writes ${tally(outcomes)}, while down ${tally(down)}, `
        + `down ${restartAt - killedAt} ms, restart ${upAt - restartAt} ms`)
      await jobsSettled({ since }, 60_000)
      expect(await dataProblems({ since, productIds: [productId] })).toEqual([])
      // Every write the app confirmed is there.
      const confirmed = outcomes.filter(o => o.status === 201)
      const orderIds = confirmed.filter(o => o.op === 'card' || o.op === 'purchase-order')
        .map(o => o.id!)
      const cancelled = outcomes.filter(o => o.op === 'cancel' && o.status === 200).map(o => o.id!)
      expect(cancelled.length).toBeGreaterThan(0)
      const [{ n: stillLive }] = await sql(
        `SELECT COUNT(*) AS n FROM orders WHERE id IN (?) AND status <> 'cancelled'`,
        [cancelled],
      )
      expect(Number(stillLive)).toBe(0)
      const ticketIds = confirmed.filter(o => o.op === 'ticket').map(o => o.id!)
      const [{ n: ordersFound }] = await sql('SELECT COUNT(*) AS n FROM orders WHERE id IN (?)', [
        orderIds,
      ])
      expect(Number(ordersFound)).toBe(orderIds.length)
      const [{ n: ticketsFound }] = await sql('SELECT COUNT(*) AS n FROM tickets WHERE id IN (?)', [
        ticketIds,
      ])
      expect(Number(ticketsFound)).toBe(ticketIds.length)
      // Stock = what was built − what live orders hold, as the catalog shows it.
      const held = (await heldUnits([productId])).get(productId) ?? 0
      expect(held).toBeGreaterThanOrEqual(orderIds.length - cancelled.length)
      expect((await productBySlug(slug)).available).toBe(initial - held)
    }, 150_000)
})

describe('the app killed in the middle of checkouts', () => {
  it(
    'leaves stock, orders and payments agreeing once it is started again; a paid '
    + 'session ends in a paid order once', async () => {
      const initial = 60
      const tags = ['kill-a', 'kill-b', 'kill-c']
      const { productId, slug, teachers } = await stockAndTeachers(initial, tags)
      const schools = teachers.map(t => t.user.schoolId as number)
      const since = await dbNow()
      other = await startAppInstance(OTHER_APP_PORT)
      // The payment service is slow: each checkout has saved its order and waits on it.
      await simulator({ api: 'slow', slowMs: 3000 })
      const ordersOfSchools = () =>
        sql<{ id: number, status: string, session: string | null }>(
          `SELECT id, status, checkout_session_id AS session FROM orders
           WHERE school_id IN (?) ORDER BY id`,
          [schools],
        )
      const replies = teachers.flatMap(t => [1, 2, 3].map(() =>
        answered(t.client.clone(other!.url).post('/api/checkout/card', {
          lines: [{ productId, quantity: 2 }],
        }), 20_000),
      ))
      await expect.poll(async () => (await ordersOfSchools()).length, {
        timeout: 15_000,
        interval: 50,
      }).toBeGreaterThanOrEqual(3)
      await other.kill('SIGKILL')
      // The buyers' requests end with the dropped connection, not an answer.
      for (const r of await Promise.all(replies)) expect(r.status).toBe(-1)
      await simulator({ api: 'normal' })
      other = await startAppInstance(OTHER_APP_PORT)

      // The durable jobs open the payment pages the dead process never got back.
      await jobsSettled({ since }, 60_000)
      const orders = await ordersOfSchools()
      note(`app killed: ${orders.length} of 9 checkouts left an order, each finished by its job`)
      expect(orders.length).toBeGreaterThanOrEqual(3)
      expect(await dataProblems({ since, productIds: [productId] })).toEqual([])
      // One session at the provider per order, never a second from the retried job.
      for (const o of orders) {
        expect(o.status).toBe('awaiting payment')
        const sessions = await sql<{ id: string }>(
          `SELECT id FROM fake_payment_objects WHERE type = 'checkout.session'
           AND JSON_VALUE(data, '$.metadata.orderId') = ?`,
          [String(o.id)],
        )
        expect(sessions.map(s => s.id)).toEqual([o.session])
      }
      expect((await productBySlug(slug)).available).toBe(initial - 2 * orders.length)

      // Each page paid on the restarted instance ends in one paid order, one receipt.
      for (const o of orders) {
        const url = `${other.url}/fake-pay/checkout/${o.session}`
        expect((await payOnPage(url, APPROVE)).status).toBe(303)
      }
      await expect.poll(async () => (await ordersOfSchools()).map(o => o.status), {
        timeout: 30_000,
      }).toEqual(orders.map(() => 'paid'))
      await jobsSettled({ since }, 60_000)
      expect(await dataProblems({ since, productIds: [productId] })).toEqual([])
      for (const t of teachers) {
        const mails = await mailsTo(t.email)
        const placed = mails.filter(m => /^Order TW-\d+ placed$/.test(m.subject))
        const receipts = mails.filter(m => /^Payment received for order/.test(m.subject))
        expect(new Set(placed.map(m => m.subject)).size).toBe(placed.length)
        expect(receipts.length).toBe(placed.length)
      }
      const [{ n: placedMails }] = await sql(
        `SELECT COUNT(*) AS n FROM jobs WHERE kind = 'mail' AND created_at >= ?
         AND JSON_VALUE(payload, '$.subject') LIKE 'Order TW-% placed'`,
        [since],
      )
      expect(Number(placedMails)).toBe(orders.length)
    }, 150_000)
})
