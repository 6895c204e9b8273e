// Every order, paged, sorted and filtered on the server for the admin table.
import { and, asc, count, desc, eq, like, or } from 'drizzle-orm'
import { adminOrderListQuery } from '../../../../shared/schemas/shop'
import { orders, purchaseOrders, schools } from '../../../database/schema'
import type { AdminOrderListReply } from '../../../../shared/types/shop'
import { containsPattern } from '../../../../shared/utils/paging'

export default defineEventHandler(async (event): Promise<AdminOrderListReply> => {
  await requireRole(event, 'admin')
  const q = queryAs(event, adminOrderListQuery)
  const term = q.q ? containsPattern(q.q) : undefined
  const where = and(
    q.status ? eq(orders.status, q.status) : undefined,
    q.method ? eq(orders.paymentMethod, q.method) : undefined,
    term
      ? or(like(orders.number, term), like(schools.name, term), like(purchaseOrders.poNumber, term))
      : undefined,
  )
  const column = {
    number: orders.id,
    createdAt: orders.createdAt,
    status: orders.status,
    totalCents: orders.totalCents,
    school: schools.name,
  }[q.sort]
  const db = useDb()
  const base = () =>
    db
      .select({ o: orders, school: schools.name, poNumber: purchaseOrders.poNumber })
      .from(orders)
      .innerJoin(schools, eq(schools.id, orders.schoolId))
      .leftJoin(purchaseOrders, eq(purchaseOrders.orderId, orders.id))
  return pagedList(
    q,
    db
      .select({ n: count() })
      .from(orders)
      .innerJoin(schools, eq(schools.id, orders.schoolId))
      .leftJoin(purchaseOrders, eq(purchaseOrders.orderId, orders.id))
      .where(where),
    base()
      .where(where)
      .orderBy(q.dir === 'asc' ? asc(column) : desc(column), desc(orders.id)),
    orderRowOf,
  )
})
