// Order queries that the order engine (order-steps.ts) and the routes share: stock
// reservation under row locks, the checkout's lines and money, the timeline, the order's view.
import { and, asc, eq, inArray, type SQL } from 'drizzle-orm'
import type { H3Event } from 'h3'
import {
  batches,
  orderEvents,
  orderLines,
  products,
  shipmentItems,
  orders,
  purchaseOrders,
  quoteLines,
  quotes,
  schools,
  shipments,
  stockReservations,
  storedFiles,
  users,
} from '../database/schema'
import type {
  ShipmentView,
  AdminOrderReply,
  OrderDocument,
  OrderSummary,
  OrderView,
} from '../../shared/types/shop'
import {
  canCancelOrder,
  canSeeOrder,
  canSeeOrderDocuments,
  isQuoteValid,
  unitsLeft,
} from '../../shared/utils/shop-rules'
import { CLOSED_STATUSES, openActions } from '../../shared/utils/order-flow'
import type { SessionUser } from '../../shared/utils/roles'
import {
  lineTierWording,
  orderSizeProblem,
  type PricedLine,
  type Totals,
} from '../../shared/utils/pricing'
import { quoteTaxNote, retax, taxLineLabel } from '../../shared/utils/tax'
import { shipmentCarrier } from '../../shared/utils/shipments'
import type { CartLine } from '../../shared/schemas/shop'
import type { CheckoutAddresses } from '../../shared/schemas/address'
import { idParams } from '../../shared/schemas/ids'

export type OrderRow = typeof orders.$inferSelect

export const orderNumberFor = (id: number) => `TW-${10000 + id}`
export const quoteNumberFor = (id: number, at: Date) =>
  `Q-${at.getUTCFullYear()}-${String(id).padStart(5, '0')}`

/** InnoDB may pick a waiting transaction as a deadlock victim, and on a Galera cluster a
 *  transaction that loses certification to another node's conflicting commit fails with the
 *  same deadlock error at COMMIT (drizzle rolls back and rethrows it, so it lands here too).
 *  The work is safe to redo: the whole transaction runs again, reading afresh. */
export async function transactionWithRetry<T>(
  fn: (tx: Tx) => Promise<T>,
  attempts = 8,
): Promise<T> {
  for (let i = 1; ; i++) {
    try {
      return await useDb().transaction(fn)
    } catch (e) {
      // A lock wait timeout already cost a long wait (innodb_lock_wait_timeout): one more try.
      const timedOut = someCause(e, c => c.errno === 1205)
      if (i >= attempts || !isLockFailure(e) || (timedOut && i >= 2)) throw e
      // One line per retry: the cluster test counts them (docs/scaling.md).
      console.warn(`[db] lock conflict, transaction retried (attempt ${i + 1})`)
      await new Promise(r => setTimeout(r, 20 * i + Math.random() * 30 * i))
    }
  }
}

export async function addOrderEvent(
  tx: DbOrTx,
  orderId: number,
  kind: string,
  message: string,
  actorId: number | null = null,
) {
  await tx.insert(orderEvents).values({ orderId, kind, message: message.slice(0, 500), actorId })
}

/** Reserves every line's units from the product's batches, oldest first. The batch rows are
 *  locked (SELECT … FOR UPDATE, in id order) so concurrent checkouts queue rather than both
 *  seeing the same last units. Short stock throws 409 naming each short line (`lines.N.quantity`,
 *  or `<field>.N.quantity`). Answers the ids of the reservation rows it made. */
export async function reserveStock(
  tx: Tx,
  orderId: number,
  lines: { productId: number, quantity: number, name: string }[],
  field = 'lines',
): Promise<number[]> {
  const locked = await tx
    .select()
    .from(batches)
    .where(
      inArray(
        batches.productId,
        lines.map(l => l.productId),
      ),
    )
    .orderBy(asc(batches.id))
    .for('update')
  const fifo = [...locked].sort((a, b) => a.builtOn.getTime() - b.builtOn.getTime() || a.id - b.id)
  const fields: Record<string, string> = {}
  lines.forEach((l, i) => {
    const left = fifo.filter(b => b.productId === l.productId).reduce((s, b) => s + unitsLeft(b), 0)
    if (left < l.quantity)
      fields[`${field}.${i}.quantity`] = left
        ? `Only ${left} of ${l.name} left.`
        : `${l.name} is out of stock.`
  })
  if (Object.keys(fields).length)
    throw conflict(
      'Some items no longer have enough stock. Lower the quantities and try again.',
      'out-of-stock',
      fields,
    )
  const made: number[] = []
  for (const l of lines) {
    let need = l.quantity
    for (const b of fifo) {
      if (need === 0) break
      if (b.productId !== l.productId) continue
      const take = Math.min(need, unitsLeft(b))
      if (!take) continue
      const [res] = await tx
        .update(batches)
        .set({ reserved: b.reserved + take })
        .where(and(eq(batches.id, b.id), eq(batches.reserved, b.reserved)))
      if (res.affectedRows !== 1) throw new Error(`batch ${b.id} changed under its row lock`)
      b.reserved += take
      need -= take
      const [ins] = await tx
        .insert(stockReservations)
        .values({ orderId, productId: l.productId, batchId: b.id, quantity: take })
        .$returningId()
      made.push(ins!.id)
    }
  }
  return made
}

