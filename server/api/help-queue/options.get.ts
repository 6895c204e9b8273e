// The help queue's choices: the staff one may assign to (active support and admin accounts),
// the schools that have tickets, and the parts that can be sent (active, with stock left).
import { and, asc, eq, inArray, isNull, sql } from 'drizzle-orm'
import { batches, products, schools, tickets, users } from '../../database/schema'
import type { QueueOptions } from '../../../shared/types/tickets'

export default defineEventHandler(async (event): Promise<QueueOptions> => {
  await requireRole(event, 'support', 'admin')
  const db = useDb()
  const [staff, withTickets, parts] = await Promise.all([
    db
      .select({ id: users.id, name: users.name, role: users.role })
      .from(users)
      .where(and(inArray(users.role, ['support', 'admin']), isNull(users.disabledAt)))
      .orderBy(asc(users.name), asc(users.id)),
    db
      .selectDistinct({ id: schools.id, name: schools.name })
      .from(schools)
      .innerJoin(tickets, eq(tickets.schoolId, schools.id))
      .orderBy(asc(schools.name), asc(schools.id)),
    db
      .select({
        productId: products.id,
        name: products.name,
        kind: products.kind,
        available: sql<number>`sum(${batches.quantityBuilt} - ${batches.reserved})`.mapWith(Number),
      })
      .from(products)
      .innerJoin(batches, eq(batches.productId, products.id))
      .where(eq(products.active, true))
      .groupBy(products.id, products.name, products.kind)
      .orderBy(asc(products.kind), asc(products.name)),
  ])
  return {
    staff: staff.map(s => ({ id: s.id, name: s.name, role: s.role as 'support' | 'admin' })),
    schools: withTickets,
    parts: parts.filter(p => p.available > 0),
  }
})
