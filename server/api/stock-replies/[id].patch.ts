// Rewrites a stock reply (its title stays unique: 409 on `title`); an archived one is gone (404).
import { idParams } from '../../../shared/schemas/ids'
import { stockReplySchema } from '../../../shared/schemas/tickets'
import type { StockReplyView } from '../../../shared/types/tickets'

export default defineEventHandler(async (event): Promise<StockReplyView> => {
  const user = await requireRole(event, 'support', 'admin')
  const { id } = paramsAs(event, idParams, 'That stock reply')
  const input = await readBodyAs(event, stockReplySchema)
  await uniqueOr409('title', STOCK_REPLY_TITLE_TAKEN, () =>
    transactionWithRetry(tx =>
      changeStockReply(tx, user, id, { ...input, updatedAt: new Date() }, 'update'),
    ),
  )
  const [view] = await stockReplyViews(useDb(), id)
  return view!
})
