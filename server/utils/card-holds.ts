// A card order holds its stock while the buyer is on the payment page. One that is never paid
// would hold it for ever, so unpaid card orders older than the hold are cancelled and their
// units go back to the batches. The provider's hosted checkout expires after 24 hours, so
// after a 48-hour hold no payment can still arrive for the order.
import { and, asc, eq, isNull, lt } from 'drizzle-orm'
import { orders } from '../database/schema'
import { orderCancelledMail } from '../emails/shop'

export async function expireUnpaidCardOrders(now = new Date()): Promise<number> {
  const hours = Number(useRuntimeConfig().cardHoldHours) || 48
  const cutoff = new Date(now.getTime() - hours * 3600_000)
  const stale = await useDb().select({ id: orders.id }).from(orders)
    .where(and(eq(orders.paymentMethod, 'card'), eq(orders.status, 'awaiting payment'), isNull(orders.paidAt), lt(orders.createdAt, cutoff)))
    .orderBy(asc(orders.id)).limit(100)
  let cancelled = 0
  for (const { id } of stale) {
    cancelled += await transactionWithRetry(async (tx) => {
      // Re-read under a lock: a webhook may have marked it paid a moment ago.
      const order = await loadOrder(tx, id, true)
      if (!order || order.status !== 'awaiting payment' || order.paidAt) return 0
      await cancelOrderIn(tx, order, null, `The card payment was not completed within ${hours} hours, so the order was cancelled.`)
      const { buyer } = await orderPeople(tx, order)
      await enqueueMail(tx, 'order-cancelled', buyer.email, orderCancelledMail(buyer.name, { number: order.number! }, appUrl(`/orders/${order.id}`)))
      return 1
    })
  }
  return cancelled
}
