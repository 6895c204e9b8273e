// Tax by destination and the paperwork around it: the rate comes from the ship-to state and is
// stored on the quote and the order; an accepted exemption takes the tax off later orders (also
// from an older quote) and the documents say so; the order keeps its addresses; a refused PO
// offers one way back; tier prices never rise with quantity.
import { describe, expect, it } from 'vitest'
import { usState } from '../../shared/utils/tax'
import { taxCents } from '../../shared/utils/pricing'
import { linkIn, waitForMail } from '../helpers/mail'
import {
  APPROVE,
  PNG_BYTES,
  newTeacher,
  payOnPage,
  pdfText,
  poForm,
  productWithStock,
  signedIn,
  waitForOrder,
} from '../helpers/shop'

// The rates the app charges are those of its own table (shared/data/us-sales-tax.ts).
const rate = (code: string) => usState(code)!.baseRateBasisPoints

const address = (over: Record<string, unknown> = {}) => ({
  name: 'Harrow Ridge High School',
  attention: 'Ms. Lindqvist',
  line1: '77 Quarry Road',
  line2: null,
  city: 'Elmstead',
  region: 'WA',
  postalCode: '98111',
  ...over,
})

async function pdfOf(c: { raw: (p: string) => Promise<Response> }, url: string) {
  const res = await c.raw(url)
  expect(res.status).toBe(200)
  return pdfText(new Uint8Array(await res.arrayBuffer()))
}

