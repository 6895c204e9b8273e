export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  const q = await requireVisibleQuote(event, user)
  const d = await quoteDetails(useDb(), q)
  const view = quoteView(q, d.lines, d.school)
  return { ...view, lines: await withTierLabels(useDb(), view.lines) }
})
