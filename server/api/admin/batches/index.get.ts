// Every production batch with what is left, newest first.
import { desc, eq } from 'drizzle-orm'
import { batches, products } from '../../../database/schema'
import { unitsLeft } from '../../../../shared/utils/shop-rules'
import type { BatchListReply } from '../../../../shared/types/shop'

export default defineEventHandler(async (event): Promise<BatchListReply> => {
  await requireRole(event, 'admin')
  const rows = await useDb()
    .select({ b: batches, product: products.name, slug: products.slug })
    .from(batches)
    .innerJoin(products, eq(products.id, batches.productId))
    .orderBy(desc(batches.builtOn), desc(batches.id))
    .limit(500)
  return {
    data: rows.map(r => ({
      id: r.b.id,
      productId: r.b.productId,
      product: r.product,
      slug: r.slug,
      code: r.b.code,
      quantityBuilt: r.b.quantityBuilt,
      reserved: r.b.reserved,
      left: unitsLeft(r.b),
      builtOn: r.b.builtOn.toISOString(),
    })),
  }
})
