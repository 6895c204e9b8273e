// A cart line's quantity rule, in the words shown beside the line. Plain TypeScript without zod:
// the cart store that reads it is part of every page's first load (modules/js-budget.ts).
export const MAX_LINE_QUANTITY = 500

/** What is wrong with a cart line's quantity, in the words shown beside it; null when it can
 *  be ordered. `available` is the stock the server reported, when known. */
export function lineQuantityProblem(quantity: number, available?: number): string | null {
  if (!Number.isInteger(quantity) || quantity < 1 || quantity > MAX_LINE_QUANTITY)
    return `The quantity must be a whole number from 1 to ${MAX_LINE_QUANTITY}.`
  if (available !== undefined && quantity > available)
    return available > 0
      ? `Only ${available} left in stock: lower the quantity to ${available} or fewer.`
      : 'Out of stock: remove this line.'
  return null
}
