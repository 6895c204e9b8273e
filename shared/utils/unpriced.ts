// An order as support read it: everything but money. Support help schools with an order's
// state, shipping and paperwork; prices, totals and amounts are the admin's and the school's.
import type { OrderView, UnpricedOrderView } from '../types/shop'

/** formatCents()'s shape ("$1,234.50", "-$5.00"). */
const AMOUNT = /-?\$\d{1,3}(?:,\d{3})*\.\d{2}/g

/** The timeline's words with every amount taken out. */
export function withoutAmounts(text: string): string {
  return text.replace(AMOUNT, 'an amount')
}

export function unpricedOrder(view: OrderView): UnpricedOrderView {
  const {
    subtotalCents: _s,
    shippingCents: _h,
    taxCents: _t,
    totalCents: _o,
    lines,
    events,
    ...rest
  } = view
  return {
    ...rest,
    pricesHidden: true,
    lines: lines.map(l => ({
      productId: l.productId,
      name: l.name,
      quantity: l.quantity,
      tierLabel: l.tierLabel ?? null,
    })),
    events: events.map(e => ({ ...e, message: withoutAmounts(e.message) })),
  }
}
