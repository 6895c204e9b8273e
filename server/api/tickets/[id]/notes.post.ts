// An internal note: support and admin only (404 for everyone else, the ticket's own teacher
// included). It mails nobody and never appears in a customer's reply, page or e-mail.
import { eq } from 'drizzle-orm'
import { idParams } from '../../../../shared/schemas/ids'
import { ticketNoteSchema } from '../../../../shared/schemas/tickets'
import { ticketMessages, tickets } from '../../../database/schema'
import type { CreatedReply } from '../../../../shared/types/common'

export default defineEventHandler(async (event): Promise<CreatedReply> => {
  const user = await requireUser(event)
  const { id } = paramsAs(event, idParams, 'That ticket')
  await loadTicketFor(user, id, 'staff')
  const input = await readBodyAs(event, ticketNoteSchema)
  const noteId = await transactionWithRetry(async (tx) => {
    await loadTicketFor(user, id, 'staff', tx)
    const now = new Date()
    const [ins] = await tx
      .insert(ticketMessages)
      .values({ ticketId: id, authorId: user.id, internal: true, body: input.body, createdAt: now })
      .$returningId()
    await tx.update(tickets).set({ lastMessageAt: now }).where(eq(tickets.id, id))
    await audit(tx, {
      actorId: user.id,
      action: 'ticket.note',
      subjectType: 'ticket',
      subjectId: id,
      detail: { messageId: ins!.id },
    })
    return ins!.id
  })
  setResponseStatus(event, 201)
  return { id: noteId }
})
