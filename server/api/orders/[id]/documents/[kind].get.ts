// The order's generated documents as PDFs: invoice, receipt, packing list.
import { canSeeOrderDocuments } from '../../../../../shared/utils/shop-rules'

export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  const order = await requireVisibleOrder(event, user)
  if (!canSeeOrderDocuments(user, order)) throw notFound('That document')
  const kind = getRouterParam(event, 'kind') as OrderDocumentKind
  if (!ORDER_DOCUMENT_KINDS.includes(kind)) throw notFound('That document')
  const doc = await renderOrderDocument(useDb(), order, kind)
  if (!doc) throw notFound('That document')
  return pdfReply(event, doc.filename, doc.pdf)
})
