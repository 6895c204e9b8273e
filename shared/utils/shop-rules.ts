// Who may see and do what with quotes and orders, and which order steps are open. Pure
// rules shared by the routes (the gate) and the pages (to hide what cannot be used).
import type { SessionUser } from './roles'
import { isOpenUnpaid, type OrderStatus, type PaymentMethod } from './order-flow'

type Who = Pick<SessionUser, 'role' | 'schoolId'> | null | undefined

/** Admins see every order; support read it for context; a teacher sees their own school's. */
export function canSeeOrder(u: Who, order: { schoolId: number }): boolean {
  if (!u) return false
  if (u.role === 'admin' || u.role === 'support') return true
  return u.role === 'teacher' && u.schoolId !== null && u.schoolId === order.schoolId
}

/** Quotes carry prices: the school's teachers and admins only. */
export function canSeeQuote(u: Who, quote: { schoolId: number }): boolean {
  if (!u) return false
  if (u.role === 'admin') return true
  return u.role === 'teacher' && u.schoolId !== null && u.schoolId === quote.schoolId
}

/** Documents with prices (quote, invoice, receipt, uploaded PO) are not for support. */
export function canSeeOrderDocuments(u: Who, order: { schoolId: number }): boolean {
  return !!u && u.role !== 'support' && canSeeOrder(u, order)
}

export function isQuoteValid(
  quote: { validUntil: Date | string, orderId: number | null },
  now = new Date(),
): boolean {
  return quote.orderId === null && new Date(quote.validUntil).getTime() > now.getTime()
}

/** A teacher may cancel their own unpaid order; an admin may cancel any unpaid one
 *  (the order flow's `cancel` rows). */
export function canCancelOrder(
  u: Who,
  order: { schoolId: number, status: OrderStatus, paidAt?: Date | string | null },
): boolean {
  if (!isOpenUnpaid(order.status) || order.paidAt) return false
  if (u?.role === 'admin') return true
  return u?.role === 'teacher' && canSeeOrder(u, order)
}

/** Stock left in a batch, never shown below zero. */
export const unitsLeft = (batch: { quantityBuilt: number, reserved: number }) =>
  Math.max(0, batch.quantityBuilt - batch.reserved)

/**
 * The timeline's words for stock given back when an order ends: "The 7 units it held were
 * released."
 */
export function releasedWords(units: number): string {
  if (units <= 0) return ''
  return units === 1
    ? 'The 1 unit it held was released.'
    : `The ${units} units it held were released.`
}

/** What the order page says about shipping, in words that match the order's state. */
export function shippingNote(order: {
  status: OrderStatus
  paymentMethod: PaymentMethod
  allocated?: boolean
  purchaseOrder?: { status: string, rejectReason: string | null } | null
}): string {
  if (order.status === 'rejected') {
    const reason = order.purchaseOrder?.rejectReason ?? 'it was not accepted'
    return `Purchase order rejected: ${reason.trim().replace(/[.!]+$/, '')}. Nothing will ship.`
  }
  if (order.status === 'cancelled') return 'Cancelled: nothing will ship.'
  if (order.status === 'shipped' || order.status === 'delivered') return 'Shipped.'
  const waitFor
    = order.paymentMethod === 'card'
      ? order.status === 'paid'
        ? null
        : 'paid'
      : order.status === 'po review'
        ? 'the PO is approved'
        : null
  if (order.allocated) return waitFor ? `Ships once ${waitFor}.` : 'Ready to ship.'
  return waitFor ? `Ships once ${waitFor} and allocated.` : 'Ships once allocated for packing.'
}
