// A new stock reply; its title is unique (409 on `title`).
import { stockReplySchema } from '../../../shared/schemas/tickets'
import { stockReplies } from '../../database/schema'
import type { CreatedReply } from '../../../shared/types/common'

export default defineEventHandler(async (event): Promise<CreatedReply> => {
  const user = await requireRole(event, 'support', 'admin')
  const input = await readBodyAs(event, stockReplySchema)
  const id = await uniqueOr409('title', STOCK_REPLY_TITLE_TAKEN, () =>
    transactionWithRetry(async (tx) => {
      const [ins] = await tx
        .insert(stockReplies)
        .values({ ...input, createdById: user.id })
        .$returningId()
      await audit(tx, {
        actorId: user.id,
        action: 'stock-reply.create',
        subjectType: 'stock-reply',
        subjectId: ins!.id,
      })
      return ins!.id
    }),
  )
  setResponseStatus(event, 201)
  return { id }
})
