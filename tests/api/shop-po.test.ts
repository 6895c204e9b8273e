// The purchase-order path end to end: upload, review, approve (invoice through the SDK, net
// 30, e-mailed as a PDF), pay on the fake's invoice page, webhook, ship; and the refusals.
import { describe, expect, it } from 'vitest'
import { formatCents } from '../../shared/utils/pricing'
import { formatDay } from '../../shared/utils/dates'
import { VENDOR } from '../../shared/utils/vendor'
import { Client } from '../helpers/client'
import { linkIn, waitForMail } from '../helpers/mail'
import {
  APPROVE,
  PDF_BYTES,
  PNG_BYTES,
  attachmentBytes,
  fakeStripe,
  newTeacher,
  payOnPage,
  pdfText,
  poForm,
  productBySlug,
  productWithStock,
  signedIn,
  waitForOrder,
} from '../helpers/shop'

/** The order waits in `list` of the admin's desk (GET /api/staff/desk) and in no other. A list
 *  holds the 20 oldest, so the order may be missing from its list only when that list is full. */
async function expectOnDesk(admin: Client, id: number, list: string | null) {
  const desk = (await admin.get('/api/staff/desk')).body
  for (const key of ['poToReview', 'toAllocate', 'toShip']) {
    const listed = desk[key].some((o: any) => o.id === id)
    if (key === list) expect(listed || desk.waiting[key] > 20, key).toBe(true)
    else expect(listed, key).toBe(false)
  }
}

