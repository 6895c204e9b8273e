// An admin cancels an unpaid order, with a reason the teacher and accounts payable read:
// stock released, any invoice voided at the payment service.
import type { AdminOrderReply } from '../../../../../shared/types/shop'
import { adminCancelSchema } from '../../../../../shared/schemas/shop'

export default defineEventHandler(async (event): Promise<AdminOrderReply> => {
  const admin = await requireRole(event, 'admin')
  const input = await readBodyAs(event, adminCancelSchema)
  const id = await visibleOrderId(event, admin)
  await cancelOrder(admin, id, input.reason)
  return replyWithAdminOrder(id, admin)
})
