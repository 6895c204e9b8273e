// Correct a batch's built quantity (a recount); never below what orders already hold.
import { eq } from 'drizzle-orm'
import { idParams } from '../../../../shared/schemas/ids'
import { batchPatchSchema } from '../../../../shared/schemas/shop'
import { batches } from '../../../database/schema'
import type { BatchRecountReply } from '../../../../shared/types/shop'

export default defineEventHandler(async (event): Promise<BatchRecountReply> => {
  const admin = await requireRole(event, 'admin')
  const { id } = paramsAs(event, idParams, 'That batch')
  const input = await readBodyAs(event, batchPatchSchema)
  return transactionWithRetry(async (tx) => {
    const [b] = await tx.select().from(batches).where(eq(batches.id, id)).limit(1).for('update')
    if (!b) throw notFound('That batch')
    if (input.quantity < b.reserved)
      throw conflict(`Orders already hold ${b.reserved} units of this batch.`, 'below-reserved', {
        quantity: `At least ${b.reserved}: orders hold that many.`,
      })
    await tx.update(batches).set({ quantityBuilt: input.quantity }).where(eq(batches.id, id))
    await audit(tx, {
      actorId: admin.id,
      action: 'batch.recounted',
      subjectType: 'batch',
      subjectId: id,
      detail: { from: b.quantityBuilt, to: input.quantity },
    })
    return {
      id,
      quantityBuilt: input.quantity,
      reserved: b.reserved,
      left: input.quantity - b.reserved,
    }
  })
})
