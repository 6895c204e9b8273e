// A teacher (or an admin) cancels an unpaid order; its stock goes back to the batches.
import { canCancelOrder } from '../../../../shared/utils/shop-rules'
import { orderCancelledMail } from '../../../emails/shop'

export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  const id = await transactionWithRetry(async (tx) => {
    const order = await requireVisibleOrder(event, user, tx)
    if (!canCancelOrder(user, order)) {
      if (user.role === 'support') throw forbidden('Support staff cannot cancel orders.')
      throw conflict(order.status === 'cancelled' ? 'This order is already cancelled.' : 'A paid or shipped order cannot be cancelled here; contact us instead.', 'not-cancellable')
    }
    await cancelOrderIn(tx, order, user, `Cancelled by ${user.name}.`)
    const { buyer } = await orderPeople(tx, order)
    await enqueueMail(tx, 'order-cancelled', buyer.email, orderCancelledMail(buyer.name, { number: order.number! }, appUrl(`/orders/${order.id}`)))
    return order.id
  })
  return replyWithOrder(id, user)
})
