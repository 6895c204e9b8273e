// Payment events late, twice and out of order (docs/faults.md): the provider's events are
// taken from the local payment simulator while its deliveries are switched off, then posted to
// the webhook signed with this run's secret, as the simulator's events.ts signs them, in the
// order a test chooses; the simulator's own retries deliver them once more at the end. Each
// order ends in the right state once: one "paid" entry, one receipt, one refund.
import type Stripe from 'stripe'
import { afterEach, describe, expect, it } from 'vitest'
import type { Client } from '../helpers/client'
import { jobsSettled, sql, sweepRunsAgain } from '../helpers/db'
import { mailsTo } from '../helpers/mail'
import {
  APPROVE,
  approvedPurchaseOrder,
  cardOrder,
  fakeStripe,
  payOnPage,
  postWebhook,
  simulator,
  waitForOrder,
} from '../helpers/shop'

afterEach(() => simulator({ api: 'normal', webhooks: 'deliver' }))

/** The simulator's stored event of `type` about the object `objectId`. */
async function eventAbout(type: string, objectId: string): Promise<Stripe.Event> {
  const list = await fakeStripe().events.list({ type, limit: 100 })
  const hit = list.data.find(e => (e.data.object as { id?: string }).id === objectId)
  if (!hit) throw new Error(`the simulator holds no ${type} event about ${objectId}`)
  return hit
}

/** Lets the simulator's held deliveries go, and waits until they and what they queue ran. */
async function deliveriesSettle(email: string) {
  await simulator({ webhooks: 'deliver' })
  await jobsSettled({ kind: 'fake-webhook' }, 60_000)
  await jobsSettled({ to: email })
}

const kinds = (order: { events: { kind: string }[] }) => order.events.map(e => e.kind)
const count = (order: { events: { kind: string }[] }, kind: string) =>
  kinds(order).filter(k => k === kind).length
const mailsAbout = async (email: string, subject: RegExp) =>
  (await mailsTo(email)).filter(m => subject.test(m.subject))

/** The order is paid once: its state, one "paid" entry, one receipt, and its stock still held.
 *  Answers the order. */
async function paidOnce(c: Client, orderId: number, email: string, batchId: number, held: number) {
  const order = (await c.get(`/api/orders/${orderId}`)).body
  expect(order.status).toBe('paid')
  expect(count(order, 'paid')).toBe(1)
  expect(await mailsAbout(email, /^Payment received for order/)).toHaveLength(1)
  const [batch] = await sql('SELECT reserved FROM batches WHERE id = ?', [batchId])
  expect(batch.reserved).toBe(held)
  return order
}

