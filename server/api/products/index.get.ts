// The public catalog: every product on sale with its classroom tiers and what is left.
// A builder (a student) gets the kits without prices.
import type { CatalogReply } from '../../../shared/types/shop'

export default defineEventHandler(async (event): Promise<CatalogReply> => {
  const catalog = await loadCatalog(useDb(), { activeOnly: true })
  const hide = await hidePricesFor(event)
  return { data: catalog.map(e => withoutPricesIf(hide, productView(e))) }
})
