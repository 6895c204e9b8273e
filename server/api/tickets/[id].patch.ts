// A ticket's status, priority and assignee. Staff change any of them (the assignee an active
// support or admin account); the customer side may only mark it resolved (403 for anything
// else). Each staff change is audited.
import { eq } from 'drizzle-orm'
import { idParams } from '../../../shared/schemas/ids'
import { ticketUpdateSchema } from '../../../shared/schemas/tickets'
import { tickets } from '../../database/schema'
import type { TicketSummary } from '../../../shared/types/tickets'

export default defineEventHandler(async (event): Promise<TicketSummary> => {
  const user = await requireUser(event)
  const { id } = paramsAs(event, idParams, 'That ticket')
  const input = await readBodyAs(event, ticketUpdateSchema)
  await transactionWithRetry(async (tx) => {
    const { ticket, access } = await loadTicketFor(user, id, 'see', tx)
    const customerResolves
      = input.status === 'resolved'
        && input.priority === undefined
        && input.assigneeId === undefined
    if (access !== 'staff' && !customerResolves)
      throw forbidden('Only Tiltwright support changes that. You may mark the ticket resolved.')
    if (input.assigneeId !== undefined) await checkAssignee(tx, input.assigneeId)
    const now = new Date()
    const status = input.status ?? ticket.status
    const values = {
      ...statusChange(ticket.status, status, now),
      ...(input.priority ? { priority: input.priority } : {}),
      ...(input.assigneeId !== undefined ? { assigneeId: input.assigneeId } : {}),
    }
    // Resolving a resolved ticket changes nothing: an UPDATE with nothing to set is an error.
    if (Object.keys(values).length) await tx.update(tickets).set(values).where(eq(tickets.id, id))
    if (access !== 'staff') return
    const assignee = input.assigneeId === undefined ? ticket.assigneeId : input.assigneeId
    const changes = [
      ['status', ticket.status, status],
      ['priority', ticket.priority, input.priority ?? ticket.priority],
      ['assign', ticket.assigneeId, assignee],
    ] as const
    for (const [what, from, to] of changes)
      if (from !== to)
        await audit(tx, {
          actorId: user.id,
          action: `ticket.${what}`,
          subjectType: 'ticket',
          subjectId: id,
          detail: { from, to },
        })
  })
  return ticketSummary(useDb(), id)
})
