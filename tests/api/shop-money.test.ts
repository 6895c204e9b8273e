// The money path as an attacker and an auditor would try it: forged and mismatched webhooks,
// money arriving for an ended order, a cancelled order's invoice, a webhook retry across a
// dying instance, the hold sweep against a lost webhook, a database killed mid-checkout,
// and an unconfirmed buyer. Each was a hole before the order engine and durable jobs.
import Stripe from 'stripe'
import { afterEach, describe, expect, inject, it } from 'vitest'
import { jobTried, jobsSettled, sql } from '../helpers/db'
import { mailsTo, waitForMail } from '../helpers/mail'
import {
  APPROVE,
  PUBLISHED_KEY,
  PUBLISHED_WEBHOOK_SECRET,
  cardOrder,
  fakeStripe,
  newTeacher,
  payOnPage,
  pdfText,
  poForm,
  postWebhook,
  productWithStock,
  signedIn,
  simulator,
  waitForOrder,
} from '../helpers/shop'
import { killDatabase, restartDatabase, startAppInstance } from '../helpers/instance'

afterEach(() => simulator({ api: 'normal', webhooks: 'deliver' }))

describe('nobody outside the install can move money', () => {
  it(
    'refuses a webhook signed with the secret an earlier version published, and '
    + 'the published API key', async () => {
      const { t, orderId, url } = await cardOrder('forged')
      const sessionId = url.split('/').pop()!
      const order = (await t.client.get(`/api/orders/${orderId}`)).body
      const payload = JSON.stringify({
        id: 'evt_forged_1',
        object: 'event',
        type: 'checkout.session.completed',
        data: {
          object: {
            id: sessionId,
            object: 'checkout.session',
            payment_status: 'paid',
            amount_total: order.totalCents,
            currency: 'usd',
            metadata: { orderId: String(orderId) },
          },
        },
      })
      const stripe = new Stripe('sk_test_unused', { telemetry: false })
      const forged = await postWebhook(
        payload,
        stripe.webhooks.generateTestHeaderString({ payload, secret: PUBLISHED_WEBHOOK_SECRET }),
      )
      expect(forged.status).toBe(400)
      expect((await t.client.get(`/api/orders/${orderId}`)).body.status).toBe('awaiting payment')

      const api = await fetch(new URL('/v1/invoices', inject('baseUrl')), {
        headers: { authorization: `Bearer ${PUBLISHED_KEY}` },
      })
      expect(api.status).toBe(401)
    })

  it('ignores a one-cent payment that names the order, and says so on its timeline', async () => {
    const { t, orderId } = await cardOrder('cent')
    const stripe = fakeStripe()
    const cheap = await stripe.checkout.sessions.create({
      mode: 'payment',
      success_url: 'http://localhost/',
      metadata: { orderId: String(orderId) },
      line_items: [
        {
          quantity: 1,
          price_data: { currency: 'usd', unit_amount: 1, product_data: { name: 'One cent' } },
        },
      ],
    })
    expect((await payOnPage(cheap.url!, APPROVE)).status).toBe(303)
    const order = await waitForOrder(t.client, orderId, o =>
      o.events.some((e: any) => e.kind === 'payment-mismatch'),
    )
    expect(order.status).toBe('awaiting payment')
    expect(order.paidAt).toBeNull()
    const note = order.events.find((e: any) => e.kind === 'payment-mismatch').message
    expect(note).toContain(cheap.id)
    expect(note).toMatch(/\$0\.01 is not the order's total/)
  })
})

describe('money for an order that ended', () => {
  it(
    'refunds a card payment that lands after the order was cancelled, and tells '
    + 'the payer', async () => {
      const { t, orderId, url } = await cardOrder('late-pay')
      // The simulator is down, so the cancelled order's checkout page cannot be closed yet:
      // the buyer still pays on it, as a buyer with the page open in another tab would.
      await simulator({ api: 'fail' })
      expect((await t.client.post(`/api/orders/${orderId}/cancel`, {})).status).toBe(200)
      expect((await payOnPage(url, APPROVE)).status).toBe(303)
      // The refund is tried while the payment service is down: it fails and waits.
      const refund = await jobTried('refund-payment', orderId)
      expect(refund.state).toBe('pending')
      expect((await t.client.get(`/api/orders/${orderId}`)).body.refundedAt).toBeNull()
      await simulator({ api: 'normal' })
      const order = await waitForOrder(t.client, orderId, o => !!o.refundedAt, 20_000)
      expect(order.status).toBe('cancelled')
      expect(order.paidAt).toBeNull()
      expect(order.events.map((e: any) => e.kind)).toContain('refunded')
      const mail = await waitForMail(t.email, /^Refund for order TW-/)
      expect(mail.text).toContain('refunded it in full')
      const session = await fakeStripe().checkout.sessions.retrieve(url.split('/').pop()!)
      const intent = await fakeStripe().paymentIntents.retrieve(session.payment_intent as string)
      expect((intent as any).amount_refunded).toBe(order.totalCents)
    })

  it(
    'voids a cancelled order\'s invoice at the provider and tells accounts '
    + 'payable and the teacher', async () => {
      const admin = await signedIn('admin@tiltwright.test')
      const { productId, batchId } = await productWithStock(admin, 10)
      const t = await newTeacher('void')
      const form = poForm({
        lines: [{ productId, quantity: 3 }],
        poNumber: 'VOID-77',
        apEmail: 'ap-void@district.test',
      })
      const r = await t.client.post('/api/checkout/purchase-order', form)
      expect(r.status).toBe(201)
      const id = r.body.orderId
      const approved = await admin.post(`/api/admin/orders/${id}/approve`, {})
      expect(approved.body.invoice.number).toMatch(/^TWF-\d+$/)
      expect(approved.body.payUrl).toMatch(/\/fake-pay\/invoice\//)

      const noReason = await admin.post(`/api/admin/orders/${id}/cancel`, {})
      expect(noReason.status).toBe(422)
      expect(noReason.body.data.fields.reason).toMatch(/Say why/)
      const c = await admin.post(`/api/admin/orders/${id}/cancel`, {
        reason: 'The district withdrew the purchase order',
      })
      expect(c.status).toBe(200)
      expect(c.body).toMatchObject({ status: 'cancelled', payUrl: null })
      const order = await waitForOrder(admin, id, o => o.invoiceVoided)
      expect(order.events.map((e: any) => e.kind)).toEqual(
        expect.arrayContaining(['cancelled', 'invoice-voided']),
      )
      expect(order.events.find((e: any) => e.kind === 'cancelled').message).toMatch(
        /district withdrew.*3 units it held were released/,
      )
      const [batch] = await sql('SELECT reserved FROM batches WHERE id = ?', [batchId])
      expect(batch.reserved).toBe(0)

      const inv = await fakeStripe().invoices.retrieve(
        approved.body.invoice.id
        ?? (await sql('SELECT invoice_id FROM orders WHERE id = ?', [id]))[0].invoice_id,
      )
      expect(inv.status).toBe('void')
      const page = await fetch(approved.body.payUrl)
      expect(await page.text()).toMatch(/void/i)
      // The invoice PDF now says VOID and no longer tells accounts payable how to pay.
      const doc = await admin.raw(`/api/orders/${id}/documents/invoice`)
      const text = await pdfText(new Uint8Array(await doc.arrayBuffer()))
      expect(text).toContain('This invoice is void')
      expect(text).toContain('VOID')
      expect(text).not.toMatch(/How to pay|Remit to|Due date/)
      for (const to of ['ap-void@district.test', t.email]) {
        const mail = await waitForMail(to, /is void: do not pay it$/)
        expect(mail.text).toContain('VOID-77')
      }
    })
})

describe('webhooks and the hold sweep survive what kills a process', () => {
  it(
    'delivers a payment event after the instance that emitted it died during its '
    + 'retries', async () => {
      const { t, orderId, url } = await cardOrder('restart')
      const other = await startAppInstance(Number(new URL(inject('baseUrl')).port) + 50)
      try {
        await simulator({ webhooks: 'fail' })
        // Paid on the second instance's copy of the page: that instance emits the event.
        const onOther = new URL(new URL(url).pathname, other.url).toString()
        expect((await payOnPage(onOther, APPROVE)).status).toBe(303)
        await expect
          .poll(
            async () =>
              (
                await sql(
                  `SELECT attempts FROM jobs WHERE kind = 'fake-webhook' ORDER BY id DESC LIMIT 1`,
                )
              )[0]?.attempts ?? 0,
            { timeout: 10_000 },
          )
          .toBeGreaterThanOrEqual(1)
        await other.kill('SIGKILL')
        expect((await t.client.get(`/api/orders/${orderId}`)).body.status).toBe('awaiting payment')
      } finally {
        await other.kill('SIGKILL')
      }
      await simulator({ webhooks: 'deliver' })
      const paid = await waitForOrder(t.client, orderId, o => o.status === 'paid', 30_000)
      expect(paid.events.filter((e: any) => e.kind === 'paid')).toHaveLength(1)
    })

  it(
    'asks the provider before cancelling an unpaid hold, and records a payment '
    + 'whose webhook was lost', async () => {
      const { t, orderId, url } = await cardOrder('lost-hook')
      await simulator({ webhooks: 'fail' })
      expect((await payOnPage(url, APPROVE)).status).toBe(303)
      await sql('UPDATE orders SET created_at = NOW(3) - INTERVAL 49 HOUR WHERE id = ?', [orderId])
      const order = await waitForOrder(
        t.client,
        orderId,
        o => o.status !== 'awaiting payment',
        20_000,
      )
      expect(order.status).toBe('paid')
      expect(order.events.map((e: any) => e.kind)).toEqual(
        expect.arrayContaining(['payment-found', 'paid']),
      )
      await simulator({ webhooks: 'deliver' })
      // The late webhook then changes nothing: one payment, one receipt.
      await jobsSettled({ kind: 'fake-webhook' })
      await jobsSettled({ to: t.email })
      const after = (await t.client.get(`/api/orders/${orderId}`)).body
      expect(after.events.filter((e: any) => e.kind === 'paid')).toHaveLength(1)
      // The same payment twice is no second payment.
      expect(after.events.map((e: any) => e.kind)).not.toContain('payment-twice')
      const received = (await mailsTo(t.email)).filter(m => /^Payment received/.test(m.subject))
      expect(received).toHaveLength(
        1,
      )
    })
})

describe('checkout ends with a payable order or with none', () => {
  it('removes the order and its held stock when the payment service fails', async () => {
    const admin = await signedIn('admin@tiltwright.test')
    const { productId, batchId } = await productWithStock(admin, 10)
    const t = await newTeacher('pay-down')
    await simulator({ api: 'fail' })
    const r = await t.client.post('/api/checkout/card', { lines: [{ productId, quantity: 4 }] })
    expect(r.status).toBe(502)
    expect(r.body.message).toMatch(/Nothing was ordered or charged/)
    expect((await t.client.get('/api/orders')).body.data).toEqual([])
    const [batch] = await sql('SELECT reserved FROM batches WHERE id = ?', [batchId])
    expect(batch.reserved).toBe(0)
  })

  it('finishes a checkout the database died in the middle of, once it is back', async () => {
    const admin = await signedIn('admin@tiltwright.test')
    const { productId, batchId } = await productWithStock(admin, 10)
    const t = await newTeacher('db-dies')
    await simulator({ api: 'slow', slowMs: 2000 })
    const pending = t.client.post('/api/checkout/card', { lines: [{ productId, quantity: 3 }] })
    // The order is saved; the checkout now waits on the slow payment service. Kill the database.
    await expect
      .poll(async () => (await sql(
        'SELECT o.id FROM orders o JOIN users u ON u.school_id = o.school_id WHERE u.email = ?',
        [t.email],
      )).length, { timeout: 10_000, interval: 50 })
      .toBe(1)
    killDatabase()
    const reply = await pending
    expect(reply.status).toBeGreaterThanOrEqual(500)
    await restartDatabase()
    await simulator({ api: 'normal' })
    // The durable job opens the payment page and mails the link: an order with its session.
    const mail = await waitForMail(t.email, /^Order TW-\d+ placed/, 40_000)
    const number = mail.subject.match(/TW-\d+/)![0]
    const [row] = await sql('SELECT id, status, checkout_session_id FROM orders WHERE number = ?', [
      number,
    ])
    expect(row.status).toBe('awaiting payment')
    expect(row.checkout_session_id).toMatch(/^cs_test_/)
    const [held] = await sql(
      'SELECT SUM(quantity) AS n FROM stock_reservations WHERE order_id = ? AND status = ?',
      [row.id, 'reserved'],
    )
    expect(Number(held.n)).toBe(3)
    const [batch] = await sql('SELECT reserved FROM batches WHERE id = ?', [batchId])
    expect(batch.reserved).toBe(3)
    const order = (await t.client.get(`/api/orders/${row.id}`)).body
    expect(order.payUrl).toMatch(/\/fake-pay\/checkout\//)
  }, 90_000)
})

describe('who may order', () => {
  it(
    'lets an unconfirmed account quote but not order, and caps a school\'s unpaid '
    + 'card holds', async () => {
      const admin = await signedIn('admin@tiltwright.test')
      const { productId } = await productWithStock(admin, 20)
      const u = await newTeacher('unverified', { verified: false })
      const lines = [{ productId, quantity: 1 }]
      expect((await u.client.post('/api/quotes', { lines })).status).toBe(201)
      const card = await u.client.post('/api/checkout/card', { lines })
      expect(card.status).toBe(403)
      expect(card.body.data.code).toBe('unverified')
      expect((await u.client.post('/api/checkout/purchase-order', poForm({ lines }))).status).toBe(
        403,
      )

      const v = await newTeacher('holds')
      const tries = await Promise.all(
        [1, 2, 3, 4, 5].map(() => v.client.post('/api/checkout/card', { lines })),
      )
      expect(tries.map(x => x.status).sort()).toEqual([201, 201, 201, 409, 409])
      expect(tries.find(x => x.status === 409)!.body.data.code).toBe('too-many-holds')
    })
})

describe('an invoice the payment service could not issue', () => {
  it(
    'keeps the approval, retries on its own, and lets an admin try again, issuing '
    + 'one invoice', async () => {
      const admin = await signedIn('admin@tiltwright.test')
      const { productId } = await productWithStock(admin, 10)
      const t = await newTeacher('inv-down')
      const r = await t.client.post(
        '/api/checkout/purchase-order',
        poForm({ lines: [{ productId, quantity: 2 }], poNumber: 'DOWN-1' }),
      )
      const id = r.body.orderId
      await simulator({ api: 'fail' })
      const a = await admin.post(`/api/admin/orders/${id}/approve`, {})
      expect(a.status).toBe(200)
      expect(a.body).toMatchObject({ status: 'awaiting payment', invoice: null })
      expect(a.body.notice).toMatch(/invoice will be issued as soon as it does/)
      const again = await admin.post(`/api/admin/orders/${id}/invoice`, {})
      expect(again.body.invoice).toBeNull()
      await simulator({ api: 'normal' })
      const order = await waitForOrder(admin, id, o => !!o.invoice, 20_000)
      expect(order.events.filter((e: any) => e.kind === 'invoice-issued')).toHaveLength(1)
      expect((await admin.post(`/api/admin/orders/${id}/invoice`, {})).status).toBe(409)
      const invoices = await fakeStripe().invoices.list({ limit: 100 })
      expect(
        invoices.data.filter(i => i.metadata?.orderId === String(id) && i.status !== 'draft'),
      ).toHaveLength(1)
    })
})

describe('an order too large to store', () => {
  it(
    'refuses a quote or order above the online limit with a clear message, never '
    + 'a 500', async () => {
      const admin = await signedIn('admin@tiltwright.test')
      const { productId } = await productWithStock(admin, 600, [
        { minQuantity: 1, unitPriceCents: 10_000_000 },
      ])
      const t = await newTeacher('huge')
      const lines = [{ productId, quantity: 500 }]
      for (const path of ['/api/quotes', '/api/checkout/card']) {
        const r = await t.client.post(path, { lines })
        expect(r.status).toBe(422)
        expect(r.body.data.fields.lines).toMatch(/at most \$5,000,000\.00/)
      }
      const ok = await t.client.post('/api/quotes', { lines: [{ productId, quantity: 40 }] })
      expect(ok.status).toBe(201)
    })
})
