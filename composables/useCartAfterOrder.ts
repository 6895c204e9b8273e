// What happens to the cart once an order is placed. Ordered from the cart: the cart is
// emptied, so the same lines cannot be ordered twice by accident. Ordered from a saved quote:
// the cart may hold something else the teacher is still putting together, so it is kept,
// unless it holds exactly the quote's lines (same products, same quantities) — then it is
// that quote's cart, already ordered, and keeping it would invite a double order.
import type { DocLine } from '~~/shared/types/shop'

export function emptyCartIfItWasThisQuote(
  cart: ReturnType<typeof useCartStore>,
  quoteLines: readonly Pick<DocLine, 'productId' | 'quantity'>[],
) {
  if (cart.holds(quoteLines)) cart.clear()
}

/** A card order keeps the cart until it is paid (leaving the payment page must not lose it);
 *  once paid, a cart holding exactly the order's lines has done its work and is emptied. */
export function emptyCartOncePaid(
  cart: ReturnType<typeof useCartStore>,
  order: { paidAt: string | null, lines: readonly Pick<DocLine, 'productId' | 'quantity'>[] },
) {
  if (order.paidAt) emptyCartIfItWasThisQuote(cart, order.lines)
}
