// One file for a ticket message, uploaded before the message is sent (multipart, one part named
// `file`): judged from its bytes, stored privately under a random key, and pending (seen by its
// uploader only) until a message claims it. A person holds at most PENDING_UPLOADS_MAX pending
// files, counted under their user row's lock; the body-limits middleware caps how many uploads
// the server receives at once.
import { and, count, eq, isNull } from 'drizzle-orm'
import { ticketAttachments } from '../../database/schema'
import { attachmentProblem, removeStoredFile, safeFilename, storeFile } from '../../services/files'
import { PENDING_UPLOADS_MAX } from '../../../shared/utils/tickets'
import type { AttachmentView } from '../../../shared/types/tickets'

export default defineEventHandler(async (event): Promise<AttachmentView> => {
  const user = await requireRole(event, 'teacher', 'builder', 'support', 'admin')
  const parts = await readMultipartParts(event)
  if (!parts) throw invalid({ file: 'Send the file as a form upload.' })
  const file = parts.find(p => p.name === 'file' && p.filename !== undefined)
  const checked = await attachmentProblem(file)
  if ('problem' in checked) throw invalid({ file: checked.problem }, checked.problem)
  const data = Buffer.from(file!.data)
  const key = await storeFile('ticket', data)
  try {
    const id = await transactionWithRetry(async (tx) => {
      await lockUser(tx, user.id)
      const [pending] = await tx
        .select({ n: count() })
        .from(ticketAttachments)
        .where(
          and(eq(ticketAttachments.uploadedById, user.id), isNull(ticketAttachments.messageId)),
        )
      if ((pending?.n ?? 0) >= PENDING_UPLOADS_MAX)
        throw invalid({
          file:
            `You already have ${PENDING_UPLOADS_MAX} files waiting to be sent. Send your message, `
            + 'or remove some of them, before adding more.',
        })
      const [ins] = await tx
        .insert(ticketAttachments)
        .values({
          kind: checked.kind,
          storageKey: key,
          filename: safeFilename(file!.filename, checked.mime, `${checked.kind}-upload`),
          contentType: checked.mime,
          size: data.length,
          width: checked.width,
          height: checked.height,
          uploadedById: user.id,
        })
        .$returningId()
      return ins!.id
    })
    const [row] = await useDb()
      .select()
      .from(ticketAttachments)
      .where(eq(ticketAttachments.id, id))
      .limit(1)
    setResponseStatus(event, 201)
    return attachmentView(row!)
  } catch (e) {
    await removeStoredFile(key)
    throw e
  }
})
