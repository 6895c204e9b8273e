// Rewrites a stock reply (its title stays unique: 409 on `title`); an archived one is gone (404).
import { and, eq, isNull } from 'drizzle-orm'
import { idParams } from '../../../shared/schemas/ids'
import { stockReplySchema } from '../../../shared/schemas/tickets'
import { stockReplies } from '../../database/schema'
import type { StockReplyView } from '../../../shared/types/tickets'

export default defineEventHandler(async (event): Promise<StockReplyView> => {
  const user = await requireRole(event, 'support', 'admin')
  const { id } = paramsAs(event, idParams, 'That stock reply')
  const input = await readBodyAs(event, stockReplySchema)
  await uniqueOr409('title', STOCK_REPLY_TITLE_TAKEN, () =>
    useDb().transaction(async (tx) => {
      const [res] = await tx
        .update(stockReplies)
        .set({ ...input, updatedAt: new Date() })
        .where(and(eq(stockReplies.id, id), isNull(stockReplies.archivedAt)))
      if (res.affectedRows !== 1) throw notFound('That stock reply')
      await audit(tx, {
        actorId: user.id,
        action: 'stock-reply.update',
        subjectType: 'stock-reply',
        subjectId: id,
      })
    }),
  )
  const [view] = await stockReplyViews(useDb(), id)
  return view!
})
