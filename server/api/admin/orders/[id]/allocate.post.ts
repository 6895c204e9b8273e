// An admin confirms the units held for the order, batch by batch, for packing.
import type { AdminOrderReply } from '../../../../../shared/types/shop'

export default defineEventHandler(async (event): Promise<AdminOrderReply> => {
  const admin = await requireRole(event, 'admin')
  const id = await visibleOrderId(event, admin)
  await allocateOrder(admin, id)
  return replyWithAdminOrder(id, admin)
})
