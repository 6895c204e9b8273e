// The whole card path through the real built server, the real stripe SDK, the app's fake
// payment service and the fake SMTP server: price, check out, decline, pay, webhook, ship.
import { describe, expect, it } from 'vitest'
import { Client } from '../helpers/client'
import { jobsSettled } from '../helpers/db'
import { mailsTo, waitForMail } from '../helpers/mail'
import {
  DECLINE,
  APPROVE,
  webhookSecret,
  attachmentBytes,
  fakeStripe,
  newTeacher,
  payOnPage,
  pdfText,
  productBySlug,
  productWithStock,
  signedIn,
  waitForOrder,
} from '../helpers/shop'

describe('catalog and cart pricing', () => {
  it('lists the catalog with tiers and stock for anyone', async () => {
    const r = await new Client().get('/api/products')
    expect(r.status).toBe(200)
    const kit = r.body.data.find((p: any) => p.slug === 'rig-kit')
    expect(kit).toMatchObject({
      kind: 'kit',
      priceTiers: [
        { minQuantity: 1, unitPriceCents: 14900 },
        { minQuantity: 5, unitPriceCents: 13400 },
        { minQuantity: 12, unitPriceCents: 11900 },
      ],
    })
    expect(kit.available).toBeGreaterThan(0)
    expect(kit.batches[0]).toMatchObject({ code: 'RK-07' })
    const one = await new Client().get('/api/products/rig-kit')
    expect(one.body.specs.length).toBeGreaterThan(3)
    expect((await new Client().get('/api/products/no-such-kit')).status).toBe(404)
  })

  it(
    'prices on the server at the tier, with tax for a taxed school and none for '
    + 'an exempt one', async () => {
      const kit = await productBySlug('rig-kit')
      const lines = [{ productId: kit.id, quantity: 12 }]
      const taxed = await newTeacher('price')
      const a = await taxed.client.post('/api/cart/price', { lines })
      expect(a.status).toBe(200)
      expect(a.body.lines[0]).toMatchObject({
        unitPriceCents: 11900,
        tierMinQuantity: 12,
        lineTotalCents: 142_800,
      })
      // Tax 7.25 % of $1,428.00 = $103.53: the school is in California (7.25 % in
      // shared/data/us-sales-tax.ts).
      expect(a.body).toMatchObject({
        subtotalCents: 142_800,
        shippingCents: 8040,
        taxCents: 10_353,
        totalCents: 161_193,
        taxExempt: false,
        taxState: 'CA',
      })
      const exempt = await signedIn('teacher@tiltwright.test')
      const b = await exempt.post('/api/cart/price', { lines })
      expect(b.body).toMatchObject({ taxCents: 0, taxExempt: true, totalCents: 142_800 + 8040 })
      const bad = await exempt.post('/api/cart/price', {
        lines: [{ productId: kit.id, quantity: 0 }],
      })
      expect(bad.status).toBe(422)
      expect(bad.body.data.fields['lines.0.quantity']).toBe('At least 1.')
    })
})

