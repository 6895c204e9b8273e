// The customer side's tickets: a teacher's school's, a builder's (their rigs' and their own);
// `rigId` / `orderId` narrow it to one rig or order, `status=open` leaves resolved ones out.
import { and, asc, desc, eq } from 'drizzle-orm'
import { ticketListQuery } from '../../../shared/schemas/tickets'
import { containsPattern } from '../../../shared/utils/paging'
import { tickets } from '../../database/schema'
import type { TicketListReply } from '../../../shared/types/tickets'

export default defineEventHandler(async (event): Promise<TicketListReply> => {
  const user = await requireRole(event, 'teacher', 'builder')
  const q = queryAs(event, ticketListQuery)
  const where = and(
    visibleTickets(user),
    statusWhere(q.status),
    q.rigId ? eq(tickets.rigId, q.rigId) : undefined,
    q.orderId ? eq(tickets.orderId, q.orderId) : undefined,
    q.q ? ticketSearch(containsPattern(q.q), false) : undefined,
  )
  const column = q.sort === 'createdAt' ? tickets.createdAt : tickets.lastMessageAt
  const dir = q.dir === 'asc' ? asc : desc
  return pagedTickets(q, where, [dir(column), dir(tickets.id)], summaryOf)
})
