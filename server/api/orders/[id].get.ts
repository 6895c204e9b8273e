// One order for its school's teacher, an admin, or support (who read it without money).
import type { OrderReply } from '../../../shared/types/shop'
import { canSeeOrderDocuments } from '../../../shared/utils/shop-rules'
import { unpricedOrder } from '../../../shared/utils/unpriced'

export default defineEventHandler(async (event): Promise<OrderReply> => {
  const user = await requireUser(event)
  const order = await requireVisibleOrder(event, user)
  const view = await orderView(useDb(), order, user)
  // Priced documents and prices go together: whoever may not see the one sees neither.
  return canSeeOrderDocuments(user, order) ? view : unpricedOrder(view)
})
