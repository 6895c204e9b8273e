// An admin marks a shipped order delivered.
import type { AdminOrderReply } from '../../../../../shared/types/shop'

export default defineEventHandler(async (event): Promise<AdminOrderReply> => {
  const admin = await requireRole(event, 'admin')
  const id = await visibleOrderId(event, admin)
  await markDelivered(admin, id)
  return replyWithAdminOrder(id, admin)
})
