// The quote as the purchasing office sees it: the stored lines and money, as a PDF.
export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  const q = await requireVisibleQuote(event, user)
  return pdfReply(event, `Tiltwright-quote-${q.number}.pdf`, await renderQuotePdf(useDb(), q))
})
