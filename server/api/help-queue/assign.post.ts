// Assigns several tickets to one staff member (or nobody) in one transaction: only tickets that
// exist change, the assignee must be an active support or admin account (422 otherwise), and
// each change is audited.
import { and, inArray, ne, or, isNull } from 'drizzle-orm'
import { bulkAssignSchema } from '../../../shared/schemas/tickets'
import { tickets } from '../../database/schema'

export default defineEventHandler(async (event): Promise<{ updated: number }> => {
  const user = await requireRole(event, 'support', 'admin')
  const input = await readBodyAs(event, bulkAssignSchema)
  const updated = await transactionWithRetry(async (tx) => {
    await checkAssignee(tx, input.assigneeId)
    const changing = await tx
      .select({ id: tickets.id, assigneeId: tickets.assigneeId })
      .from(tickets)
      .where(
        and(
          inArray(tickets.id, input.ticketIds),
          input.assigneeId === null
            ? undefined
            : or(isNull(tickets.assigneeId), ne(tickets.assigneeId, input.assigneeId)),
        ),
      )
      .for('update')
    const ids = changing.filter(t => t.assigneeId !== input.assigneeId).map(t => t.id)
    if (!ids.length) return 0
    await tx.update(tickets).set({ assigneeId: input.assigneeId }).where(inArray(tickets.id, ids))
    for (const t of changing.filter(c => ids.includes(c.id)))
      await audit(tx, {
        actorId: user.id,
        action: 'ticket.assign',
        subjectType: 'ticket',
        subjectId: t.id,
        detail: { from: t.assigneeId, to: input.assigneeId, bulk: true },
      })
    return ids.length
  })
  return { updated }
})
