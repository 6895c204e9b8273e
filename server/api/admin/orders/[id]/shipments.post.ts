// An admin records a shipment; the teacher is e-mailed the tracking and the packing list.
import { and, eq } from 'drizzle-orm'
import { shipmentSchema } from '../../../../../shared/schemas/shop'
import { batches, orders, shipments, stockReservations } from '../../../../database/schema'
import { packingListPdf } from '../../../../documents/shop'
import { shippedMail } from '../../../../emails/shop'

export default defineEventHandler(async (event) => {
  const admin = await requireRole(event, 'admin')
  const input = await readBodyAs(event, shipmentSchema)
  const reply = await adminOrderStep(event, admin, 'ship', async (tx, order) => {
    const [row] = await tx.insert(shipments).values({ orderId: order.id, carrier: input.carrier, tracking: input.tracking, createdById: admin.id }).$returningId()
    await tx.update(orders).set({ status: 'shipped', updatedAt: new Date() }).where(eq(orders.id, order.id))
    await addOrderEvent(tx, order.id, 'shipped', `Shipped with ${input.carrier}, tracking ${input.tracking}.`, admin.id)
    const { school, buyer } = await orderPeople(tx, order)
    const lines = await linesOf(tx, order.id)
    const names = new Map(lines.map((l) => [l.productId, l.name]))
    const held = await tx.select({ productId: stockReservations.productId, quantity: stockReservations.quantity, code: batches.code }).from(stockReservations)
      .innerJoin(batches, eq(batches.id, stockReservations.batchId)).where(and(eq(stockReservations.orderId, order.id), eq(stockReservations.status, 'allocated')))
    const pdf = await packingListPdf({ ...order, number: order.number! }, held.map((h) => ({ name: names.get(h.productId) ?? '', quantity: h.quantity, batchCode: h.code })), school, buyer.name, input)
    await enqueueMail(tx, 'shipped', buyer.email, shippedMail(buyer.name, { number: order.number!, ...input }, appUrl(`/orders/${order.id}`)),
      [{ filename: `Tiltwright-packing-list-${order.number}.pdf`, contentType: 'application/pdf', content: pdf }])
    return { id: row!.id, orderId: order.id }
  })
  setResponseStatus(event, 201)
  return { id: reply.id, order: await replyWithOrder(reply.orderId, admin) }
})
