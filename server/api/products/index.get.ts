// The public catalog: every product on sale with its classroom tiers and what is left.
// A builder (a student) gets the kits without prices. Read from the shared snapshot
// (server/utils/snapshots.ts): at most SNAPSHOT_MAX_AGE_MS behind the database.
import type { CatalogReply } from '../../../shared/types/shop'

export default defineEventHandler(async (event): Promise<CatalogReply> => {
  const catalog = await publicCatalog()
  const hide = await hidePricesFor(event)
  if (hide) return { data: catalog.map(e => withoutPricesIf(hide, productView(e))) }
  return jsonOnce(event, catalog, 'list', () => ({ data: catalog.map(productView) }))
})
