// A teacher cancels their school's unpaid order; its stock goes back to the batches and any
// invoice is voided. (Admins cancel with a reason through /api/admin/orders/[id]/cancel.)
import { teacherCancelSchema } from '../../../../shared/schemas/shop'
import type { OrderView } from '../../../../shared/types/shop'

export default defineEventHandler(async (event): Promise<OrderView> => {
  const user = await requireRole(event, 'teacher')
  const input = await readBodyAs(event, teacherCancelSchema)
  const id = await visibleOrderId(event, user)
  await cancelOrder(user, id, input.reason || 'cancelled at the school\'s request')
  return replyWithOrder(id, user)
})
