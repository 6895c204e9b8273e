// The order's generated documents as PDFs: invoice, receipt, packing list.
import { orderDocumentParams } from '../../../../../shared/schemas/ids'
import { canSeeOrderDocuments } from '../../../../../shared/utils/shop-rules'
import type { FileReply } from '../../../../../shared/types/common'

export default defineEventHandler(async (event): Promise<FileReply> => {
  const user = await requireUser(event)
  const { kind } = paramsAs(event, orderDocumentParams, 'That document')
  const order = await requireVisibleOrder(event, user)
  if (!canSeeOrderDocuments(user, order)) throw notFound('That document')
  const doc = await renderOrderDocument(useDb(), order, kind)
  if (!doc) throw notFound('That document')
  return pdfReply(event, doc.filename, doc.pdf)
})