describe('payment events delivered twice, late and out of order', () => {
  it('records a payment delivered twice at once, and again later, once', async () => {
    const { t, orderId, url, batchId } = await cardOrder('twice')
    await simulator({ webhooks: 'fail' })
    expect((await payOnPage(url, APPROVE)).status).toBe(303)
    const completed = await eventAbout('checkout.session.completed', url.split('/').pop()!)
    const both = await Promise.all([postWebhook(completed), postWebhook(completed)])
    expect(both.map(r => r.status)).toEqual([200, 200])
    expect(both.map(r => r.body.duplicate).sort()).toEqual([false, true])
    await deliveriesSettle(t.email)

    await paidOnce(t.client, orderId, t.email, batchId, 2)
  })

  it(
    'refunds a payment that arrives after the order was cancelled once, however often '
    + 'its event comes', async () => {
      const { t, orderId, url, batchId } = await cardOrder('late-twice')
      // The page cannot be closed (the service is down) and the buyer pays on it meanwhile.
      await simulator({ api: 'fail', webhooks: 'fail' })
      expect((await t.client.post(`/api/orders/${orderId}/cancel`, {})).status).toBe(200)
      expect((await payOnPage(url, APPROVE)).status).toBe(303)
      await simulator({ api: 'normal' })
      const completed = await eventAbout('checkout.session.completed', url.split('/').pop()!)
      const late = await Promise.all([postWebhook(completed), postWebhook(completed)])
      expect(late.map(r => r.status)).toEqual([200, 200])
      expect((await postWebhook(completed)).body.duplicate).toBe(true)
      await waitForOrder(t.client, orderId, o => !!o.refundedAt, 20_000)
      await deliveriesSettle(t.email)
      await jobsSettled({ orderId })

      const order = (await t.client.get(`/api/orders/${orderId}`)).body
      expect(order.status).toBe('cancelled')
      expect(order.paidAt).toBeNull()
      expect(count(order, 'refunded')).toBe(1)
      expect(count(order, 'paid')).toBe(0)
      const refunds = await sql(
        `SELECT state FROM jobs WHERE kind = 'refund-payment'
         AND JSON_VALUE(payload, '$.orderId') = ?`,
        [orderId],
      )
      expect(refunds.map(r => r.state)).toEqual(['done'])
      const session = await fakeStripe().checkout.sessions.retrieve(url.split('/').pop()!)
      const intent = await fakeStripe().paymentIntents.retrieve(session.payment_intent as string)
      expect((intent as { amount_refunded?: number }).amount_refunded).toBe(order.totalCents)
      expect(await mailsAbout(t.email, /^Refund for order/)).toHaveLength(1)
      expect(await mailsAbout(t.email, /^Payment received/)).toHaveLength(0)
      const [batch] = await sql('SELECT reserved FROM batches WHERE id = ?', [batchId])
      expect(batch.reserved).toBe(0)
    })

  it(
    'keeps a paid order paid when the session\'s "expired" event arrives after '
    + '"completed", and the hold sweep passes it by', async () => {
      const { t, orderId, url, batchId } = await cardOrder('out-of-order')
      const sessionId = url.split('/').pop()!
      expect((await payOnPage(url, APPROVE)).status).toBe(303)
      await waitForOrder(t.client, orderId, o => o.status === 'paid', 20_000)
      const session = await fakeStripe().checkout.sessions.retrieve(sessionId)
      const completed = await eventAbout('checkout.session.completed', sessionId)
      const expired = {
        ...completed,
        id: `evt_late_expired_${orderId}_${Date.now()}`,
        type: 'checkout.session.expired',
        created: completed.created + 1,
        data: { object: { ...session, status: 'expired', payment_status: 'unpaid' } },
      }
      const r = await postWebhook(expired)
      expect(r.status).toBe(200)
      expect(r.body.duplicate).toBe(false)
      expect((await postWebhook(completed)).body.duplicate).toBe(true)
      // Past its hold: the sweep would cancel an unpaid order now, and must leave this one.
      await sql('UPDATE orders SET created_at = NOW(3) - INTERVAL 49 HOUR WHERE id = ?', [orderId])
      await sweepRunsAgain()
      await sweepRunsAgain()
      await jobsSettled({ to: t.email })

      const order = await paidOnce(t.client, orderId, t.email, batchId, 2)
      expect(kinds(order)).not.toContain('cancelled')
      expect(kinds(order)).not.toContain('expired')
      expect(await mailsAbout(t.email, /cancelled$/)).toHaveLength(0)
    })

  it(
    'pays a purchase order once when its invoice events come in the wrong order, '
    + 'twice, and a "voided" after "paid"', async () => {
      const { admin, t, orderId: id, batchId, invoiceId, payUrl } = await approvedPurchaseOrder(
        'invoice-order',
        3,
        'ap-order@district.test',
      )
      expect(invoiceId).toMatch(/^in_/)
      await jobsSettled({ kind: 'fake-webhook' })
      await simulator({ webhooks: 'fail' })
      expect((await payOnPage(payUrl, APPROVE)).status).toBe(303)

      const finalized = await eventAbout('invoice.finalized', invoiceId)
      const paid = await eventAbout('invoice.paid', invoiceId)
      const invoice = await fakeStripe().invoices.retrieve(invoiceId)
      const voided = {
        ...paid,
        id: `evt_late_voided_${id}_${Date.now()}`,
        type: 'invoice.voided',
        created: paid.created + 1,
        data: { object: { ...invoice, status: 'void' } },
      }
      // Paid first, then the older "finalized", paid again twice at once, then a "voided".
      expect((await postWebhook(paid)).body.duplicate).toBe(false)
      expect((await postWebhook(finalized)).body.duplicate).toBe(true)
      const again = await Promise.all([postWebhook(paid), postWebhook(paid)])
      expect(again.map(r => r.body.duplicate)).toEqual([true, true])
      expect((await postWebhook(voided)).status).toBe(200)
      await deliveriesSettle(t.email)
      await jobsSettled({ orderId: id })

      const order = await paidOnce(admin, id, t.email, batchId, 3)
      expect(order.paidAt).not.toBeNull()
      expect(order.invoiceVoided).toBeFalsy()
      expect(kinds(order)).not.toContain('invoice-voided')
    })

  it(
    'records a purchase order paid once when its invoice is paid online after a cheque '
    + 'was recorded, and says the second payment needs a refund', async () => {
      const { admin, t, orderId: id, batchId, invoiceId, payUrl } = await approvedPurchaseOrder(
        'paid-twice',
        2,
        'ap-twice@district.test',
      )
      // Accounts payable pays online; its notice is late, and meanwhile a cheque is recorded.
      await simulator({ webhooks: 'fail' })
      expect((await payOnPage(payUrl, APPROVE)).status).toBe(303)
      const cheque = await admin.post(`/api/admin/orders/${id}/payments`, {
        reference: 'Cheque 4417',
      })
      expect(cheque.status, JSON.stringify(cheque.body)).toBe(200)
      const paid = await eventAbout('invoice.paid', invoiceId)
      expect((await postWebhook(paid)).body.duplicate).toBe(false)
      await deliveriesSettle(t.email)
      await jobsSettled({ orderId: id })

      const order = await paidOnce(admin, id, t.email, batchId, 2)
      const twice = order.events.filter((e: { kind: string }) => e.kind === 'payment-twice')
      expect(twice).toHaveLength(1)
      expect(twice[0].message).toMatch(/second payment of \$\d[\d,]*\.\d\d \(invoice /)
      expect(twice[0].message).toContain('Cheque 4417')
    })
})
