// Archives a stock reply: gone from the list, still named on the messages that used it.
import { idParams } from '../../../shared/schemas/ids'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'support', 'admin')
  const { id } = paramsAs(event, idParams, 'That stock reply')
  await transactionWithRetry(tx =>
    changeStockReply(tx, user, id, { archivedAt: new Date() }, 'archive'),
  )
  return sendNoContent(event)
})
