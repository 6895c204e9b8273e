// Edit a product; when `tiers` is sent it replaces the product's whole tier list. Quotes and
// orders keep the prices they were made with.
import { eq } from 'drizzle-orm'
import { idParams } from '../../../../shared/schemas/ids'
import { productPatchSchema } from '../../../../shared/schemas/shop'
import { priceTiers, products } from '../../../database/schema'
import type { ProductView } from '../../../../shared/types/shop'

export default defineEventHandler(async (event): Promise<ProductView> => {
  const admin = await requireRole(event, 'admin')
  const { id } = paramsAs(event, idParams, 'That product')
  const { tiers, ...input } = await readBodyAs(event, productPatchSchema)
  await uniqueOr409('slug', 'Another product already uses that slug.', () =>
    transactionWithRetry(async (tx) => {
      const [p] = await tx.select().from(products).where(eq(products.id, id)).limit(1).for('update')
      if (!p) throw notFound('That product')
      if (Object.keys(input).length) await tx.update(products).set(input).where(eq(products.id, id))
      if (tiers) {
        await tx.delete(priceTiers).where(eq(priceTiers.productId, id))
        await tx.insert(priceTiers).values(tiers.map(t => ({ productId: id, ...t })))
      }
      await audit(tx, {
        actorId: admin.id,
        action: 'product.updated',
        subjectType: 'product',
        subjectId: id,
        detail: { fields: Object.keys(input), tiers: !!tiers },
      })
    }),
  )
  const [entry] = await loadCatalog(useDb(), { activeOnly: false, ids: [id] })
  return productView(entry!)
})
