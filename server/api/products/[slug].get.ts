import { slugParams } from '../../../shared/schemas/ids'
import type { ProductDetail } from '../../../shared/types/shop'

export default defineEventHandler(async (event): Promise<ProductDetail> => {
  const { slug } = paramsAs(event, slugParams, 'That product')
  const entry = (await publicCatalog()).find(e => e.row.slug === slug)
  if (!entry) throw notFound('That product')
  const view = withoutPricesIf(await hidePricesFor(event), productView(entry))
  return {
    ...view,
    description: entry.row.description,
    specs: entry.row.specs,
    weightGrams: entry.row.weightGrams,
  }
})