/** Gives an order's reserved or allocated units back to their batches. */
export async function releaseStock(tx: Tx, orderId: number) {
  const held = await tx
    .select()
    .from(stockReservations)
    .where(
      and(
        eq(stockReservations.orderId, orderId),
        inArray(stockReservations.status, ['reserved', 'allocated']),
      ),
    )
  if (!held.length) return 0
  const locked = await tx
    .select()
    .from(batches)
    .where(inArray(batches.id, [...new Set(held.map(h => h.batchId))]))
    .orderBy(asc(batches.id))
    .for('update')
  for (const b of locked) {
    const give = held.filter(h => h.batchId === b.id).reduce((s, h) => s + h.quantity, 0)
    await tx
      .update(batches)
      .set({ reserved: Math.max(0, b.reserved - give) })
      .where(eq(batches.id, b.id))
  }
  await tx
    .update(stockReservations)
    .set({ status: 'released' })
    .where(
      inArray(
        stockReservations.id,
        held.map(h => h.id),
      ),
    )
  return held.reduce((s, h) => s + h.quantity, 0)
}

/** A stored quote or order line as a priced line (its tier range as it was kept). */
export const pricedLineOf = (l: PricedLine): PricedLine => ({
  productId: l.productId,
  name: l.name,
  quantity: l.quantity,
  tierMinQuantity: l.tierMinQuantity,
  unitPriceCents: l.unitPriceCents,
  lineTotalCents: l.lineTotalCents,
  tierLabel: l.tierLabel,
})

export interface OrderSource {
  lines: PricedLine[]
  totals: Totals
  quoteId: number | null
  /** Where it ships and whom it bills (the school's address unless checkout gave others). */
  addresses: CheckoutAddresses
  /** Said on the timeline when a quote's tax changed for the order (exemption, destination). */
  taxNote: string | null
}

/** The lines and money of a checkout: the quote's (locked, still valid, the caller's school)
 *  or the cart's priced from the catalog now. Tax follows the ship-to state and the school's
 *  exemption as they are now, also for a quote (its lines and shipping stay as quoted). */
export async function resolveCheckout(
  tx: Tx,
  user: SessionUser,
  input: { quoteId?: number, lines?: CartLine[], addresses?: CheckoutAddresses | null },
): Promise<OrderSource> {
  const school = await loadSchool(tx, user.schoolId!)
  const addresses = checkoutAddressesFor(school, input.addresses)
  const basis = schoolTaxBasis(school, addresses.shipTo.region)
  if (input.quoteId) {
    const [q] = await tx
      .select()
      .from(quotes)
      .where(eq(quotes.id, input.quoteId))
      .limit(1)
      .for('update')
    if (!q || q.schoolId !== user.schoolId) throw notFound('That quote')
    if (!isQuoteValid(q))
      throw conflict(
        q.orderId
          ? 'This quote has already been turned into an order.'
          : 'This quote has expired. Save the cart as a new quote.',
        q.orderId ? 'quote-used' : 'quote-expired',
      )
    const lines = await tx
      .select()
      .from(quoteLines)
      .where(eq(quoteLines.quoteId, q.id))
      .orderBy(asc(quoteLines.id))
    const totals = retax(q, basis)
    return {
      quoteId: q.id,
      addresses,
      taxNote: quoteTaxNote(q, totals),
      lines: lines.map(pricedLineOf),
      totals,
    }
  }
  const priced = await priceLines(tx, input.lines ?? [], basis)
  if (priced.missing.length) {
    const fields = Object.fromEntries(
      (input.lines ?? [])
        .map((l, i) => [l, i] as const)
        .filter(([l]) => priced.missing.includes(l.productId))
        .map(([, i]) => [`lines.${i}.productId`, 'This product is no longer sold.']),
    )
    throw invalid(fields, 'Some items in the cart are no longer sold.')
  }
  const { lines, missing: _m, byId: _b, ...totals } = priced
  const tooBig = orderSizeProblem(totals)
  if (tooBig) throw invalid({ lines: tooBig }, tooBig)
  return { lines, totals, quoteId: null, addresses, taxNote: null }
}

export async function loadOrder(
  db: DbOrTx,
  id: number,
  lock = false,
): Promise<OrderRow | undefined> {
  const q = db.select().from(orders).where(eq(orders.id, id)).limit(1)
  const [row] = lock ? await q.for('update') : await q
  return row
}

