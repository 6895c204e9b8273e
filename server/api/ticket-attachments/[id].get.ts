// A ticket attachment's bytes: to its uploader while pending, afterwards to whoever may see the
// ticket (a note's files to staff only); 404 for anyone else. Always a download with its sniffed
// type, nosniff and a sandbox policy; `?inline=1` lets a photo or video show in <img>/<video>
// (never a PDF, which a browser would open as a document).
import { eq } from 'drizzle-orm'
import { idParams } from '../../../shared/schemas/ids'
import { ticketAttachments, ticketMessages } from '../../database/schema'
import { readStoredFile } from '../../services/files'
import type { FileReply } from '../../../shared/types/common'

export default defineEventHandler(async (event): Promise<FileReply> => {
  const user = await requireUser(event)
  const { id } = paramsAs(event, idParams, 'That file')
  const db = useDb()
  const [a] = await db.select().from(ticketAttachments).where(eq(ticketAttachments.id, id)).limit(1)
  if (!a) throw notFound('That file')
  if (a.messageId === null) {
    if (a.uploadedById !== user.id) throw notFound('That file')
  } else {
    const [m] = await db
      .select({ ticketId: ticketMessages.ticketId, internal: ticketMessages.internal })
      .from(ticketMessages)
      .where(eq(ticketMessages.id, a.messageId))
      .limit(1)
    const { access } = await loadTicketFor(user, m!.ticketId).catch(() => {
      throw notFound('That file')
    })
    if (m!.internal && access !== 'staff') throw notFound('That file')
  }
  const data = await readStoredFile(a.storageKey)
  if (!data) throw notFound('That file')
  const inline = getQuery(event).inline === '1' && (a.kind === 'image' || a.kind === 'video')
  setResponseHeaders(event, {
    'content-type': a.contentType,
    'content-disposition': `${inline ? 'inline' : 'attachment'}; filename="${a.filename}"`,
    'cache-control': 'private, no-store',
    'x-content-type-options': 'nosniff',
    'content-security-policy': 'sandbox; default-src \'none\'',
  })
  return data
})
