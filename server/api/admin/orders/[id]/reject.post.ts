// An admin rejects a purchase order with a reason: the order ends as rejected, its stock is
// released, and the teacher is told why and how to resubmit.
import type { AdminOrderReply } from '../../../../../shared/types/shop'
import { rejectSchema } from '../../../../../shared/schemas/shop'

export default defineEventHandler(async (event): Promise<AdminOrderReply> => {
  const admin = await requireRole(event, 'admin')
  const input = await readBodyAs(event, rejectSchema)
  const id = await visibleOrderId(event, admin)
  await rejectPurchaseOrder(admin, id, input.reason)
  return replyWithAdminOrder(id, admin)
})
