// Quotes: numbered, dated, valid 30 days, a PDF whose text a purchasing office can check,
// e-mailed with the PDF attached, and turned into an order at the quoted prices.
import { describe, expect, it } from 'vitest'
import { waitForMail } from '../helpers/mail'
import { attachmentBytes, newTeacher, pdfText, productWithStock, signedIn } from '../helpers/shop'

describe('quotes', () => {
  it('issues a quote with a checked PDF and converts it once at the quoted prices', async () => {
    const admin = await signedIn('admin@tiltwright.test')
    const { productId, slug } = await productWithStock(admin, 50, [
      { minQuantity: 1, unitPriceCents: 3000 },
      { minQuantity: 12, unitPriceCents: 2450 },
    ])
    const t = await newTeacher('quote')
    const q = await t.client.post('/api/quotes', { lines: [{ productId, quantity: 12 }] })
    expect(q.status).toBe(201)
    expect(q.body.number).toMatch(/^Q-\d{4}-\d{5}$/)
    const days = (new Date(q.body.validUntil).getTime() - Date.now()) / 86_400_000
    expect(days).toBeGreaterThan(29.9)
    expect(days).toBeLessThanOrEqual(30)
    // 12 × $24.50 = $294.00; 1.2 kg → $9.00 + 3 × $1.40 = $13.20; tax 7.25 % of $294.00 = $21.32
    // (half up from 21.315): newTeacher's school is in California, 7.25 % in
    // shared/data/us-sales-tax.ts.
    expect(q.body.totalCents).toBe(29_400 + 1320 + 2132)

    const res = await t.client.raw(`/api/quotes/${q.body.id}/pdf`)
    expect(res.status).toBe(200)
    expect(res.headers.get('content-type')).toBe('application/pdf')
    const bytes = new Uint8Array(await res.arrayBuffer())
    expect(Buffer.from(bytes.slice(0, 5)).toString()).toBe('%PDF-')
    expect(Buffer.from(bytes).toString('latin1')).toMatch(/\/FontName \/[A-Z]{6}\+Nunito/)
    const text = await pdfText(bytes)
    for (const s of [
      q.body.number,
      'QUOTE FOR',
      'quote Academy',
      `Test part ${slug}`,
      'Price for 12+',
      '$24.50',
      '$294.00',
      '$13.20',
      '$21.32',
      '$328.52',
      'Valid until',
      'net 30',
      'Sales tax (CA 7.25%, estimated)',
      'local (county and city) add-on rates are not included',
    ])
      expect(text).toContain(s)

    const mail = await waitForMail(t.email, new RegExp(`quote ${q.body.number}`))
    expect(mail.attachments).toMatchObject([
      { filename: `Tiltwright-quote-${q.body.number}.pdf`, contentType: 'application/pdf' },
    ])
    expect(await pdfText(await attachmentBytes(mail.id))).toContain(q.body.number)

    // The catalog price rises; the quote still converts at its own prices.
    const up = await admin.patch(`/api/admin/products/${productId}`, {
      tiers: [{ minQuantity: 1, unitPriceCents: 4000 }],
    })
    expect(up.status).toBe(200)
    const order = await t.client.post('/api/checkout/card', { quoteId: q.body.id })
    expect(order.status).toBe(201)
    const view = (await t.client.get(`/api/orders/${order.body.orderId}`)).body
    expect(view).toMatchObject({ totalCents: q.body.totalCents, quoteId: q.body.id })
    expect(view.lines[0]).toMatchObject({ unitPriceCents: 2450, quantity: 12 })
    const twice = await t.client.post('/api/checkout/card', { quoteId: q.body.id })
    expect(twice.status).toBe(409)
    expect(twice.body.data.code).toBe('quote-used')
    const list = (await t.client.get('/api/quotes')).body.data
    expect(list[0]).toMatchObject({ id: q.body.id, orderId: order.body.orderId, valid: false })
  })

  it('answers 422 field by field for a bad quote and 401 when signed out', async () => {
    const t = await newTeacher('badquote')
    const r = await t.client.post('/api/quotes', { lines: [{ productId: 'x', quantity: 1.5 }] })
    expect(r.status).toBe(422)
    expect(r.body.data.fields).toMatchObject({
      'lines.0.productId': 'Choose a product.',
      'lines.0.quantity': 'Use a whole number.',
    })
    const empty = await t.client.post('/api/quotes', { lines: [] })
    expect(empty.body.data.fields.lines).toBe('The cart is empty.')
    const gone = await t.client.post('/api/quotes', {
      lines: [{ productId: 999_999, quantity: 1 }],
    })
    expect(gone.status).toBe(422)
    expect(gone.body.data.fields['lines.0.productId']).toMatch(/no longer sold/)
  })
})
