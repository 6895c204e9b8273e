// Builders are students: the catalog they see carries no prices (shared/utils/roles.ts
// canSeePrices).
import type { H3Event } from 'h3'
import type { ProductView } from '../../shared/types/shop'
import { canSeePrices } from '../../shared/utils/roles'

/** True for a signed-in caller whose role sees no prices; an anonymous visitor sees them. */
export async function hidePricesFor(event: H3Event): Promise<boolean> {
  const live = await liveSession(event)
  return !!live && !canSeePrices(live.row)
}

export function withoutPricesIf<P extends ProductView>(hide: boolean, view: P): P {
  return hide ? { ...view, priceTiers: [] } : view
}