describe('card checkout', () => {
  it(
    'takes a taxed school from checkout to a paid, shipped order through the fake '
    + 'provider', async () => {
      const admin = await signedIn('admin@tiltwright.test')
      const kit = await productBySlug('rig-kit')
      const t = await newTeacher('card')
      const price = await t.client.post('/api/cart/price', {
        lines: [{ productId: kit.id, quantity: 5 }],
      })

      const r = await t.client.post('/api/checkout/card', {
        lines: [{ productId: kit.id, quantity: 5 }],
        unitPriceCents: 1,
      })
      expect(r.status).toBe(201)
      expect(r.body.url).toMatch(/\/fake-pay\/checkout\/cs_test_/)
      const order = (await t.client.get(`/api/orders/${r.body.orderId}`)).body
      expect(order).toMatchObject({
        status: 'awaiting payment',
        paymentMethod: 'card',
        totalCents: price.body.totalCents,
        taxCents: price.body.taxCents,
      })
      expect(order.lines[0]).toMatchObject({ quantity: 5, unitPriceCents: 13400 })
      expect(order.reservations.reduce((s: number, x: any) => s + x.quantity, 0)).toBe(5)
      expect((await productBySlug('rig-kit')).available).toBe(kit.available - 5)

      // The provider's own view of the session, read back through the real SDK.
      const sessionId = r.body.url.split('/').pop()
      const session = await fakeStripe().checkout.sessions.retrieve(sessionId)
      expect(session).toMatchObject({
        amount_total: price.body.totalCents,
        payment_status: 'unpaid',
        metadata: { orderId: String(r.body.orderId) },
      })

      const declined = await payOnPage(r.body.url, DECLINE)
      expect(declined.status).toBe(402)
      expect(declined.html).toContain('declined')
      expect((await t.client.get(`/api/orders/${r.body.orderId}`)).body.status).toBe(
        'awaiting payment',
      )
      // Leaving the payment page returns to the order, whose "Pay now" opens the same page again.
      expect(declined.pageHtml).toContain(`/orders/${r.body.orderId}?card=cancelled`)
      expect(order.payUrl).toBe(r.body.url)
      expect(declined.pageHtml).toContain('Local payment simulator')
      // Its type is the app's own Nunito, served with the page.
      const font = await fetch(new URL('/fake-pay/fonts/nunito-800.woff2', r.body.url))
      expect([font.status, font.headers.get('content-type')]).toEqual([200, 'font/woff2'])
      const missing = new URL('/fake-pay/fonts/nunito-100.woff2', r.body.url)
      expect((await fetch(missing)).status).toBe(404)

      const paid = await payOnPage(r.body.url, APPROVE)
      expect(paid.status).toBe(303)
      expect(paid.location).toContain(`/orders/${r.body.orderId}?paid=1`)
      const after = await waitForOrder(t.client, r.body.orderId, o => o.status === 'paid')
      expect(after.paidAt).not.toBeNull()
      // Paid, its five kits became rigs for the class (server/utils/build-spaces.ts).
      expect(after.events.map((e: any) => e.kind)).toEqual([
        'placed',
        'checkout-opened',
        'paid',
        'build-space',
      ])
      expect((await fakeStripe().checkout.sessions.retrieve(sessionId)).payment_status).toBe('paid')

      await waitForMail(t.email, /^Order TW-\d+ placed/)
      const receipt = await waitForMail(t.email, /^Payment received/)
      expect(receipt.attachments[0]).toMatchObject({ contentType: 'application/pdf' })
      const text = await pdfText(await attachmentBytes(receipt.id))
      expect(text).toContain('Receipt')
      expect(text).toContain(order.number)

      // Admin allocates and ships; the teacher gets the tracking number and the packing list.
      expect(
        (
          await admin.post(`/api/admin/orders/${r.body.orderId}/shipments`, {
            carrier: 'ups',
            tracking: 'RF 7788 1020',
          })
        ).status,
      ).toBe(409)
      const alloc = await admin.post(`/api/admin/orders/${r.body.orderId}/allocate`)
      expect(alloc.status).toBe(200)
      expect(alloc.body.allocated).toBe(true)
      // The carrier is one of the known list, else a field error naming the choices.
      const free = await admin.post(`/api/admin/orders/${r.body.orderId}/shipments`, {
        carrier: 'Ridgeline Freight',
        tracking: 'RF 7788 1020',
      })
      expect(free.status).toBe(422)
      expect(free.body.data.fields.carrier).toBe(
        'Pick the carrier: USPS, UPS, FedEx, DHL, Other carrier.',
      )
      const ship = await admin.post(`/api/admin/orders/${r.body.orderId}/shipments`, {
        carrier: 'ups',
        tracking: 'RF 7788 1020',
      })
      expect(ship.status).toBe(201)
      expect(ship.body.status).toBe('shipped')
      expect(ship.body.notice).toBeNull()
      const shipped = await waitForMail(t.email, /has shipped/)
      expect(shipped.text).toContain('RF 7788 1020')
      expect(shipped.text).toContain('with UPS')
      expect(shipped.attachments.map(a => a.filename)).toEqual([
        `Tiltwright-packing-list-${order.number}.pdf`,
      ])
      const view = (await t.client.get(`/api/orders/${r.body.orderId}`)).body
      // The tracking link is UPS's public tracking page with the number encoded.
      expect(view.shipments).toMatchObject([
        {
          carrier: 'ups',
          carrierName: 'UPS',
          tracking: 'RF 7788 1020',
          trackingUrl: 'https://www.ups.com/track?tracknum=RF%207788%201020',
        },
      ])
      expect(view.documents.map((d: any) => d.kind)).toEqual(['receipt', 'packing-list'])
    })

  it('ignores a replayed webhook event and refuses a bad signature', async () => {
    const admin = await signedIn('admin@tiltwright.test')
    const { productId } = await productWithStock(admin, 5)
    const t = await newTeacher('replay')
    const r = await t.client.post('/api/checkout/card', { lines: [{ productId, quantity: 1 }] })
    expect(r.status).toBe(201)
    await payOnPage(r.body.url, APPROVE)
    await waitForOrder(t.client, r.body.orderId, o => o.status === 'paid')
    await waitForMail(t.email, /^Payment received/)

    const stripe = fakeStripe()
    const events = await stripe.events.list({
      type: 'checkout.session.completed',
      limit: 50,
    } as any)
    const evt = events.data.find(
      (e: any) => e.data.object.metadata?.orderId === String(r.body.orderId),
    )!
    expect(evt).toBeDefined()
    const payload = JSON.stringify(evt)
    const post = (body: string, signature: string) =>
      fetch(new URL('/api/webhooks/payments', t.client.baseUrl), {
        method: 'POST',
        body,
        headers: { 'content-type': 'application/json', 'stripe-signature': signature },
      })

    const replay = await post(
      payload,
      stripe.webhooks.generateTestHeaderString({ payload, secret: webhookSecret() }),
    )
    expect(replay.status).toBe(200)
    expect(await replay.json()).toEqual({ received: true, duplicate: true })
    const order = (await t.client.get(`/api/orders/${r.body.orderId}`)).body
    expect(order.events.filter((e: any) => e.kind === 'paid')).toHaveLength(1)
    await jobsSettled({ to: t.email })
    expect((await mailsTo(t.email)).filter(m => /^Payment received/.test(m.subject))).toHaveLength(
      1,
    )

    // An unpaid order must not become paid by a forged or tampered event.
    const other = await t.client.post('/api/checkout/card', { lines: [{ productId, quantity: 1 }] })
    const forged = JSON.stringify({
      ...evt,
      id: 'evt_forged_1',
      data: {
        object: { ...(evt.data.object as any), metadata: { orderId: String(other.body.orderId) } },
      },
    })
    expect(
      (
        await post(
          forged,
          stripe.webhooks.generateTestHeaderString({
            payload: forged,
            secret: 'whsec_someone_else',
          }),
        )
      ).status,
    ).toBe(400)
    expect(
      (
        await post(
          forged,
          stripe.webhooks.generateTestHeaderString({ payload, secret: webhookSecret() }),
        )
      ).status,
    ).toBe(400)
    expect((await post(forged, 'nonsense')).status).toBe(400)
    expect((await post(forged, '')).status).toBe(400)
    expect((await t.client.get(`/api/orders/${other.body.orderId}`)).body.status).toBe(
      'awaiting payment',
    )
  })

  it('cancels an unpaid card order and puts its stock back', async () => {
    const admin = await signedIn('admin@tiltwright.test')
    const { productId } = await productWithStock(admin, 4)
    const t = await newTeacher('cancel')
    const r = await t.client.post('/api/checkout/card', { lines: [{ productId, quantity: 4 }] })
    expect(r.status).toBe(201)
    const again = await t.client.post('/api/checkout/card', { lines: [{ productId, quantity: 1 }] })
    expect(again.status).toBe(409)
    expect(again.body.data).toMatchObject({
      code: 'out-of-stock',
      fields: { 'lines.0.quantity': expect.stringMatching(/out of stock/) },
    })
    const c = await t.client.post(`/api/orders/${r.body.orderId}/cancel`)
    expect(c.status).toBe(200)
    expect(c.body.status).toBe('cancelled')
    expect(c.body.reservations.every((x: any) => x.status === 'released')).toBe(true)
    expect((await t.client.post(`/api/orders/${r.body.orderId}/cancel`)).status).toBe(409)
    expect(
      (await t.client.post('/api/checkout/card', { lines: [{ productId, quantity: 4 }] })).status,
    ).toBe(201)
  })
})
