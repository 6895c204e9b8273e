// The order's generated documents (invoice, receipt, packing list) rendered from the rows
// they describe. The documents route serves them; mail jobs render them when they send,
// never inside a transaction that holds the order's row lock.
import { and, desc, eq } from 'drizzle-orm'
import { batches, shipments, stockReservations } from '../database/schema'
import { shipmentCarrier } from '../../shared/utils/shipments'
import { cardReceiptPdf, invoicePdf, packingListPdf } from '../documents/shop'
import { CLOSED_STATUSES } from '../../shared/utils/order-flow'
import type { OrderDocumentKind } from '../../shared/utils/states'

/** The PDF and its file name, or null when the order has no such document (yet). */
export async function renderOrderDocument(db: DbOrTx, order: OrderRow, kind: OrderDocumentKind) {
  const { school, buyer, po } = await orderPeople(db, order)
  const lines = await linesOf(db, order.id)
  const onInvoice
    = kind === 'invoice' || (kind === 'receipt' && order.paymentMethod === 'purchase-order')
  if (onInvoice && order.invoiceId && po) {
    if (kind === 'receipt' && !order.paidAt) return null
    const info = {
      number: order.invoiceNumber ?? order.number!,
      dueAt: order.invoiceDueAt,
      poNumber: po.poNumber,
      orderNumber: order.number!,
      issuedAt: po.reviewedAt ?? order.createdAt,
      payUrl: order.invoiceVoidedAt ? null : order.invoiceUrl,
    }
    const paid
      = kind === 'receipt' ? { at: order.paidAt!, reference: order.paymentReference } : undefined
    const state = {
      voided:
        kind === 'invoice' && (!!order.invoiceVoidedAt || CLOSED_STATUSES.includes(order.status)),
      settled: !!order.paidAt,
    }
    const pdf = await invoicePdf(info, order, lines, school, po.apEmail, paid, state)
    return { filename: `Tiltwright-${kind}-${info.number}.pdf`, pdf }
  }
  if (kind === 'receipt' && order.paidAt) {
    const pdf = await cardReceiptPdf(
      { ...order, number: order.number!, paidAt: order.paidAt },
      lines,
      school,
      buyer.name,
    )
    return { filename: `Tiltwright-receipt-${order.number}.pdf`, pdf }
  }
  if (kind === 'packing-list') {
    const held = await db
      .select({
        productId: stockReservations.productId,
        quantity: stockReservations.quantity,
        code: batches.code,
      })
      .from(stockReservations)
      .innerJoin(batches, eq(batches.id, stockReservations.batchId))
      .where(
        and(eq(stockReservations.orderId, order.id), eq(stockReservations.status, 'allocated')),
      )
    if (!held.length) return null
    const [shipment] = await db
      .select()
      .from(shipments)
      // The order's own shipment: replacement parts sent from tickets have their own tracking.
      .where(and(eq(shipments.orderId, order.id), eq(shipments.kind, 'order')))
      .orderBy(desc(shipments.shippedAt))
      .limit(1)
    const names = new Map(lines.map(l => [l.productId, l.name]))
    const items = held.map(h => ({
      name: names.get(h.productId) ?? '',
      quantity: h.quantity,
      batchCode: h.code,
    }))
    const pdf = await packingListPdf(
      { ...order, number: order.number! },
      items,
      school,
      buyer.name,
      shipment && {
        carrier: shipmentCarrier(shipment.carrier, shipment.tracking).carrierName,
        tracking: shipment.tracking,
      },
    )
    return { filename: `Tiltwright-packing-list-${order.number}.pdf`, pdf }
  }
  return null
}