describe('purchase-order checkout', () => {
  it('goes from PO upload to an approved, invoiced, paid and shipped order', async () => {
    const admin = await signedIn('admin@tiltwright.test')
    const kit = await productBySlug('long-beam-kit')
    const t = await newTeacher('po')
    const lines = [{ productId: kit.id, quantity: 6 }]
    const price = (await t.client.post('/api/cart/price', { lines })).body
    expect(price.taxCents).toBeGreaterThan(0)

    const r = await t.client.post(
      '/api/checkout/purchase-order',
      poForm({
        lines,
        poNumber: 'CH-2026-0417',
        apEmail: 'payables@cobalt-district.test',
        poFile: { data: PDF_BYTES, name: 'district PO <final>.pdf' },
        taxCertificate: { data: PNG_BYTES, name: 'exempt.png' },
      }),
    )
    expect(r.status).toBe(201)
    const id = r.body.orderId
    let order = (await t.client.get(`/api/orders/${id}`)).body
    expect(order).toMatchObject({
      status: 'po review',
      paymentMethod: 'purchase-order',
      totalCents: price.totalCents,
      purchaseOrder: { poNumber: 'CH-2026-0417', status: 'review' },
    })
    expect(order.school.taxExemption).toBe('pending')
    const poDoc = order.documents.find((d: any) => d.kind === 'purchase-order')
    expect(poDoc.label).toContain('district PO final.pdf')
    const file = await t.client.raw(poDoc.url)
    expect(file.headers.get('content-type')).toBe('application/pdf')
    expect(file.headers.get('x-content-type-options')).toBe('nosniff')
    expect(Buffer.from(await file.arrayBuffer()).equals(PDF_BYTES)).toBe(true)
    // The order's mails open with Tiltwright's header, greet the teacher and list the items.
    const placed = await waitForMail(t.email, /^Order TW-\d+ placed/)
    expect(placed.text.split('\n')[0]).toContain('Tiltwright')
    expect(placed.text).toContain('Hello Teacher po,')
    expect(placed.text).toContain(`${kit.name} × 6: ${formatCents(price.lines[0].lineTotalCents)}`)
    // Each admin is told, from the same transaction, that a purchase order waits for review.
    const review = await waitForMail(
      'admin@tiltwright.test',
      /^Purchase order CH-2026-0417 to review \(order TW-\d+\)$/,
    )
    expect(linkIn(review, /https?:\/\/\S+\/admin\/orders\/\d+/)).toMatch(
      new RegExp(`/admin/orders/${id}$`),
    )

    await expectOnDesk(admin, id, 'poToReview')

    // Approve, accepting the certificate: the tax drops to zero before the invoice is made.
    const a = await admin.post(`/api/admin/orders/${id}/approve`, { acceptTaxCertificate: true })
    expect(a.status).toBe(200)
    // An approved PO may be packed: it waits to be allocated.
    await expectOnDesk(admin, id, 'toAllocate')
    expect(a.body).toMatchObject({
      status: 'awaiting payment',
      taxCents: 0,
      taxExempt: true,
      totalCents: price.subtotalCents + price.shippingCents,
    })
    // The teacher hears of the exemption and the new total with the approval, not only from the
    // invoice.
    const approval = await waitForMail(t.email, /^Purchase order CH-2026-0417 approved$/)
    expect(approval.text).toMatch(/accepted your school's tax-exemption certificate/)
    expect(approval.text).toContain(formatCents(price.subtotalCents + price.shippingCents))
    expect(approval.text).toContain(`${kit.name} × 6`)
    expect(a.body.invoice.number).toMatch(/^TWF-/)
    expect(a.body.purchaseOrder.status).toBe('approved')
    expect((await admin.post(`/api/admin/orders/${id}/approve`, {})).status).toBe(409)

    const invoiceId = (await fakeStripe().invoices.list({ limit: 1 } as any)).data[0]?.id
    const inv = await fakeStripe().invoices.retrieve(invoiceId!)
    expect(inv).toMatchObject({
      collection_method: 'send_invoice',
      status: 'open',
      amount_due: a.body.totalCents,
      metadata: { orderId: String(id) },
    })
    // Net 30: the due date is 30 days after finalizing.
    expect(inv.due_date! - inv.status_transitions.finalized_at!).toBe(30 * 86_400)

    await waitForMail(t.email, /^Purchase order CH-2026-0417 approved/)
    const invoiceMail = await waitForMail('payables@cobalt-district.test', /^Invoice TWF-/)
    expect(invoiceMail.attachments[0]!.filename).toMatch(/^Tiltwright-invoice-TWF-\d+\.pdf$/)
    const text = await pdfText(await attachmentBytes(invoiceMail.id))
    expect(text).toContain('CH-2026-0417')
    expect(text).toContain('Net 30')
    expect(text).toContain('Sales tax: exemption applied')
    // What accounts payable needs, said once in shared/utils/vendor.ts: remit-to, cheque payee,
    // bank transfer, our tax id, the PO, terms, due date, and the online link as one option.
    for (const s of [
      'Remit to',
      `Cheque payable to ${VENDOR.chequePayee}`,
      VENDOR.remitTo[2]!,
      VENDOR.bank.routingNumber,
      VENDOR.bank.accountNumber,
      VENDOR.taxId,
      'Due date',
      formatDay(a.body.invoice.dueAt),
      'Online by card',
      'invented for this demonstration',
    ])
      expect(text).toContain(s)
    // The provider's line items speak the shop's tier wording, never "1+".
    expect(inv.lines.data.map((l: any) => l.description)).toEqual([
      expect.stringMatching(/^Long-Beam Rig Kit \(price for 5–11\) × 6$/),
      expect.stringMatching(/^Shipping/),
    ])

    // Pay on the fake's invoice page: the invoice.paid webhook marks the order paid.
    const paid = await payOnPage(a.body.payUrl, APPROVE)
    expect(paid.status).toBe(303)
    order = await waitForOrder(t.client, id, o => o.status === 'paid')
    expect(order.events.map((e: any) => e.kind)).toEqual([
      'placed',
      'po-received',
      'tax-exempt',
      'po-approved',
      // Its six kits became rigs for the class (server/utils/build-spaces.ts).
      'build-space',
      'invoice-issued',
      'paid',
    ])
    expect(order.payUrl).toBeNull()
    await waitForMail(t.email, /^Payment received/)

    await admin.post(`/api/admin/orders/${id}/allocate`)
    await expectOnDesk(admin, id, 'toShip')
    const ship = await admin.post(`/api/admin/orders/${id}/shipments`, {
      carrier: 'other',
      tracking: 'RF 1000 2000',
    })
    expect(ship.status).toBe(201)
    // "Other carrier" has no tracking page to link.
    expect(ship.body.shipments).toMatchObject([
      { carrier: 'other', carrierName: 'Other carrier', trackingUrl: null },
    ])
    expect((await waitForMail(t.email, /has shipped/)).text).toContain('RF 1000 2000')
    await expectOnDesk(admin, id, null)
    expect((await admin.post(`/api/admin/orders/${id}/deliver`)).body.status).toBe('delivered')
  })

  it('rejects a PO with a reason, releases the stock and tells the teacher', async () => {
    const admin = await signedIn('admin@tiltwright.test')
    const { productId } = await productWithStock(admin, 10)
    const t = await newTeacher('reject')
    const r = await t.client.post(
      '/api/checkout/purchase-order',
      poForm({ lines: [{ productId, quantity: 10 }], poNumber: 'BAD-1' }),
    )
    expect(r.status).toBe(201)
    expect(
      (
        await t.client.post(
          '/api/checkout/purchase-order',
          poForm({ lines: [{ productId, quantity: 1 }] }),
        )
      ).status,
    ).toBe(409)
    const short = await admin.post(`/api/admin/orders/${r.body.orderId}/reject`, { reason: 'no' })
    expect(short.status).toBe(422)
    expect(short.body.data.fields.reason).toMatch(/few words/)
    const rej = await admin.post(`/api/admin/orders/${r.body.orderId}/reject`, {
      reason: 'The PO is not signed by the district office.',
    })
    expect(rej.status).toBe(200)
    expect(rej.body).toMatchObject({
      status: 'rejected',
      purchaseOrder: {
        status: 'rejected',
        rejectReason: 'The PO is not signed by the district office.',
      },
    })
    expect(rej.body.reservations.every((x: any) => x.status === 'released')).toBe(true)
    const mail = await waitForMail(t.email, /could not be accepted/)
    expect(mail.text).toContain('not signed by the district office')
    expect(
      (
        await t.client.post(
          '/api/checkout/purchase-order',
          poForm({ lines: [{ productId, quantity: 10 }] }),
        )
      ).status,
    ).toBe(201)
  })

  it(
    'lets an admin record a cheque, closing the provider invoice without paying '
    + 'twice', async () => {
      const admin = await signedIn('admin@tiltwright.test')
      const { productId } = await productWithStock(admin, 3)
      const t = await newTeacher('cheque')
      const r = await t.client.post(
        '/api/checkout/purchase-order',
        poForm({ lines: [{ productId, quantity: 2 }] }),
      )
      await admin.post(`/api/admin/orders/${r.body.orderId}/approve`, {})
      const p = await admin.post(`/api/admin/orders/${r.body.orderId}/payments`, {
        reference: 'Cheque 004512',
      })
      expect(p.status).toBe(200)
      expect(p.body.status).toBe('paid')
      expect(p.body.events.filter((e: any) => e.kind === 'paid')).toHaveLength(1)
      const order = await waitForOrder(t.client, r.body.orderId, o => o.status === 'paid')
      expect(order.events.filter((e: any) => e.kind === 'paid')).toHaveLength(1)
      expect(
        (await admin.post(`/api/admin/orders/${r.body.orderId}/payments`, { reference: 'again' }))
          .status,
      ).toBe(409)
    })
})

describe('hostile and bad uploads', () => {
  it(
    'refuses HTML named .pdf, an oversize file, a missing file and bad fields, '
    + 'field by field', async () => {
      const t = await newTeacher('hostile')
      const kit = await productBySlug('steel-balls')
      const lines = [{ productId: kit.id, quantity: 1 }]
      const html = await t.client.post(
        '/api/checkout/purchase-order',
        poForm({
          lines,
          poFile: {
            data: Buffer.from('<html><script>alert(1)</script></html>'),
            name: 'po.pdf',
            type: 'application/pdf',
          },
        }),
      )
      expect(html.status).toBe(422)
      expect(html.body.data.fields.poFile).toMatch(/must be a PDF/)
      const big = Buffer.concat([PDF_BYTES, Buffer.alloc(5 * 1024 * 1024 + 10, 32)])
      const huge = await t.client.post(
        '/api/checkout/purchase-order',
        poForm({ lines, poFile: { data: big, name: 'po.pdf' } }),
      )
      expect(huge.status).toBe(422)
      expect(huge.body.data.fields.poFile).toMatch(/larger than 5 MB/)
      const none = await t.client.post(
        '/api/checkout/purchase-order',
        poForm({ lines, poFile: null, poNumber: '', apEmail: 'nope' }),
      )
      expect(none.status).toBe(422)
      expect(Object.keys(none.body.data.fields).sort()).toEqual(['apEmail', 'poFile', 'poNumber'])
      const cert = await t.client.post(
        '/api/checkout/purchase-order',
        poForm({ lines, taxCertificate: { data: Buffer.from('MZ fake exe'), name: 'cert.png' } }),
      )
      expect(cert.status).toBe(422)
      expect(cert.body.data.fields.taxCertificate).toMatch(/must be a PDF/)
      const badLines = await t.client.post(
        '/api/checkout/purchase-order',
        poForm({ lines: [{ productId: kit.id, quantity: -2 }] }),
      )
      expect(badLines.status).toBe(422)
      expect(badLines.body.data.fields['lines.0.quantity']).toBe('At least 1.')
      const json = await t.client.post('/api/checkout/purchase-order', { poNumber: 'X' })
      expect(json.status).toBe(422)
      expect((await t.client.get('/api/orders')).body.data).toEqual([])
    })
})

describe('who may check out', () => {
  it('answers 401 when signed out and 403 to builders and staff', async () => {
    expect((await new Client().post('/api/checkout/card', { lines: [] })).status).toBe(401)
    for (const who of ['builder', 'support', 'admin']) {
      const c = await signedIn(`${who}@tiltwright.test`)
      expect(
        (await c.post('/api/checkout/card', { lines: [{ productId: 1, quantity: 1 }] })).status,
      ).toBe(403)
    }
  })
})
