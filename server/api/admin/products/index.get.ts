// The whole catalog for the admin, withdrawn products and empty batches included.
import type { AdminCatalogReply } from '../../../../shared/types/shop'

export default defineEventHandler(async (event): Promise<AdminCatalogReply> => {
  await requireRole(event, 'admin')
  const catalog = await loadCatalog(useDb(), { activeOnly: false })
  return {
    data: catalog.map(e => ({
      ...productView(e),
      batches: e.batches,
      description: e.row.description,
      specs: e.row.specs,
      weightGrams: e.row.weightGrams,
    })),
  }
})