/** The order if the caller may see it; 404 otherwise (its existence does not leak). */
export async function requireVisibleOrder(
  event: H3Event,
  user: SessionUser,
  lock?: Tx,
): Promise<OrderRow> {
  const { id } = paramsAs(event, idParams, 'That order')
  const order = await loadOrder(lock ?? useDb(), id, !!lock)
  if (!order || !canSeeOrder(user, order)) throw notFound('That order')
  return order
}

export async function orderPeople(db: DbOrTx, order: OrderRow) {
  const [row] = await db
    .select({ school: schools, buyer: { name: users.name, email: users.email } })
    .from(schools)
    .innerJoin(users, eq(users.id, order.placedById))
    .where(eq(schools.id, order.schoolId))
    .limit(1)
  const [po] = await db
    .select()
    .from(purchaseOrders)
    .where(eq(purchaseOrders.orderId, order.id))
    .limit(1)
  // The buyer is a teacher, who always has an address.
  const buyer = { name: row!.buyer.name, email: mailAddressOf(row!.buyer) }
  return { school: row!.school, buyer, po, lines: await linesOf(db, order.id) }
}

export const linesOf = (db: DbOrTx, orderId: number) =>
  db.select().from(orderLines).where(eq(orderLines.orderId, orderId)).orderBy(asc(orderLines.id))

export async function orderView(
  db: DbOrTx,
  order: OrderRow,
  user: SessionUser,
): Promise<OrderView> {
  const [lines, events, ships, held, files, people] = await Promise.all([
    linesOf(db, order.id),
    db
      .select()
      .from(orderEvents)
      .where(eq(orderEvents.orderId, order.id))
      .orderBy(asc(orderEvents.createdAt), asc(orderEvents.id)),
    shipmentViews(db, eq(shipments.orderId, order.id)),
    db
      .select({ r: stockReservations, code: batches.code })
      .from(stockReservations)
      .innerJoin(batches, eq(batches.id, stockReservations.batchId))
      .where(eq(stockReservations.orderId, order.id))
      .orderBy(asc(stockReservations.id)),
    db
      .select()
      .from(storedFiles)
      .where(eq(storedFiles.orderId, order.id))
      .orderBy(asc(storedFiles.id)),
    orderPeople(db, order),
  ])
  const names = new Map(lines.map(l => [l.productId, l.name]))
  const allocated
    = held.some(h => h.r.status === 'allocated') && !held.some(h => h.r.status === 'reserved')
  const docs: OrderDocument[] = []
  if (canSeeOrderDocuments(user, order)) {
    const base = `/api/orders/${order.id}/documents`
    if (order.quoteId)
      docs.push({ kind: 'quote', label: 'Quote (PDF)', url: `/api/quotes/${order.quoteId}/pdf` })
    for (const f of files)
      docs.push({
        kind: f.kind,
        label:
          f.kind === 'purchase-order'
            ? `Purchase order: ${f.filename}`
            : `Tax-exemption certificate: ${f.filename}`,
        url: `/api/orders/${order.id}/files/${f.id}`,
      })
    if (order.invoiceId)
      docs.push({
        kind: 'invoice',
        label: `Invoice ${order.invoiceNumber ?? ''} (PDF)`.replace('  ', ' '),
        url: `${base}/invoice`,
      })
    if (order.paidAt) docs.push({ kind: 'receipt', label: 'Receipt (PDF)', url: `${base}/receipt` })
    if (allocated)
      docs.push({ kind: 'packing-list', label: 'Packing list (PDF)', url: `${base}/packing-list` })
  }
  const payUrl
    = order.paidAt || CLOSED_STATUSES.includes(order.status) || order.invoiceVoidedAt
      ? null
      : order.paymentMethod === 'card'
        ? order.status === 'awaiting payment'
          ? order.checkoutUrl
          : null
        : order.invoiceUrl
  const facts = {
    status: order.status,
    paymentMethod: order.paymentMethod,
    allocated,
    paid: !!order.paidAt,
  }
  return {
    id: order.id,
    number: order.number!,
    status: order.status,
    paymentMethod: order.paymentMethod,
    subtotalCents: order.subtotalCents,
    shippingCents: order.shippingCents,
    taxCents: order.taxCents,
    totalCents: order.totalCents,
    taxExempt: order.taxExempt,
    taxRateBasisPoints: order.taxRateBasisPoints,
    taxState: order.taxState,
    addresses: addressesOfOrder(order, people.school),
    createdAt: order.createdAt.toISOString(),
    paidAt: order.paidAt?.toISOString() ?? null,
    school: {
      id: people.school.id,
      name: people.school.name,
      district: people.school.district,
      taxExemption: people.school.taxExemption,
    },
    placedBy: people.buyer,
    quoteId: order.quoteId,
    lines: await withTierLabels(db, lines.map(pricedLineOf)),
    events: events.map(e => ({
      id: e.id,
      kind: e.kind,
      message: e.message,
      createdAt: e.createdAt.toISOString(),
    })),
    shipments: ships,
    documents: docs,
    payUrl: canSeeOrderDocuments(user, order) ? payUrl : null,
    invoice: order.invoiceId
      ? { number: order.invoiceNumber, dueAt: order.invoiceDueAt?.toISOString() ?? null }
      : null,
    purchaseOrder: people.po
      ? {
          poNumber: people.po.poNumber,
          apEmail: people.po.apEmail,
          status: people.po.status,
          rejectReason: people.po.rejectReason,
        }
      : null,
    // Units sent as replacement parts show under their shipment, not as the order's own.
    reservations: held.filter(h => h.r.status !== 'sent').map(h => ({
      batchCode: h.code,
      productName: names.get(h.r.productId) ?? '',
      quantity: h.r.quantity,
      status: h.r.status,
    })),
    allocated,
    canCancel: canCancelOrder(user, order),
    actions: user.role === 'admin' ? openActions(facts, 'admin') : [],
    refundedAt: order.refundedAt?.toISOString() ?? null,
    invoiceVoided: !!order.invoiceVoidedAt,
    wayBack: canSeeOrderDocuments(user, order) ? await wayBackForOrder(db, order, people.po) : null,
    buildSpace: await buildSpaceOf(db, order),
  }
}

