import { eq } from 'drizzle-orm'
import { orders } from '../../../../database/schema'

export default defineEventHandler(async (event) => {
  const admin = await requireRole(event, 'admin')
  const id = await adminOrderStep(event, admin, 'markDelivered', async (tx, order) => {
    await tx.update(orders).set({ status: 'delivered', updatedAt: new Date() }).where(eq(orders.id, order.id))
    await addOrderEvent(tx, order.id, 'delivered', 'Delivered.', admin.id)
    return order.id
  })
  return replyWithOrder(id, admin)
})