describe('sales tax by destination', () => {
  it(
    'stores the ship-to state\'s rate on the quote and the order, and the order '
    + 'keeps its addresses', async () => {
      const admin = await signedIn('admin@tiltwright.test')
      const { productId } = await productWithStock(admin, 40)
      const t = await newTeacher('taxwa', { region: 'WA', postalCode: '98101' })
      const lines = [{ productId, quantity: 4 }]

      const q = await t.client.post('/api/quotes', { lines })
      expect(q.status).toBe(201)
      const quote = (await t.client.get(`/api/quotes/${q.body.id}`)).body
      // 4 × $25.00 (the helper's product) shipped to the school's own state.
      expect(quote).toMatchObject({
        taxState: 'WA',
        taxRateBasisPoints: rate('WA'),
        taxCents: taxCents(10_000, rate('WA'), false),
      })

      // The cart priced for another destination follows it.
      const toTexas = (await t.client.post('/api/cart/price', { lines, shipToState: 'TX' })).body
      expect(toTexas).toMatchObject({
        taxState: 'TX',
        taxCents: taxCents(10_000, rate('TX'), false),
      })
      expect(
        (await t.client.post('/api/cart/price', { lines, shipToState: 'ZZ' })).body.data.fields
          .shipToState,
      ).toMatch(/US state/)

      // Card checkout shipped to Oregon (no sales tax), billed to the district in Washington.
      const addresses = {
        shipTo: address({ region: 'or', postalCode: '97201', city: 'Portland' }),
        billTo: address({ name: 'Harrow Ridge District Office' }),
        deliveryNote: 'Room 114, science department',
      }
      const r = await t.client.post('/api/checkout/card', { lines, addresses })
      expect(r.status).toBe(201)
      const order = (await t.client.get(`/api/orders/${r.body.orderId}`)).body
      expect(order).toMatchObject({
        taxState: 'OR',
        taxRateBasisPoints: 0,
        taxCents: 0,
        totalCents: order.subtotalCents + order.shippingCents,
      })
      expect(order.addresses).toMatchObject({
        shipTo: { region: 'OR', city: 'Portland' },
        billTo: { name: 'Harrow Ridge District Office', region: 'WA' },
        deliveryNote: 'Room 114, science department',
      })
      expect(order.lines[0].tierLabel).toBe('1–9')

      // A bad address is refused field by field, and nothing is ordered.
      const bad = await t.client.post('/api/checkout/card', {
        lines,
        addresses: { ...addresses, shipTo: address({ region: 'XX', postalCode: '1' }) },
      })
      expect(bad.status).toBe(422)
      expect(Object.keys(bad.body.data.fields).sort()).toEqual([
        'addresses.shipTo.postalCode',
        'addresses.shipTo.region',
      ])

      // The school moves to California: the placed order keeps its addresses and its tax.
      const moved = await t.client.patch('/api/account/school', {
        addressLine1: '5 New Street',
        city: 'Fresno',
        region: 'CA',
        postalCode: '93650',
      })
      expect(moved.status).toBe(200)
      expect(moved.body.school).toMatchObject({ region: 'CA', city: 'Fresno' })
      expect(
        (
          await t.client.patch('/api/account/school', {
            addressLine1: '5 New Street',
            city: 'Fresno',
            region: 'Cal',
            postalCode: '93650',
          })
        ).body.data.fields.region,
      ).toMatch(/US state/)
      const again = (await t.client.get(`/api/orders/${r.body.orderId}`)).body
      expect(again).toMatchObject({ taxState: 'OR', taxCents: 0, addresses: order.addresses })
      // …and the old quote keeps its Washington tax.
      expect((await t.client.get(`/api/quotes/${q.body.id}`)).body).toMatchObject({
        taxState: 'WA',
        taxCents: quote.taxCents,
      })

      // Paid: the receipt shows both addresses, the delivery note and the tier range.
      await payOnPage(r.body.url, APPROVE)
      await waitForOrder(t.client, r.body.orderId, o => o.status === 'paid')
      const receipt = await pdfOf(t.client, `/api/orders/${r.body.orderId}/documents/receipt`)
      for (const s of [
        'SHIP TO',
        'Portland, OR 97201',
        'Delivery note: Room 114, science department',
        'SOLD TO',
        'Harrow Ridge District Office',
        'Price for 1–9',
        'OR: no state sales tax',
      ]) {
        expect(receipt).toContain(s)
      }
    })

  it(
    'charges an exempt school no tax, also on an order from a quote made before '
    + 'the exemption, and says so', async () => {
      const admin = await signedIn('admin@tiltwright.test')
      const { productId } = await productWithStock(admin, 40)
      const t = await newTeacher('taxexempt')
      const lines = [{ productId, quantity: 2 }]
      const q = (await t.client.post('/api/quotes', { lines })).body
      expect(q.totalCents).toBeGreaterThan(5000 + 0)
      const quoted = (await t.client.get(`/api/quotes/${q.id}`)).body
      expect(quoted.taxCents).toBe(taxCents(5000, rate('CA'), false))

      // A purchase order with the certificate; the admin accepts it.
      const po = await t.client.post(
        '/api/checkout/purchase-order',
        poForm({ lines, taxCertificate: { data: PNG_BYTES, name: 'cert.png' } }),
      )
      expect(po.status).toBe(201)
      expect(
        (
          await admin.post(`/api/admin/orders/${po.body.orderId}/approve`, {
            acceptTaxCertificate: true,
          })
        ).status,
      ).toBe(200)
      expect((await t.client.get(`/api/quotes/${q.id}`)).body.exemptNow).toBe(true)

      // The older quote becomes an order: the quoted prices and shipping, no tax, and it says why.
      const r = await t.client.post('/api/checkout/card', { quoteId: q.id })
      expect(r.status).toBe(201)
      const order = (await t.client.get(`/api/orders/${r.body.orderId}`)).body
      expect(order).toMatchObject({
        taxCents: 0,
        taxExempt: true,
        subtotalCents: quoted.subtotalCents,
        shippingCents: quoted.shippingCents,
        totalCents: quoted.totalCents - quoted.taxCents,
      })
      expect(order.events[0].message).toMatch(/exemption applied/i)
      await payOnPage(r.body.url, APPROVE)
      await waitForOrder(t.client, r.body.orderId, o => o.status === 'paid')
      const receipt = await pdfOf(t.client, `/api/orders/${r.body.orderId}/documents/receipt`)
      expect(receipt).toContain('Sales tax: exemption applied')
      expect(receipt).toContain('Tax exemption applied')
      expect(receipt).toContain('business office decides')
    })
})

