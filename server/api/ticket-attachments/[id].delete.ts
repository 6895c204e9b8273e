// Removes a file its uploader has not sent yet (404 for anyone else, and once it is sent).
import { and, eq, isNull } from 'drizzle-orm'
import { idParams } from '../../../shared/schemas/ids'
import { ticketAttachments } from '../../database/schema'
import { removeStoredFile } from '../../services/files'

export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  const { id } = paramsAs(event, idParams, 'That file')
  const key = await transactionWithRetry(async (tx) => {
    const [a] = await tx
      .select()
      .from(ticketAttachments)
      .where(and(eq(ticketAttachments.id, id), isNull(ticketAttachments.messageId)))
      .limit(1)
      .for('update')
    if (!a || a.uploadedById !== user.id) throw notFound('That file')
    await tx.delete(ticketAttachments).where(eq(ticketAttachments.id, id))
    return a.storageKey
  })
  await removeStoredFile(key)
  return sendNoContent(event)
})
