// A new production batch adds stock to a product.
import { eq } from 'drizzle-orm'
import { batchSchema } from '../../../../shared/schemas/shop'
import { batches, products } from '../../../database/schema'
import type { CreatedReply } from '../../../../shared/types/common'

export default defineEventHandler(async (event): Promise<CreatedReply> => {
  const admin = await requireRole(event, 'admin')
  const input = await readBodyAs(event, batchSchema)
  const id = await uniqueOr409('code', 'A batch with that code already exists.', () =>
    transactionWithRetry(async (tx) => {
      const [p] = await tx
        .select({ id: products.id })
        .from(products)
        .where(eq(products.id, input.productId))
        .limit(1)
      if (!p) throw invalid({ productId: 'No such product.' })
      const [row] = await tx
        .insert(batches)
        .values({
          productId: input.productId,
          code: input.code,
          quantityBuilt: input.quantity,
          builtOn: input.builtOn ?? new Date(),
        })
        .$returningId()
      await audit(tx, {
        actorId: admin.id,
        action: 'batch.created',
        subjectType: 'batch',
        subjectId: row!.id,
        detail: { quantity: input.quantity },
      })
      return row!.id
    }),
  )
  setResponseStatus(event, 201)
  return { id }
})
