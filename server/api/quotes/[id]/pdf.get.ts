// The quote as the purchasing office sees it: the stored lines and money, as a PDF.
import type { FileReply } from '../../../../shared/types/common'

export default defineEventHandler(async (event): Promise<FileReply> => {
  const user = await requireUser(event)
  const q = await requireVisibleQuote(event, user)
  return pdfReply(event, `Tiltwright-quote-${q.number}.pdf`, await renderQuotePdf(useDb(), q))
})