/** The view for the caller, reloaded after a change. */
export async function replyWithOrder(orderId: number, user: SessionUser): Promise<OrderView> {
  const db = useDb()
  const fresh = await loadOrder(db, orderId)
  return orderView(db, fresh!, user)
}

/** Every admin order step's reply: the refreshed order and the step's notice, if any. */
export async function replyWithAdminOrder(
  orderId: number,
  admin: SessionUser,
  notice: string | null = null,
): Promise<AdminOrderReply> {
  return { ...(await replyWithOrder(orderId, admin)), notice }
}

/** The order's charge as the provider's line items: goods at their tier price (in the shop's
 *  one tier wording), then shipping and tax. */
export function chargeLinesFor(
  lines: Omit<PricedLine, 'productId'>[],
  totals: Pick<
    Totals,
    'shippingCents' | 'taxCents' | 'taxExempt' | 'taxRateBasisPoints' | 'taxState'
  >,
) {
  return [
    ...lines.map(l => ({
      description: `${l.name} (${lineTierWording(l)})`,
      quantity: l.quantity,
      unitAmountCents: l.unitPriceCents,
    })),
    ...(totals.shippingCents
      ? [{ description: 'Shipping', quantity: 1, unitAmountCents: totals.shippingCents }]
      : []),
    ...(totals.taxCents
      ? [
          {
            description: taxLineLabel(totals, { charged: true }),
            quantity: 1,
            unitAmountCents: totals.taxCents,
          },
        ]
      : []),
  ]
}

export function orderRowOf(r: {
  o: OrderRow
  school: string
  poNumber: string | null
}): OrderSummary {
  return {
    id: r.o.id,
    number: r.o.number!,
    status: r.o.status,
    paymentMethod: r.o.paymentMethod,
    totalCents: r.o.totalCents,
    createdAt: r.o.createdAt.toISOString(),
    school: r.school,
    poNumber: r.poNumber,
    paid: !!r.o.paidAt,
  }
}

/** Shipments as the pages show them, oldest first: the order's own and replacement parts sent
 *  from tickets, each replacement with its parts. `where` picks them (an order's, a ticket's). */
export async function shipmentViews(db: DbOrTx, where: SQL): Promise<ShipmentView[]> {
  const ships = await db.select().from(shipments).where(where).orderBy(asc(shipments.shippedAt))
  const ids = ships.filter(s => s.kind === 'replacement').map(s => s.id)
  const items = ids.length
    ? await db
        .select({
          shipmentId: shipmentItems.shipmentId,
          name: products.name,
          quantity: shipmentItems.quantity,
        })
        .from(shipmentItems)
        .innerJoin(products, eq(products.id, shipmentItems.productId))
        .where(inArray(shipmentItems.shipmentId, ids))
        .orderBy(asc(shipmentItems.id))
    : []
  return ships.map(s => ({
    id: s.id,
    ...shipmentCarrier(s.carrier, s.tracking),
    tracking: s.tracking,
    shippedAt: s.shippedAt.toISOString(),
    kind: s.kind,
    items: items
      .filter(i => i.shipmentId === s.id)
      .map(i => ({ name: i.name, quantity: i.quantity })),
    ticketId: s.ticketId,
  }))
}
