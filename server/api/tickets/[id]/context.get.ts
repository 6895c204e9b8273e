// What support reads beside a ticket, read-only: the order (items, state, shipments, timeline),
// the rig as its page shows it (checklist, sheets, measured runs) and the other tickets on the
// same rig or order. Support and admin only; 404 for everyone else.
import { and, asc, eq, ne } from 'drizzle-orm'
import { idParams } from '../../../../shared/schemas/ids'
import { orderEvents, orders, schools, shipments, tickets, users } from '../../../database/schema'
import type { TicketContext } from '../../../../shared/types/tickets'

export default defineEventHandler(async (event): Promise<TicketContext> => {
  const user = await requireUser(event)
  const { id } = paramsAs(event, idParams, 'That ticket')
  const { ticket } = await loadTicketFor(user, id, 'staff')
  const db = useDb()
  const [[order], lines, ships, events, related, rig] = await Promise.all([
    db
      .select({ o: orders, schoolName: schools.name, teacherName: users.name })
      .from(orders)
      .innerJoin(schools, eq(schools.id, orders.schoolId))
      .innerJoin(users, eq(users.id, orders.placedById))
      .where(eq(orders.id, ticket.orderId))
      .limit(1),
    linesOf(db, ticket.orderId),
    shipmentViews(db, eq(shipments.orderId, ticket.orderId)),
    db
      .select()
      .from(orderEvents)
      .where(eq(orderEvents.orderId, ticket.orderId))
      .orderBy(asc(orderEvents.createdAt), asc(orderEvents.id)),
    summaryQuery(db)
      .where(
        and(
          ne(tickets.id, ticket.id),
          ticket.rigId
            ? eq(tickets.rigId, ticket.rigId)
            : eq(tickets.orderId, ticket.orderId),
        ),
      )
      .orderBy(...newestFirst)
      .limit(20),
    ticket.rigId ? rigView(db, ticket.rigId, 'staff') : Promise.resolve(null),
  ])
  const o = order!.o
  return {
    order: {
      id: o.id,
      number: o.number ?? '',
      status: o.status,
      schoolName: order!.schoolName,
      teacherName: order!.teacherName,
      placedAt: o.createdAt.toISOString(),
      paidAt: o.paidAt?.toISOString() ?? null,
      items: lines.map(l => ({ productId: l.productId, name: l.name, quantity: l.quantity })),
      shipments: ships,
      timeline: events.map(e => ({
        id: e.id,
        kind: e.kind,
        message: e.message,
        createdAt: e.createdAt.toISOString(),
      })),
    },
    rig,
    related: related.map(summaryOf),
  }
})
