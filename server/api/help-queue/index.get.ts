// The help queue: every ticket, paged, sorted and filtered on the server (status, priority,
// assignee, school, age) with a search through subjects and every message body, the staff's
// internal notes included. Priority and status sort by their rank, not alphabetically; ties go
// by id, oldest first.
import { and, asc, desc, eq, isNull, lte, sql } from 'drizzle-orm'
import { queueQuerySchema } from '../../../shared/schemas/tickets'
import { containsPattern } from '../../../shared/utils/paging'
import { PRIORITY_RANK, TICKET_AGE_HOURS } from '../../../shared/utils/tickets'
import { TICKET_PRIORITIES } from '../../../shared/utils/states'
import { schools, tickets } from '../../database/schema'
import type { QueueReply } from '../../../shared/types/tickets'

type Ranked = typeof tickets.priority | typeof tickets.status
const rankOf = (column: Ranked, ranks: [string, number][]) =>
  sql`(case ${column} ${sql.join(
    ranks.map(([v, n]) => sql`when ${v} then ${n}`),
    sql` `,
  )} end)`

// MariaDB sorts an ENUM column by the position of its value in the declaration, and both enums
// are declared in rank order (TICKET_PRIORITIES low → urgent, TICKET_STATUSES in the queue's
// order): sorting the column itself sorts by rank and can read an index in order. If a
// declaration ever leaves rank order, the rank expression takes over.
const enumInRankOrder = TICKET_PRIORITIES.every((p, i) => PRIORITY_RANK[p] === i)
const SORTS = {
  createdAt: tickets.createdAt,
  lastMessageAt: tickets.lastMessageAt,
  priority: enumInRankOrder
    ? tickets.priority
    : rankOf(tickets.priority, Object.entries(PRIORITY_RANK)),
  status: tickets.status,
  subject: tickets.subject,
  school: schools.name,
}

export default defineEventHandler(async (event): Promise<QueueReply> => {
  const user = await requireRole(event, 'support', 'admin')
  const q = queryAs(event, queueQuerySchema)
  const hours = q.age ? TICKET_AGE_HOURS[q.age] : 0
  const where = and(
    statusWhere(q.status),
    q.priority ? eq(tickets.priority, q.priority) : undefined,
    q.assignee === 'none'
      ? isNull(tickets.assigneeId)
      : q.assignee
        ? eq(tickets.assigneeId, q.assignee === 'me' ? user.id : Number(q.assignee))
        : undefined,
    q.school ? eq(tickets.schoolId, q.school) : undefined,
    q.age ? lte(tickets.createdAt, new Date(Date.now() - hours * 3_600_000)) : undefined,
    q.q ? ticketSearch(containsPattern(q.q), true) : undefined,
  )
  const dir = q.dir === 'asc' ? asc : desc
  return pagedTickets(q, where, [dir(SORTS[q.sort]), asc(tickets.id)], queueRowOf)
})
