// An admin confirms the units held for the order, batch by batch, for packing.
import { and, eq } from 'drizzle-orm'
import { batches, stockReservations } from '../../../../database/schema'

export default defineEventHandler(async (event) => {
  const admin = await requireRole(event, 'admin')
  const id = await adminOrderStep(event, admin, 'allocate', async (tx, order) => {
    const held = await tx.select({ quantity: stockReservations.quantity, code: batches.code }).from(stockReservations)
      .innerJoin(batches, eq(batches.id, stockReservations.batchId))
      .where(and(eq(stockReservations.orderId, order.id), eq(stockReservations.status, 'reserved')))
    await allocateReserved(tx, order.id)
    const perBatch = [...held.reduce((m, h) => m.set(h.code, (m.get(h.code) ?? 0) + h.quantity), new Map<string, number>())]
    await addOrderEvent(tx, order.id, 'allocated', `Units allocated for packing: ${perBatch.map(([c, n]) => `batch ${c} × ${n}`).join(', ')}.`, admin.id)
    return order.id
  })
  return replyWithOrder(id, admin)
})
