// The admin's staff table: support and admin accounts, paged, sorted and searched.
import { and, asc, count, desc, inArray, like, or } from 'drizzle-orm'
import { staffListQuery } from '../../../../shared/schemas/staff'
import type { StaffListReply } from '../../../../shared/types/staff'
import { containsPattern } from '../../../../shared/utils/paging'
import { STAFF_ROLES } from '../../../../shared/utils/roles'
import { users } from '../../../database/schema'

export default defineEventHandler(async (event): Promise<StaffListReply> => {
  await requireRole(event, 'admin')
  const q = queryAs(event, staffListQuery)
  const term = q.q ? containsPattern(q.q) : undefined
  const where = and(
    inArray(users.role, STAFF_ROLES),
    term ? or(like(users.name, term), like(users.email, term)) : undefined,
  )
  const column = {
    name: users.name,
    email: users.email,
    role: users.role,
    createdAt: users.createdAt,
  }[q.sort]
  const db = useDb()
  return pagedList(
    q,
    db.select({ n: count() }).from(users).where(where),
    db
      .select()
      .from(users)
      .where(where)
      .orderBy(q.dir === 'asc' ? asc(column) : desc(column), asc(users.id)),
    staffMemberOf,
  )
})
