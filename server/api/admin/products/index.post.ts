import { productSchema } from '../../../../shared/schemas/shop'
import { max } from 'drizzle-orm'
import { priceTiers, products } from '../../../database/schema'
import type { CreatedReply } from '../../../../shared/types/common'

export default defineEventHandler(async (event): Promise<CreatedReply> => {
  const admin = await requireRole(event, 'admin')
  const { tiers, ...input } = await readBodyAs(event, productSchema)
  const id = await uniqueOr409('slug', 'Another product already uses that slug.', () =>
    transactionWithRetry(async (tx) => {
      const [last] = await tx.select({ n: max(products.sortOrder) }).from(products)
      const [row] = await tx
        .insert(products)
        .values({ ...input, sortOrder: (last?.n ?? 0) + 1 })
        .$returningId()
      await tx.insert(priceTiers).values(tiers.map(t => ({ productId: row!.id, ...t })))
      await audit(tx, {
        actorId: admin.id,
        action: 'product.created',
        subjectType: 'product',
        subjectId: row!.id,
      })
      return row!.id
    }),
  )
  setResponseStatus(event, 201)
  return { id }
})
