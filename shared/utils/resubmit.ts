// The one way back from a refused purchase order: order again from the quote while it is still
// valid (its prices hold), else resubmit a corrected purchase order for the same lines.
import { isQuoteValid } from './shop-rules'

export interface WayBack {
  kind: 'quote' | 'same-lines'
  url: string
  label: string
}

export function wayBackAfterRejection(
  order: { id: number },
  po: { status: string } | null | undefined,
  quote:
    | { id: number, number: string | null, validUntil: Date | string, orderId: number | null }
    | null
    | undefined,
  now = new Date(),
): WayBack | null {
  if (po?.status !== 'rejected') return null
  if (quote && isQuoteValid(quote, now)) {
    const label = `Send a corrected purchase order for quote ${quote.number ?? quote.id}`
    return { kind: 'quote', url: `/checkout?quote=${quote.id}`, label }
  }
  const label = 'Send a corrected purchase order for the same items'
  return { kind: 'same-lines', url: `/checkout?resubmit=${order.id}`, label }
}