describe('a refused purchase order', () => {
  it(
    'offers one way back, on the order page and in the e-mail: the quote while it '
    + 'is valid', async () => {
      const admin = await signedIn('admin@tiltwright.test')
      const { productId } = await productWithStock(admin, 20)
      const t = await newTeacher('refused')
      const q = (await t.client.post('/api/quotes', { lines: [{ productId, quantity: 3 }] })).body
      const po = await t.client.post(
        '/api/checkout/purchase-order',
        poForm({ quoteId: q.id, poNumber: 'BAD-1' }),
      )
      expect(po.status).toBe(201)
      expect((await t.client.get(`/api/orders/${po.body.orderId}`)).body.wayBack).toBeNull()
      const no = await admin.post(`/api/admin/orders/${po.body.orderId}/reject`, {
        reason: 'The PO is not signed.',
      })
      expect(no.status).toBe(200)
      const order = (await t.client.get(`/api/orders/${po.body.orderId}`)).body
      expect(order.wayBack).toMatchObject({ kind: 'quote', url: `/checkout?quote=${q.id}` })
      const mail = await waitForMail(t.email, /^Purchase order BAD-1 could not be accepted/)
      expect(linkIn(mail, /https?:\/\/\S+\/checkout\?quote=\d+/)).toMatch(
        new RegExp(`/checkout\\?quote=${q.id}$`),
      )
      // The quote is free again: a corrected PO goes through it.
      expect(
        (
          await t.client.post(
            '/api/checkout/purchase-order',
            poForm({ quoteId: q.id, poNumber: 'GOOD-1' }),
          )
        ).status,
      ).toBe(201)
    })

  it('resubmits the same lines when there was no quote', async () => {
    const admin = await signedIn('admin@tiltwright.test')
    const { productId } = await productWithStock(admin, 20)
    const t = await newTeacher('refused2')
    const po = await t.client.post(
      '/api/checkout/purchase-order',
      poForm({ lines: [{ productId, quantity: 2 }], poNumber: 'BAD-2' }),
    )
    await admin.post(`/api/admin/orders/${po.body.orderId}/reject`, {
      reason: 'Wrong school on the PO.',
    })
    const order = (await t.client.get(`/api/orders/${po.body.orderId}`)).body
    expect(order.wayBack).toMatchObject({
      kind: 'same-lines',
      url: `/checkout?resubmit=${po.body.orderId}`,
    })
  })
})

describe('catalog tiers', () => {
  it('refuses tier prices that rise with quantity, naming the tier', async () => {
    const admin = await signedIn('admin@tiltwright.test')
    const slug = `rising-${Date.now().toString(36)}`
    const body = {
      slug,
      name: 'Rising part',
      kind: 'part',
      summary: 'A part whose tiers go the wrong way.',
      weightGrams: 10,
    }
    const r = await admin.post('/api/admin/products', {
      ...body,
      tiers: [
        { minQuantity: 1, unitPriceCents: 1000 },
        { minQuantity: 10, unitPriceCents: 1200 },
      ],
    })
    expect(r.status).toBe(422)
    expect(r.body.data.fields['tiers.1.unitPriceCents']).toMatch(/must not be above \$10\.00/)
    const ok = await admin.post('/api/admin/products', {
      ...body,
      tiers: [
        { minQuantity: 1, unitPriceCents: 1000 },
        { minQuantity: 10, unitPriceCents: 900 },
      ],
    })
    expect(ok.status).toBe(201)
    const up = await admin.patch(`/api/admin/products/${ok.body.id}`, {
      tiers: [
        { minQuantity: 1, unitPriceCents: 1000 },
        { minQuantity: 10, unitPriceCents: 1001 },
      ],
    })
    expect(up.status).toBe(422)
    expect(Object.keys(up.body.data.fields)).toEqual(['tiers.1.unitPriceCents'])
  })
})
