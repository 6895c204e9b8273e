// The order's generated documents as PDFs: invoice, receipt, packing list.
import { and, eq, inArray } from 'drizzle-orm'
import { batches, stockReservations } from '../../../../database/schema'
import { cardReceiptPdf, invoicePdf, packingListPdf } from '../../../../documents/shop'
import { canSeeOrderDocuments } from '../../../../../shared/utils/shop-rules'

export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  const order = await requireVisibleOrder(event, user)
  if (!canSeeOrderDocuments(user, order)) throw notFound('That document')
  const kind = getRouterParam(event, 'kind')
  const db = useDb()
  const { school, buyer, po } = await orderPeople(db, order)
  const lines = await linesOf(db, order.id)
  if ((kind === 'invoice' || (kind === 'receipt' && order.paymentMethod === 'purchase-order')) && order.invoiceId && po) {
    if (kind === 'receipt' && !order.paidAt) throw notFound('That document')
    const info = { number: order.invoiceNumber ?? order.number!, dueAt: order.invoiceDueAt, poNumber: po.poNumber, orderNumber: order.number!, issuedAt: po.reviewedAt ?? order.createdAt, payUrl: order.invoiceUrl }
    const pdf = await invoicePdf(info, order, lines, school, po.apEmail, kind === 'receipt' ? { at: order.paidAt!, reference: order.paymentReference } : undefined)
    return pdfReply(event, `Tiltwright-${kind}-${info.number}.pdf`, pdf)
  }
  if (kind === 'receipt' && order.paidAt) {
    return pdfReply(event, `Tiltwright-receipt-${order.number}.pdf`, await cardReceiptPdf({ ...order, number: order.number!, paidAt: order.paidAt }, lines, school, buyer.name))
  }
  if (kind === 'packing-list') {
    const held = await db.select({ productId: stockReservations.productId, quantity: stockReservations.quantity, code: batches.code }).from(stockReservations)
      .innerJoin(batches, eq(batches.id, stockReservations.batchId))
      .where(and(eq(stockReservations.orderId, order.id), inArray(stockReservations.status, ['allocated'])))
    if (!held.length) throw notFound('That document')
    const names = new Map(lines.map((l) => [l.productId, l.name]))
    const pdf = await packingListPdf({ ...order, number: order.number! }, held.map((h) => ({ name: names.get(h.productId) ?? '', quantity: h.quantity, batchCode: h.code })), school, buyer.name)
    return pdfReply(event, `Tiltwright-packing-list-${order.number}.pdf`, pdf)
  }
  throw notFound('That document')
})
