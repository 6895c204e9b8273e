// What the kit page says about the quantity typed beside "Add to cart": the line's own limits,
// then the stock left once the cart's quantity of the same kit is counted.
import { MAX_LINE_QUANTITY } from './cart-lines'

/** The problem with adding `quantity` of a kit with `available` in stock when the cart holds
 *  `inCart` of it already; '' when it can be added. */
export function kitQuantityProblem(quantity: number, available: number, inCart: number): string {
  if (!Number.isInteger(quantity) || quantity < 1) return 'Enter a whole number of at least 1.'
  const room = MAX_LINE_QUANTITY - inCart
  if (quantity > room)
    return inCart
      ? `At most ${MAX_LINE_QUANTITY} in one order: the cart has ${inCart} already.`
      : `At most ${MAX_LINE_QUANTITY} in one order.`
  const left = available - inCart
  if (quantity <= left) return ''
  if (!inCart) return `Only ${available} left in stock.`
  if (left <= 0) return `All ${available} in stock are in your cart already.`
  return `Your cart has ${inCart} already; ${left} more can be added (${available} in stock).`
}
