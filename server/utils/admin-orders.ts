// The admin's order steps share one shape: lock the order, check the step is open for its
// status, act, record the event; the caller replies with the fresh order view.
import type { H3Event } from 'h3'
import { and, eq } from 'drizzle-orm'
import { stockReservations } from '../database/schema'
import { adminActions } from '../../shared/utils/shop-rules'
import type { SessionUser } from '../../shared/utils/roles'

export type AdminStep = keyof ReturnType<typeof adminActions>

export async function stepsOpenFor(tx: DbOrTx, order: OrderRow) {
  const held = await tx.select({ status: stockReservations.status }).from(stockReservations).where(eq(stockReservations.orderId, order.id))
  const allocated = held.some((h) => h.status === 'allocated') && !held.some((h) => h.status === 'reserved')
  return adminActions({ status: order.status, paymentMethod: order.paymentMethod, allocated, paid: !!order.paidAt })
}

/** Runs one admin step on the order in a transaction; 409 when the step is not open now. */
export async function adminOrderStep<T>(event: H3Event, admin: SessionUser, step: AdminStep, act: (tx: Tx, order: OrderRow) => Promise<T>): Promise<T> {
  return transactionWithRetry(async (tx) => {
    const order = await requireVisibleOrder(event, admin, tx)
    const open = await stepsOpenFor(tx, order)
    if (!open[step]) throw conflict(`That step is not open for an order that is ${order.status}.`, 'wrong-status')
    return act(tx, order)
  })
}

export async function allocateReserved(tx: Tx, orderId: number) {
  const [res] = await tx.update(stockReservations).set({ status: 'allocated' })
    .where(and(eq(stockReservations.orderId, orderId), eq(stockReservations.status, 'reserved')))
  return res.affectedRows
}
