// Support's saved answers, by title (archived ones left out), with how often each was used.
import type { StockRepliesReply } from '../../../shared/types/tickets'

export default defineEventHandler(async (event): Promise<StockRepliesReply> => {
  await requireRole(event, 'support', 'admin')
  return { data: await stockReplyViews(useDb()) }
})
