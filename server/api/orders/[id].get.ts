import type { OrderView } from '../../../shared/types/shop'

export default defineEventHandler(async (event): Promise<OrderView> => {
  const user = await requireUser(event)
  const order = await requireVisibleOrder(event, user)
  return orderView(useDb(), order, user)
})
