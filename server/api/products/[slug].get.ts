import { slugParams } from '../../../shared/schemas/ids'
import type { ProductDetail } from '../../../shared/types/shop'

export default defineEventHandler(async (event): Promise<ProductDetail> => {
  const { slug } = paramsAs(event, slugParams, 'That product')
  const catalog = await publicCatalog()
  const entry = catalog.find(e => e.row.slug === slug)
  if (!entry) throw notFound('That product')
  const hide = await hidePricesFor(event)
  const detail = (): ProductDetail => ({
    ...withoutPricesIf(hide, productView(entry)),
    description: entry.row.description,
    specs: entry.row.specs,
    weightGrams: entry.row.weightGrams,
  })
  return hide ? detail() : jsonOnce(event, catalog, slug, detail)
})
