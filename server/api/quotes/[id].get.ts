import type { QuoteView } from '../../../shared/types/shop'

export default defineEventHandler(async (event): Promise<QuoteView> => {
  const user = await requireUser(event)
  const q = await requireVisibleQuote(event, user)
  const d = await quoteDetails(useDb(), q)
  const view = quoteView(q, d.lines, d.school)
  return { ...view, lines: await withTierLabels(useDb(), view.lines) }
})
