// What is waiting on the staff (GET /api/staff/desk): purchase orders to review, orders to
// allocate and to ship, oldest first (the 20 oldest, with how many wait in all), and mail that
// gave up. The order lists carry totals, so they are the admin's only (support see no prices).
import { and, asc, count, eq, sql, type SQL } from 'drizzle-orm'
import type { DeskOrder, StaffDesk } from '../../shared/types/staff'
import { isAdmin, type SessionUser } from '../../shared/utils/roles'
import type { ReservationStatus } from '../../shared/utils/states'
import { jobs, orders, purchaseOrders, schools } from '../database/schema'

/** At most this many orders in each of the desk's lists. */
export const DESK_LIST_LIMIT = 20

const holds = (status: ReservationStatus) =>
  sql`exists (select 1 from stock_reservations r
    where r.order_id = ${orders.id} and r.status = ${status})`

/** The order may be packed: paid, or its purchase order approved (the order flow's allocate
 *  rows: 'paid', or 'awaiting payment' on a purchase order). */
const mayBePacked = sql`(${orders.status} = 'paid'
  or (${orders.status} = 'awaiting payment' and ${orders.paymentMethod} = 'purchase-order'))`

const allocatedAt = sql<Date>`(select max(e.created_at) from order_events e
  where e.order_id = ${orders.id} and e.kind = 'allocated')`

async function deskOrders(where: SQL | undefined, since: SQL<Date | string>) {
  const listed = useDb()
    .select({
      id: orders.id,
      number: orders.number,
      schoolName: schools.name,
      totalCents: orders.totalCents,
      since,
    })
    .from(orders)
    .innerJoin(schools, eq(schools.id, orders.schoolId))
    .leftJoin(purchaseOrders, eq(purchaseOrders.orderId, orders.id))
    .where(where)
    .orderBy(asc(since), asc(orders.id))
    .limit(DESK_LIST_LIMIT)
  const counted = useDb()
    .select({ n: count() })
    .from(orders)
    .leftJoin(purchaseOrders, eq(purchaseOrders.orderId, orders.id))
    .where(where)
  const [rows, [total]] = await Promise.all([listed, counted])
  const list = rows.map(
    (r): DeskOrder => ({
      id: r.id,
      number: r.number ?? '',
      schoolName: r.schoolName,
      totalCents: r.totalCents,
      since: new Date(r.since).toISOString(),
    }),
  )
  return { list, total: total?.n ?? list.length }
}

export async function staffDesk(user: SessionUser): Promise<StaffDesk> {
  const [failed] = await useDb()
    .select({ n: count() })
    .from(jobs)
    .where(and(eq(jobs.kind, 'mail'), eq(jobs.state, 'failed')))
  if (!isAdmin(user))
    return {
      poToReview: null,
      toAllocate: null,
      toShip: null,
      waiting: null,
      failedMail: failed?.n ?? 0,
    }
  const [poToReview, toAllocate, toShip] = await Promise.all([
    deskOrders(
      and(eq(orders.status, 'po review'), eq(purchaseOrders.status, 'review')),
      sql<Date>`coalesce(${purchaseOrders.createdAt}, ${orders.createdAt})`,
    ),
    deskOrders(
      and(mayBePacked, holds('reserved')),
      sql<Date>`coalesce(${orders.paidAt}, ${purchaseOrders.reviewedAt}, ${orders.createdAt})`,
    ),
    deskOrders(
      and(mayBePacked, holds('allocated'), sql`not ${holds('reserved')}`),
      sql<Date>`coalesce(${allocatedAt}, ${orders.updatedAt})`,
    ),
  ])
  return {
    poToReview: poToReview.list,
    toAllocate: toAllocate.list,
    toShip: toShip.list,
    waiting: {
      poToReview: poToReview.total,
      toAllocate: toAllocate.total,
      toShip: toShip.total,
    },
    failedMail: failed?.n ?? 0,
  }
}
