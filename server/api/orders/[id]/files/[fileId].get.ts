// An uploaded PO or tax certificate, only to those who may see the order's documents.
// Sent as a download with its sniffed type and nosniff, never rendered by the browser as HTML.
import { and, eq } from 'drizzle-orm'
import { storedFiles } from '../../../../database/schema'
import { orderFileParams } from '../../../../../shared/schemas/ids'
import { readStoredFile } from '../../../../services/files'
import { canSeeOrderDocuments } from '../../../../../shared/utils/shop-rules'
import type { FileReply } from '../../../../../shared/types/common'

export default defineEventHandler(async (event): Promise<FileReply> => {
  const user = await requireUser(event)
  const { fileId } = paramsAs(event, orderFileParams, 'That file')
  const order = await requireVisibleOrder(event, user)
  if (!canSeeOrderDocuments(user, order)) throw notFound('That file')
  const [f] = await useDb()
    .select()
    .from(storedFiles)
    .where(and(eq(storedFiles.id, fileId), eq(storedFiles.orderId, order.id)))
    .limit(1)
  const data = f ? await readStoredFile(f.storageKey) : null
  if (!f || !data) throw notFound('That file')
  setResponseHeaders(event, {
    'content-type': f.contentType,
    'content-disposition': `attachment; filename="${f.filename.replace(/"/g, '')}"`,
    'cache-control': 'private, no-store',
    'x-content-type-options': 'nosniff',
    'content-security-policy': 'default-src \'none\'; sandbox',
  })
  return data
})
