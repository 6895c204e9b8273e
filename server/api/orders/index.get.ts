// The caller's school's orders, newest first. (Admins use /api/admin/orders.)
import { desc, eq } from 'drizzle-orm'
import { orders, purchaseOrders, schools } from '../../database/schema'
import type { OrderSummary } from '../../../shared/types/shop'

export default defineEventHandler(async (event): Promise<{ data: OrderSummary[] }> => {
  const user = await requireRole(event, 'teacher')
  if (!user.schoolId) return { data: [] }
  const rows = await useDb()
    .select({ o: orders, school: schools.name, poNumber: purchaseOrders.poNumber })
    .from(orders)
    .innerJoin(schools, eq(schools.id, orders.schoolId))
    .leftJoin(purchaseOrders, eq(purchaseOrders.orderId, orders.id))
    .where(eq(orders.schoolId, user.schoolId))
    .orderBy(desc(orders.createdAt), desc(orders.id))
    .limit(200)
  return { data: rows.map(orderRowOf) }
})
