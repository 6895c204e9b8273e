// An admin approves a purchase order: optionally accepts the school's tax-exemption
// certificate (the order's tax goes to zero), then the provider's invoice is created with
// net-30 terms through the SDK and e-mailed as a PDF to the teacher and accounts payable.
import { and, eq } from 'drizzle-orm'
import { approveSchema } from '../../../../../shared/schemas/shop'
import { INVOICE_NET_DAYS } from '../../../../../shared/utils/pricing'
import { orders, purchaseOrders, schools, storedFiles } from '../../../../database/schema'
import { createNetInvoice } from '../../../../services/payments'
import { invoicePdf } from '../../../../documents/shop'
import { toDate } from '../../../../documents/pdf'
import { invoiceIssuedMail, poApprovedMail } from '../../../../emails/shop'

export default defineEventHandler(async (event) => {
  const admin = await requireRole(event, 'admin')
  const input = await readBodyAs(event, approveSchema)
  const claimed = await adminOrderStep(event, admin, 'reviewPo', async (tx, order) => {
    const [cert] = await tx.select().from(storedFiles).where(and(eq(storedFiles.orderId, order.id), eq(storedFiles.kind, 'tax-certificate'))).limit(1)
    if (input.acceptTaxCertificate) {
      if (!cert) throw invalid({ acceptTaxCertificate: 'This order came with no tax-exemption certificate.' })
      await tx.update(schools).set({ taxExemption: 'accepted' }).where(eq(schools.id, order.schoolId))
      if (order.taxCents) {
        await tx.update(orders).set({ taxCents: 0, taxExempt: true, totalCents: order.totalCents - order.taxCents }).where(eq(orders.id, order.id))
      }
      await addOrderEvent(tx, order.id, 'tax-exempt', 'Tax-exemption certificate accepted; no sales tax is charged.', admin.id)
    }
    const [res] = await tx.update(purchaseOrders).set({ status: 'approved', reviewedById: admin.id, reviewedAt: new Date() })
      .where(and(eq(purchaseOrders.orderId, order.id), eq(purchaseOrders.status, 'review')))
    if (res.affectedRows !== 1) throw conflict('This purchase order has already been reviewed.', 'already-reviewed')
    await tx.update(orders).set({ status: 'awaiting payment', updatedAt: new Date() }).where(eq(orders.id, order.id))
    await addOrderEvent(tx, order.id, 'po-approved', `Purchase order approved by ${admin.name}.`, admin.id)
    return (await loadOrder(tx, order.id))!
  })

  const db = useDb()
  const { school, buyer, po } = await orderPeople(db, claimed)
  const lines = await linesOf(db, claimed.id)
  let invoice
  try {
    invoice = await createNetInvoice({
      orderId: claimed.id, orderNumber: claimed.number!, email: po!.apEmail, name: `${school.name} accounts payable`, schoolName: school.name,
      poNumber: po!.poNumber, netDays: INVOICE_NET_DAYS, lines: chargeLinesFor(lines, claimed),
    })
  } catch (e) {
    console.error('[approve] the payment service failed', e)
    await db.transaction(async (tx) => {
      await tx.update(purchaseOrders).set({ status: 'review', reviewedById: null, reviewedAt: null }).where(eq(purchaseOrders.orderId, claimed.id))
      await tx.update(orders).set({ status: 'po review' }).where(eq(orders.id, claimed.id))
      await addOrderEvent(tx, claimed.id, 'invoice-failed', 'The invoice could not be created at the payment service; the purchase order is back in review.', admin.id)
    })
    throw createError({ statusCode: 502, message: 'The payment service did not create the invoice. The purchase order is back in review; try again.', data: { code: 'payments-down' } })
  }
  await db.transaction(async (tx) => {
    await tx.update(orders).set({ providerCustomerId: invoice.customerId, invoiceId: invoice.invoiceId, invoiceNumber: invoice.number, invoiceUrl: invoice.url, invoiceDueAt: invoice.dueAt })
      .where(eq(orders.id, claimed.id))
    const due = invoice.dueAt ? toDate(invoice.dueAt) : `${INVOICE_NET_DAYS} days from today`
    await addOrderEvent(tx, claimed.id, 'invoice-issued', `Invoice ${invoice.number} issued: net ${INVOICE_NET_DAYS}, due ${due}.`, admin.id)
    const pdf = await invoicePdf({ number: invoice.number, dueAt: invoice.dueAt, poNumber: po!.poNumber, orderNumber: claimed.number!, issuedAt: new Date(), payUrl: invoice.url }, claimed, lines, school, po!.apEmail)
    const attachment = [{ filename: `Tiltwright-invoice-${invoice.number}.pdf`, contentType: 'application/pdf', content: pdf }]
    const url = appUrl(`/orders/${claimed.id}`)
    await enqueueMail(tx, 'po-approved', buyer.email, poApprovedMail(buyer.name, { number: claimed.number!, poNumber: po!.poNumber }, url))
    const invoiceMail = invoiceIssuedMail({ number: claimed.number!, invoiceNumber: invoice.number, totalCents: claimed.totalCents, dueAt: due, poNumber: po!.poNumber }, invoice.url)
    for (const to of new Set([po!.apEmail, buyer.email])) await enqueueMail(tx, 'invoice-issued', to, invoiceMail, attachment)
    await audit(tx, { actorId: admin.id, action: 'order.po-approved', subjectType: 'order', subjectId: claimed.id })
  })
  return replyWithOrder(claimed.id, admin)
})
