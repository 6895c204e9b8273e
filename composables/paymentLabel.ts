import type { OrderSummary } from '~~/shared/types/shop'

/** How an order is paid, as the order lists say it: "Card" or "PO" with its number. */
export const paymentLabel = (o: Pick<OrderSummary, 'paymentMethod' | 'poNumber'>) =>
  o.paymentMethod === 'card' ? 'Card' : `PO ${o.poNumber ?? ''}`
