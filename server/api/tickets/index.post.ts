// A builder or teacher asks for help: a ticket on a rig (builders: a rig of a build space they
// belong to; teachers: a rig of their school) or on a whole order (teachers), with its first
// message, sheet and files. Support is mailed.
import { eq } from 'drizzle-orm'
import { openTicketSchema } from '../../../shared/schemas/tickets'
import { canSeeOrder } from '../../../shared/utils/shop-rules'
import { ticketMessages, tickets } from '../../database/schema'
import type { CreatedReply } from '../../../shared/types/common'

export default defineEventHandler(async (event): Promise<CreatedReply> => {
  const user = await requireRole(event, 'teacher', 'builder')
  const input = await readBodyAs(event, openTicketSchema)
  if (user.role === 'builder' && input.orderId !== undefined)
    throw invalid({ rigId: 'Choose the rig this is about.' })
  let target: { orderId: number, schoolId: number, rigId: number | null }
  if (input.rigId !== undefined) {
    const { rig, order } = await loadRigFor(user, input.rigId, 'see')
    target = { orderId: order.id, schoolId: order.schoolId, rigId: rig.id }
  } else {
    const order = await loadOrder(useDb(), input.orderId!)
    if (!order || !canSeeOrder(user, order)) throw notFound('That order')
    target = { orderId: order.id, schoolId: order.schoolId, rigId: null }
  }
  const id = await transactionWithRetry(async (tx) => {
    const sheetId = await checkSheet(tx, user, target.rigId, input.sheetId)
    const now = new Date()
    const [ins] = await tx
      .insert(tickets)
      .values({
        ...target,
        subject: input.subject,
        openedById: user.id,
        createdAt: now,
        lastMessageAt: now,
        statusChangedAt: now,
      })
      .$returningId()
    const ticketId = ins!.id
    const [msg] = await tx
      .insert(ticketMessages)
      .values({ ticketId, authorId: user.id, body: input.message, sheetId, createdAt: now })
      .$returningId()
    await claimAttachments(tx, user, ticketId, msg!.id, input.attachmentIds)
    const [ticket] = await tx.select().from(tickets).where(eq(tickets.id, ticketId)).limit(1)
    await mailTicketOpened(tx, ticket!, user, input.message)
    return ticketId
  })
  setResponseStatus(event, 201)
  return { id }
})
