import { and, asc, count, desc, inArray, like, or } from 'drizzle-orm'
import { staffListQuery } from '../../../../shared/schemas/staff'
import { users } from '../../../database/schema'

export default defineEventHandler(async (event) => {
  await requireRole(event, 'admin')
  const q = queryAs(event, staffListQuery)
  const where = and(
    inArray(users.role, ['support', 'admin']),
    q.q ? or(like(users.name, `%${q.q}%`), like(users.email, `%${q.q}%`)) : undefined,
  )
  const column = {
    name: users.name,
    email: users.email,
    role: users.role,
    createdAt: users.createdAt,
  }[q.sort]
  const db = useDb()
  const [rows, [total]] = await Promise.all([
    db
      .select({
        id: users.id,
        name: users.name,
        email: users.email,
        role: users.role,
        createdAt: users.createdAt,
        disabledAt: users.disabledAt,
      })
      .from(users)
      .where(where)
      .orderBy(q.dir === 'asc' ? asc(column) : desc(column), asc(users.id))
      .limit(q.pageSize)
      .offset((q.page - 1) * q.pageSize),
    db.select({ n: count() }).from(users).where(where),
  ])
  return { data: rows, meta: { total: total?.n ?? 0, page: q.page, pageSize: q.pageSize } }
})
