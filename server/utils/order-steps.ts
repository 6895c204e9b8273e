// The order engine: one function per step of shared/utils/order-flow.ts. Each step runs in one
// transaction that locks the order, applies its row of the flow (409 when the step is not
// open), records the timeline and queues its side effects as durable jobs (mail, calls to
// the payment provider). Routes authenticate, validate, call a step and reply.
import { and, count, eq, inArray, isNull } from 'drizzle-orm'
import {
  batches,
  jobs,
  orderEvents,
  orderLines,
  orders,
  products,
  purchaseOrders,
  quotes,
  schools,
  shipmentItems,
  shipments,
  stockReservations,
  storedFiles,
  tickets,
  users,
} from '../database/schema'
import {
  ACTION_EVENT,
  ORDER_STATUS_LABELS,
  findTransition,
  flowWording,
  type Actor,
  type OrderAction,
  type PaymentMethod,
} from '../../shared/utils/order-flow'
import { releasedWords } from '../../shared/utils/shop-rules'
import { formatCents, INVOICE_NET_DAYS } from '../../shared/utils/pricing'
import { formatDay } from '../../shared/utils/dates'
import type { SessionUser } from '../../shared/utils/roles'
import type { CarrierId } from '../../shared/utils/carriers'
import { replacementReference, shipmentCarrier } from '../../shared/utils/shipments'
import type { UploadKind } from '../../shared/utils/states'
import type { CartLine } from '../../shared/schemas/shop'
import type { CheckoutAddresses } from '../../shared/schemas/address'
import {
  invoiceIssuedMail,
  invoiceVoidedMail,
  orderCancelledMail,
  orderPlacedMail,
  paymentReceivedMail,
  paymentRefundedMail,
  poApprovedMail,
  poRejectedMail,
  poReviewMail,
  shippedMail,
  ACCOUNTS_PAYABLE,
} from '../emails/shop'
import { replacementShippedMail } from '../emails/tickets'
import { ticketRef } from '../../shared/utils/tickets'
import type { ReplacementInput } from '../../shared/schemas/tickets'

export interface StepActor {
  kind: Actor
  id: number | null
  name: string
}

export const SYSTEM: StepActor = { kind: 'system', id: null, name: 'Tiltwright' }

/** The step's actor for a signed-in user; support staff take only the steps the order flow gives
 *  them (replacement parts). */
export function actorOf(user: SessionUser): StepActor {
  if (user.role === 'admin') return { kind: 'admin', id: user.id, name: user.name }
  if (user.role === 'teacher') return { kind: 'teacher', id: user.id, name: user.name }
  if (user.role === 'support') return { kind: 'support', id: user.id, name: user.name }
  throw forbidden('Your role cannot change orders.')
}

async function isAllocated(tx: DbOrTx, orderId: number) {
  const held = await tx
    .select({ status: stockReservations.status })
    .from(stockReservations)
    .where(eq(stockReservations.orderId, orderId))
  return held.some(h => h.status === 'allocated') && !held.some(h => h.status === 'reserved')
}

/** The facts the flow's rows test, read under the caller's lock. */
export async function orderFacts(tx: DbOrTx, order: OrderRow) {
  return {
    status: order.status,
    paymentMethod: order.paymentMethod,
    allocated: await isAllocated(tx, order.id),
    paid: !!order.paidAt,
  }
}

type Fill = { reason?: string, reference?: string, amount?: string }

/** Applies one row of the flow to the locked order; 409 when it is not open now. `then` runs
 *  after the state changes and may add words to the timeline entry. */
export async function applyStep(
  tx: Tx,
  order: OrderRow,
  action: OrderAction,
  actor: StepActor,
  fill: Fill = {},
  then?: () => Promise<string>,
) {
  const row = findTransition(await orderFacts(tx, order), action, actor.kind)
  if (!row) {
    const state = ORDER_STATUS_LABELS[order.status].toLowerCase()
    throw conflict(`That step is not open for an order that is ${state}.`, 'wrong-status')
  }
  if (row.to !== order.status) {
    await tx
      .update(orders)
      .set({ status: row.to, updatedAt: new Date() })
      .where(eq(orders.id, order.id))
  }
  const more = then ? await then() : ''
  const words = [flowWording(row, { actor: actor.name, ...fill }), more].filter(Boolean).join(' ')
  await addOrderEvent(tx, order.id, ACTION_EVENT[action], words, actor.id)
  return { ...order, status: row.to }
}

/** Locks the order for a step; 404 when it does not exist. */
export async function lockOrder(tx: Tx, orderId: number) {
  const order = await loadOrder(tx, orderId, true)
  if (!order) throw notFound('That order')
  return order
}

const orderUrl = (id: number) => appUrl(`/orders/${id}`)

/** What a checkout names: a quote or the cart's lines, and where to ship and bill. */
export type CheckoutInput = {
  quoteId?: number
  lines?: CartLine[]
  addresses?: CheckoutAddresses | null
}

// ── Placing ────────────────────────────────────────────────────────────────────────────────

/** Ordering needs a confirmed e-mail address (a quote does not). */
export function assertMayOrder(user: SessionUser) {
  if (!user.schoolId) throw forbidden('Your account has no school to order for.')
  if (!user.verified) {
    throw createError({
      statusCode: 403,
      statusMessage: 'Forbidden',
      data: { code: 'unverified' },
      message:
        'Confirm your e-mail address before placing an order: use the link in the mail we sent '
        + 'you, '
        + 'or send it again from your account page. Quotes do not need it.',
    })
  }
}

/** Unpaid card orders hold stock; a school may have only a few at once. Locks the school's
 *  row so two checkouts at the same moment count each other. */
async function assertHoldRoom(tx: Tx, schoolId: number) {
  await tx.select({ id: schools.id }).from(schools).where(eq(schools.id, schoolId)).for('update')
  const cap = Number(useRuntimeConfig().maxUnpaidCardOrders) || 3
  const [row] = await tx
    .select({ n: count() })
    .from(orders)
    .where(
      and(
        eq(orders.schoolId, schoolId),
        eq(orders.paymentMethod, 'card'),
        eq(orders.status, 'awaiting payment'),
        isNull(orders.paidAt),
      ),
    )
  if ((row?.n ?? 0) >= cap) {
    throw conflict(
      `Your school already has ${cap} card orders waiting for payment. Pay or cancel one of `
      + `them before placing another.`,
      'too-many-holds',
    )
  }
}

/** Creates the order with its lines and reserved stock, and starts its timeline. */
async function insertOrder(tx: Tx, user: SessionUser, method: PaymentMethod, src: OrderSource) {
  const action: OrderAction = method === 'card' ? 'placeCard' : 'placePurchaseOrder'
  const row = findTransition(
    { status: null, paymentMethod: method, allocated: false, paid: false },
    action,
    'teacher',
  )!
  const [ins] = await tx
    .insert(orders)
    .values({
      schoolId: user.schoolId!,
      placedById: user.id,
      quoteId: src.quoteId,
      paymentMethod: method,
      status: row.to,
      subtotalCents: src.totals.subtotalCents,
      shippingCents: src.totals.shippingCents,
      taxCents: src.totals.taxCents,
      totalCents: src.totals.totalCents,
      taxExempt: src.totals.taxExempt,
      taxRateBasisPoints: src.totals.taxRateBasisPoints,
      taxState: src.totals.taxState,
      shipTo: src.addresses.shipTo,
      billTo: src.addresses.billTo,
      deliveryNote: src.addresses.deliveryNote,
    })
    .$returningId()
  const id = ins!.id
  const number = orderNumberFor(id)
  await tx.update(orders).set({ number }).where(eq(orders.id, id))
  await tx.insert(orderLines).values(src.lines.map(l => ({ orderId: id, ...l })))
  await reserveStock(tx, id, src.lines)
  if (src.quoteId) {
    const [res] = await tx
      .update(quotes)
      .set({ orderId: id })
      .where(and(eq(quotes.id, src.quoteId), isNull(quotes.orderId)))
    if (res.affectedRows !== 1)
      throw conflict('This quote has already been turned into an order.', 'quote-used')
  }
  const notes = [src.quoteId && 'From a quote, at the quoted prices.', src.taxNote]
    .filter(Boolean)
    .join(' ')
  await addOrderEvent(
    tx,
    id,
    ACTION_EVENT[action],
    [flowWording(row, { actor: user.name }), notes].filter(Boolean).join(' '),
    user.id,
  )
  return { id, number }
}

/** A card order: the order, its reserved stock and the job that opens its payment page, all
 *  in one transaction. The caller runs the job at once; if the provider fails, the job's
 *  give-up removes the order again, so a checkout ends with a payable order or with none. */
export async function placeCardOrder(user: SessionUser, input: CheckoutInput) {
  assertMayOrder(user)
  return transactionWithRetry(async (tx) => {
    await assertHoldRoom(tx, user.schoolId!)
    const src = await resolveCheckout(tx, user, input)
    const order = await insertOrder(tx, user, 'card', src)
    const jobId = await enqueueJob(
      tx,
      'open-checkout',
      { orderId: order.id },
      { uniqueKey: `checkout-${order.id}`, runHere: true },
    )
    return { ...order, jobId: jobId!, totalCents: src.totals.totalCents }
  })
}

/** Stores the provider's checkout session on the order and tells the teacher how to pay. */
export async function recordCheckoutOpened(
  orderId: number,
  checkout: { customerId: string, sessionId: string, url: string },
) {
  await transactionWithRetry(async (tx) => {
    const order = await lockOrder(tx, orderId)
    if (order.checkoutSessionId) return
    await tx
      .update(orders)
      .set({
        providerCustomerId: checkout.customerId,
        checkoutSessionId: checkout.sessionId,
        checkoutUrl: checkout.url,
      })
      .where(eq(orders.id, orderId))
    await addOrderEvent(
      tx,
      orderId,
      'checkout-opened',
      'Card checkout opened on the payment page.',
      order.placedById,
    )
    const { buyer, lines } = await orderPeople(tx, order)
    const mail = orderPlacedMail(
      buyer.name,
      { number: order.number!, totalCents: order.totalCents, method: 'card', lines },
      orderUrl(orderId),
    )
    await enqueueMail(tx, 'order-placed', buyer.email, mail)
  })
}

/** Undoes a card order whose payment page never opened: no order, no held stock. */
export async function discardUnopenedOrder(orderId: number) {
  return transactionWithRetry(async (tx) => {
    const order = await loadOrder(tx, orderId, true)
    if (!order || order.checkoutSessionId || order.paidAt) return false
    await releaseStock(tx, orderId)
    if (order.quoteId) {
      await tx
        .update(quotes)
        .set({ orderId: null })
        .where(and(eq(quotes.id, order.quoteId), eq(quotes.orderId, orderId)))
    }
    await tx.delete(stockReservations).where(eq(stockReservations.orderId, orderId))
    await tx.delete(orderEvents).where(eq(orderEvents.orderId, orderId))
    await tx.delete(orderLines).where(eq(orderLines.orderId, orderId))
    await tx.delete(orders).where(eq(orders.id, orderId))
    return true
  })
}

export interface StoredUpload {
  kind: UploadKind
  key: string
  filename: string
  mime: string
  size: number
}

/** A purchase order: the order, its reserved stock, the PO and its files, and mail to the
 *  teacher and to every admin who reviews it. */
export async function placePurchaseOrder(
  user: SessionUser,
  input: CheckoutInput,
  po: { poNumber: string, apEmail: string },
  files: StoredUpload[],
) {
  assertMayOrder(user)
  return transactionWithRetry(async (tx) => {
    const src = await resolveCheckout(tx, user, input)
    const order = await insertOrder(tx, user, 'purchase-order', src)
    await tx
      .insert(purchaseOrders)
      .values({ orderId: order.id, poNumber: po.poNumber, apEmail: po.apEmail })
    for (const s of files) {
      await tx.insert(storedFiles).values({
        kind: s.kind,
        schoolId: user.schoolId!,
        orderId: order.id,
        storageKey: s.key,
        filename: s.filename,
        contentType: s.mime,
        size: s.size,
        uploadedById: user.id,
      })
    }
    const [school] = await tx
      .select()
      .from(schools)
      .where(eq(schools.id, user.schoolId!))
      .limit(1)
      .for('update')
    const withCert = files.some(s => s.kind === 'tax-certificate')
    if (withCert && school && school.taxExemption !== 'accepted') {
      await tx.update(schools).set({ taxExemption: 'pending' }).where(eq(schools.id, school.id))
    }
    const cert = withCert ? ' with a tax-exemption certificate' : ''
    await addOrderEvent(
      tx,
      order.id,
      'po-received',
      `Purchase order ${po.poNumber} received${cert}; waiting for review.`,
      user.id,
    )
    const placed = {
      number: order.number,
      totalCents: src.totals.totalCents,
      method: 'purchase-order' as const,
      lines: src.lines,
    }
    await enqueueMail(
      tx,
      'order-placed',
      mailAddressOf(user),
      orderPlacedMail(user.name, placed, orderUrl(order.id)),
    )
    const admins = await tx
      .select({ email: users.email, name: users.name })
      .from(users)
      .where(and(eq(users.role, 'admin'), isNull(users.disabledAt)))
    const review = {
      number: order.number,
      poNumber: po.poNumber,
      schoolName: school?.name ?? 'A school',
      totalCents: src.totals.totalCents,
      lines: src.lines,
    }
    for (const a of admins) {
      await enqueueMail(
        tx,
        'po-review',
        mailAddressOf(a),
        poReviewMail(a.name, review, appUrl(`/admin/orders/${order.id}`)),
      )
    }
    await audit(tx, {
      actorId: user.id,
      action: 'order.placed',
      subjectType: 'order',
      subjectId: order.id,
      detail: { method: 'purchase-order' },
    })
    return order
  })
}

// ── Purchase-order review ──────────────────────────────────────────────────────────────────

/** Approves a purchase order (optionally accepting the tax certificate) and queues its
 *  invoice. The invoice job carries a key derived from the order, so however often it is
 *  retried the provider issues one invoice; nothing needs undoing when the provider is down. */
export async function approvePurchaseOrder(
  admin: SessionUser,
  orderId: number,
  acceptTaxCertificate: boolean,
) {
  return transactionWithRetry(async (tx) => {
    const order = await lockOrder(tx, orderId)
    const actor = actorOf(admin)
    if (acceptTaxCertificate) {
      const [cert] = await tx
        .select({ id: storedFiles.id })
        .from(storedFiles)
        .where(and(eq(storedFiles.orderId, orderId), eq(storedFiles.kind, 'tax-certificate')))
        .limit(1)
      if (!cert)
        throw invalid({
          acceptTaxCertificate: 'This order came with no tax-exemption certificate.',
        })
      await tx
        .update(schools)
        .set({ taxExemption: 'accepted' })
        .where(eq(schools.id, order.schoolId))
      if (order.taxCents) {
        await tx
          .update(orders)
          .set({ taxCents: 0, taxExempt: true, totalCents: order.totalCents - order.taxCents })
          .where(eq(orders.id, orderId))
      }
      await addOrderEvent(
        tx,
        orderId,
        'tax-exempt',
        'Tax-exemption certificate accepted; no sales tax is charged.',
        admin.id,
      )
    }
    await applyStep(tx, order, 'approve', actor)
    await tx
      .update(purchaseOrders)
      .set({ status: 'approved', reviewedById: admin.id, reviewedAt: new Date() })
      .where(eq(purchaseOrders.orderId, orderId))
    const { buyer, po, lines } = await orderPeople(tx, order)
    const [now] = await tx
      .select({ totalCents: orders.totalCents })
      .from(orders)
      .where(eq(orders.id, orderId))
    const approval = {
      number: order.number!,
      poNumber: po!.poNumber,
      totalCents: now!.totalCents,
      exemptionAccepted: acceptTaxCertificate,
      lines,
    }
    await enqueueMail(
      tx,
      'po-approved',
      buyer.email,
      poApprovedMail(buyer.name, approval, orderUrl(orderId)),
    )
    await openBuildSpace(tx, orderId)
    await audit(tx, {
      actorId: admin.id,
      action: 'order.po-approved',
      subjectType: 'order',
      subjectId: orderId,
    })
    return {
      jobId: (await enqueueJob(
        tx,
        'issue-invoice',
        { orderId },
        { uniqueKey: `invoice-${orderId}`, runHere: true },
      ))!,
    }
  })
}

/** Tries the invoice of an approved purchase order again now (its job is reset if it had
 *  been given up); 409 when the order is not waiting for one. */
export async function retryInvoice(admin: SessionUser, orderId: number) {
  actorOf(admin)
  return transactionWithRetry(async (tx) => {
    const order = await lockOrder(tx, orderId)
    if (
      order.paymentMethod !== 'purchase-order'
      || order.status !== 'awaiting payment'
      || order.invoiceId
    ) {
      throw conflict('This order is not waiting for an invoice.', 'wrong-status')
    }
    const key = `invoice-${orderId}`
    await tx
      .update(jobs)
      .set({ state: 'pending', attempts: 0, nextAttemptAt: new Date() })
      .where(eq(jobs.uniqueKey, key))
    return {
      jobId: (await enqueueJob(
        tx,
        'issue-invoice',
        { orderId },
        { uniqueKey: key, runHere: true },
      ))!,
    }
  })
}

/** Stores the provider's invoice on the order and sends it to accounts payable and the teacher. */
export async function recordInvoiceIssued(
  orderId: number,
  invoice: {
    customerId: string
    invoiceId: string
    number: string
    url: string | null
    dueAt: Date | null
  },
) {
  await transactionWithRetry(async (tx) => {
    const order = await lockOrder(tx, orderId)
    if (order.invoiceId) return
    await tx
      .update(orders)
      .set({
        providerCustomerId: invoice.customerId,
        invoiceId: invoice.invoiceId,
        invoiceNumber: invoice.number,
        invoiceUrl: invoice.url,
        invoiceDueAt: invoice.dueAt,
      })
      .where(eq(orders.id, orderId))
    const due = invoice.dueAt
      ? formatDay(invoice.dueAt)
      : `${INVOICE_NET_DAYS} days from today`
    await addOrderEvent(
      tx,
      orderId,
      'invoice-issued',
      `Invoice ${invoice.number} issued: net ${INVOICE_NET_DAYS}, due ${due}.`,
    )
    const { buyer, po, lines } = await orderPeople(tx, order)
    const what = {
      number: order.number!,
      invoiceNumber: invoice.number,
      totalCents: order.totalCents,
      dueAt: due,
      poNumber: po!.poNumber,
      lines,
    }
    await enqueueMail(tx, 'invoice-issued', po!.apEmail, invoiceIssuedMail(what, invoice.url), [
      { document: 'invoice', orderId },
    ])
    if (buyer.email !== po!.apEmail) {
      await enqueueMail(
        tx,
        'invoice-issued',
        buyer.email,
        invoiceIssuedMail(what, invoice.url, buyer.name),
        [{ document: 'invoice', orderId }],
      )
    }
  })
}

export async function rejectPurchaseOrder(admin: SessionUser, orderId: number, reason: string) {
  return transactionWithRetry(async (tx) => {
    const order = await lockOrder(tx, orderId)
    await applyStep(tx, order, 'reject', actorOf(admin), { reason }, () => endOrder(tx, order))
    await tx
      .update(purchaseOrders)
      .set({
        status: 'rejected',
        rejectReason: reason,
        reviewedById: admin.id,
        reviewedAt: new Date(),
      })
      .where(eq(purchaseOrders.orderId, orderId))
    const { buyer, po, lines } = await orderPeople(tx, order)
    const back = (await wayBackForOrder(tx, order, { status: 'rejected' }))!
    const what = { number: order.number!, poNumber: po!.poNumber, reason, lines }
    const mail = poRejectedMail(buyer.name, what, orderUrl(orderId), {
      label: back.label,
      url: appUrl(back.url),
    })
    await enqueueMail(tx, 'po-rejected', buyer.email, mail)
    await audit(tx, {
      actorId: admin.id,
      action: 'order.po-rejected',
      subjectType: 'order',
      subjectId: orderId,
    })
  })
}

/** An order that has ended gives back its stock and frees its quote; the words say so. */
async function endOrder(tx: Tx, order: OrderRow) {
  const released = await releaseStock(tx, order.id)
  if (order.quoteId) {
    await tx
      .update(quotes)
      .set({ orderId: null })
      .where(and(eq(quotes.id, order.quoteId), eq(quotes.orderId, order.id)))
  }
  return releasedWords(released)
}

// ── Fulfilment ─────────────────────────────────────────────────────────────────────────────

export async function allocateOrder(admin: SessionUser, orderId: number) {
  await transactionWithRetry(async (tx) => {
    const order = await lockOrder(tx, orderId)
    const held = await tx
      .select({ quantity: stockReservations.quantity, batchId: stockReservations.batchId })
      .from(stockReservations)
      .where(and(eq(stockReservations.orderId, orderId), eq(stockReservations.status, 'reserved')))
    const codes = await batchCodes(
      tx,
      held.map(h => h.batchId),
    )
    const perBatch = new Map<string, number>()
    for (const h of held)
      perBatch.set(codes.get(h.batchId)!, (perBatch.get(codes.get(h.batchId)!) ?? 0) + h.quantity)
    const reference = [...perBatch].map(([c, n]) => `batch ${c} × ${n}`).join(', ')
    await applyStep(tx, order, 'allocate', actorOf(admin), { reference })
    await tx
      .update(stockReservations)
      .set({ status: 'allocated' })
      .where(and(eq(stockReservations.orderId, orderId), eq(stockReservations.status, 'reserved')))
  })
}

export async function shipOrder(
  admin: SessionUser,
  orderId: number,
  input: { carrier: CarrierId, tracking: string },
) {
  return transactionWithRetry(async (tx) => {
    const order = await lockOrder(tx, orderId)
    const carrierName = shipmentCarrier(input.carrier, input.tracking).carrierName
    await applyStep(tx, order, 'ship', actorOf(admin), {
      reference: `${carrierName}, tracking ${input.tracking}`,
    })
    const [row] = await tx
      .insert(shipments)
      .values({ orderId, carrier: input.carrier, tracking: input.tracking, createdById: admin.id })
      .$returningId()
    const { buyer, lines } = await orderPeople(tx, order)
    await enqueueMail(
      tx,
      'shipped',
      buyer.email,
      shippedMail(
        buyer.name,
        { number: order.number!, carrier: carrierName, tracking: input.tracking, lines },
        orderUrl(orderId),
      ),
      [{ document: 'packing-list', orderId }],
    )
    return row!.id
  })
}

export async function markDelivered(admin: SessionUser, orderId: number) {
  await transactionWithRetry(async tx =>
    applyStep(tx, await lockOrder(tx, orderId), 'markDelivered', actorOf(admin)),
  )
}

// ── Money ──────────────────────────────────────────────────────────────────────────────────

/** Records a payment once, with its receipt mailed: a replay, a late admin entry or a second
 *  event finds it paid and changes nothing (false). */
async function settle(
  tx: Tx,
  order: OrderRow,
  action: 'markPaid' | 'recordPayment',
  actor: StepActor,
  how: { reference: string | null, paymentIntentId?: string | null },
) {
  // The provider repeating itself is no error; an admin recording twice is (409 below).
  if (action === 'markPaid' && order.paidAt) return false
  await applyStep(tx, order, action, actor, {
    amount: formatCents(order.totalCents),
    reference: how.reference ?? 'no reference',
  })
  const paidAt = new Date()
  await tx
    .update(orders)
    .set({
      paidAt,
      paymentReference: how.reference,
      paymentIntentId: how.paymentIntentId ?? null,
      updatedAt: paidAt,
    })
    .where(eq(orders.id, order.id))
  const { buyer, lines } = await orderPeople(tx, order)
  const mail = paymentReceivedMail(
    buyer.name,
    { number: order.number!, totalCents: order.totalCents, lines },
    orderUrl(order.id),
  )
  await enqueueMail(tx, 'payment-received', buyer.email, mail, [
    { document: 'receipt', orderId: order.id },
  ])
  // Its kits become rigs for the class (nothing new when a purchase order opened them).
  await openBuildSpace(tx, order.id)
  return true
}

/** An admin records a cheque or transfer; the provider's invoice is then closed out of band. */
export async function recordPayment(admin: SessionUser, orderId: number, reference: string) {
  await transactionWithRetry(async (tx) => {
    const order = await lockOrder(tx, orderId)
    await settle(tx, order, 'recordPayment', actorOf(admin), { reference })
    if (order.invoiceId)
      await enqueueJob(tx, 'settle-invoice', { orderId }, { uniqueKey: `settle-${orderId}` })
  })
}

export interface ProviderPayment {
  /** The provider object that carries the money: a checkout session or an invoice. */
  objectId: string
  via: 'checkout' | 'invoice'
  amountCents: number
  currency: string
  paymentIntent: string | null
  reference: string
}

/** Money the provider reports for an order, checked against what the order recorded (its own
 *  session or invoice, its total, its currency). A mismatch changes nothing and is written
 *  on the timeline; money for an order that has ended is refunded. */
export async function receivePayment(
  tx: Tx,
  orderId: number,
  pay: ProviderPayment,
): Promise<'paid' | 'duplicate' | 'mismatch' | 'refunding'> {
  const order = await lockOrder(tx, orderId)
  const expected = pay.via === 'checkout' ? order.checkoutSessionId : order.invoiceId
  const problems = [
    expected !== pay.objectId
    && `it came from ${pay.via === 'checkout' ? 'checkout session' : 'invoice'} `
    + `${pay.objectId}, not the one this order opened`,
    pay.amountCents !== order.totalCents
    && `its amount ${formatCents(pay.amountCents)} is not the order's total `
    + `${formatCents(order.totalCents)}`,
    pay.currency.toLowerCase() !== 'usd'
    && `its currency ${pay.currency.toUpperCase() || 'unknown'} is not US dollars`,
  ].filter((x): x is string => !!x)
  if (problems.length) {
    await addOrderEvent(
      tx,
      orderId,
      'payment-mismatch',
      `A payment event was ignored because ${problems.join('; ')}. Nothing changed; an admin `
      + `should check the payment service.`,
    )
    return 'mismatch'
  }
  if (order.status === 'cancelled' || order.status === 'rejected') {
    if (!pay.paymentIntent) {
      await addOrderEvent(
        tx,
        orderId,
        'payment-after-end',
        `A payment of ${formatCents(pay.amountCents)} arrived after `
        + 'the order ended and could not be refunded automatically; refund it by hand.',
      )
      return 'mismatch'
    }
    await enqueueJob(
      tx,
      'refund-payment',
      { orderId, paymentIntent: pay.paymentIntent, amountCents: pay.amountCents },
      { uniqueKey: `refund-${pay.paymentIntent}` },
    )
    return 'refunding'
  }
  if (order.paidAt && pay.paymentIntent && pay.paymentIntent !== order.paymentIntentId) {
    // Money a second time (accounts payable paid the invoice online after a cheque was
    // recorded): the order stays paid once, and the timeline says what to give back.
    await addOrderEvent(
      tx,
      orderId,
      'payment-twice',
      `A second payment of ${formatCents(pay.amountCents)} (${pay.reference}) arrived after `
      + `the order was paid (${order.paymentReference ?? 'no reference'}); it was not recorded `
      + 'again. Refund it by hand at the payment service.',
    )
    // Not a repeated event: a payment that changes nothing, as a mismatched one.
    return 'mismatch'
  }
  const done = await settle(tx, order, 'markPaid', SYSTEM, {
    reference: pay.reference,
    paymentIntentId: pay.paymentIntent,
  })
  return done ? 'paid' : 'duplicate'
}

/** The refund went through: on the timeline, and the payer is told. */
export async function recordRefund(
  orderId: number,
  refund: { refundId: string, amountCents: number },
) {
  await transactionWithRetry(async (tx) => {
    const order = await lockOrder(tx, orderId)
    if (order.refundedAt) return
    await applyStep(tx, order, 'refund', SYSTEM, {
      amount: formatCents(refund.amountCents),
      reference: refund.refundId,
    })
    await tx
      .update(orders)
      .set({ refundedAt: new Date(), refundReference: refund.refundId })
      .where(eq(orders.id, orderId))
    const { buyer, po, lines } = await orderPeople(tx, order)
    const status = ORDER_STATUS_LABELS[order.status].toLowerCase()
    const what = { number: order.number!, amountCents: refund.amountCents, status, lines }
    for (const to of new Set([buyer.email, ...(po && order.invoiceId ? [po.apEmail] : [])])) {
      const name = to === buyer.email ? buyer.name : ACCOUNTS_PAYABLE
      const mail = paymentRefundedMail(name, what, orderUrl(orderId))
      await enqueueMail(tx, 'payment-refunded', to, mail)
    }
  })
}

// ── Ending an order ────────────────────────────────────────────────────────────────────────

/** Cancels an unpaid order: stock released, quote freed, its invoice voided at the provider
 *  (a job), and the teacher and accounts payable told. */
export async function cancelOrder(user: SessionUser, orderId: number, reason: string) {
  await transactionWithRetry(async (tx) => {
    const order = await lockOrder(tx, orderId)
    await applyStep(tx, order, 'cancel', actorOf(user), { reason }, () => endOrder(tx, order))
    await afterCancel(tx, order, reason)
    await audit(tx, {
      actorId: user.id,
      action: 'order.cancelled',
      subjectType: 'order',
      subjectId: orderId,
      detail: { reason },
    })
  })
}

async function afterCancel(tx: Tx, order: OrderRow, reason: string) {
  const { buyer, po, lines } = await orderPeople(tx, order)
  if (order.invoiceId && po) {
    // One mail each: the void notice says the order is cancelled, and why.
    await enqueueJob(tx, 'void-invoice', { orderId: order.id }, { uniqueKey: `void-${order.id}` })
    const what = {
      number: order.number!,
      invoiceNumber: order.invoiceNumber ?? order.invoiceId,
      poNumber: po.poNumber,
      reason,
      lines,
    }
    await enqueueMail(tx, 'invoice-voided', po.apEmail, invoiceVoidedMail(what))
    if (buyer.email !== po.apEmail)
      await enqueueMail(tx, 'invoice-voided', buyer.email, invoiceVoidedMail(what, buyer.name))
  } else {
    await enqueueMail(
      tx,
      'order-cancelled',
      buyer.email,
      orderCancelledMail(buyer.name, { number: order.number!, reason, lines }, orderUrl(order.id)),
    )
  }
  if (order.checkoutSessionId)
    await enqueueJob(
      tx,
      'expire-checkout',
      { orderId: order.id },
      { uniqueKey: `expire-${order.id}` },
    )
}

/** The provider voided the invoice: on the timeline, and its pay link is withdrawn. */
export async function recordInvoiceVoided(orderId: number) {
  await transactionWithRetry(async (tx) => {
    const order = await lockOrder(tx, orderId)
    if (order.invoiceVoidedAt) return
    await tx.update(orders).set({ invoiceVoidedAt: new Date() }).where(eq(orders.id, orderId))
    const invoice = order.invoiceNumber ? `Invoice ${order.invoiceNumber}` : 'The invoice'
    await addOrderEvent(
      tx,
      orderId,
      'invoice-voided',
      `${invoice} voided at the payment service; it can no longer be paid.`,
    )
  })
}

/** The sweep: a card order unpaid after the hold is cancelled, but only once the provider
 *  confirms its session was not paid (a payment whose webhook was lost is recorded instead). */
export async function expireCardOrder(
  orderId: number,
  hours: number,
  lookup: (sessionId: string) => Promise<ProviderPayment & { paid: boolean }>,
) {
  const order = await loadOrder(useDb(), orderId)
  if (!order || order.status !== 'awaiting payment' || order.paidAt) return 'skipped' as const
  const at = order.checkoutSessionId ? await lookup(order.checkoutSessionId) : null
  return transactionWithRetry(async (tx) => {
    const locked = await lockOrder(tx, orderId)
    if (locked.status !== 'awaiting payment' || locked.paidAt) return 'skipped' as const
    if (at?.paid) {
      await addOrderEvent(
        tx,
        orderId,
        'payment-found',
        'The payment service shows this order paid although its notice never arrived; '
        + 'recorded now.',
      )
      await receivePayment(tx, orderId, at)
      return 'paid' as const
    }
    await applyStep(tx, locked, 'expire', SYSTEM, { reference: String(hours) }, () =>
      endOrder(tx, locked),
    )
    await afterCancel(tx, locked, `the card payment was not completed within ${hours} hours`)
    return 'cancelled' as const
  })
}

async function batchCodes(tx: DbOrTx, ids: number[]) {
  if (!ids.length) return new Map<number, string>()
  const rows = await tx
    .select({ id: batches.id, code: batches.code })
    .from(batches)
    .where(inArray(batches.id, [...new Set(ids)]))
  return new Map(rows.map(r => [r.id, r.code]))
}

// ── Replacement parts ─────────────────────────────────────────────────────────────────────

/**
 * Free parts sent from a ticket on the ticket's order (support or admin): the order flow's
 * `sendReplacement` row (409 unless paid or its purchase order approved), the units reserved
 * and marked `sent` with the shipment (never released, never the order's own to pack), a
 * `replacement` shipment with its parts and the ticket, the timeline entry naming the ticket,
 * parts and tracking, an audit row and the teacher's mail. Answers the shipment's id.
 */
export async function sendReplacement(
  staff: SessionUser,
  ticketId: number,
  input: ReplacementInput,
): Promise<number> {
  return transactionWithRetry(async (tx) => {
    const [ticket] = await tx.select().from(tickets).where(eq(tickets.id, ticketId)).limit(1)
    if (!ticket) throw notFound('That ticket')
    const order = await lockOrder(tx, ticket.orderId)
    const wanted = input.items.map(i => i.productId)
    const fields: Record<string, string> = {}
    input.items.forEach((item, i) => {
      if (wanted.indexOf(item.productId) !== i)
        fields[`items.${i}.productId`] = 'This part is already in the list.'
    })
    const found = await tx
      .select({ id: products.id, name: products.name })
      .from(products)
      .where(and(inArray(products.id, wanted), eq(products.active, true)))
    const names = new Map(found.map(p => [p.id, p.name]))
    input.items.forEach((item, i) => {
      if (!names.has(item.productId))
        fields[`items.${i}.productId`] = 'Choose a part from the list.'
    })
    if (Object.keys(fields).length) throw invalid(fields)
    const parts = input.items.map(i => ({ ...i, name: names.get(i.productId)! }))
    const carrier = shipmentCarrier(input.carrier, input.tracking)
    const ref = ticketRef(ticketId)
    let shipmentId = 0
    await applyStep(
      tx,
      order,
      'sendReplacement',
      actorOf(staff),
      {
        reference: replacementReference(parts, ref, input.carrier, input.tracking),
      },
      async () => {
        const reserved = await reserveStock(tx, order.id, parts, 'items')
        const [ship] = await tx
          .insert(shipments)
          .values({
            orderId: order.id,
            carrier: input.carrier,
            tracking: input.tracking,
            kind: 'replacement',
            ticketId,
            createdById: staff.id,
          })
          .$returningId()
        shipmentId = ship!.id
        await tx.insert(shipmentItems).values(
          parts.map(p => ({ shipmentId, productId: p.productId, quantity: p.quantity })),
        )
        await tx
          .update(stockReservations)
          .set({ status: 'sent', shipmentId })
          .where(inArray(stockReservations.id, reserved))
        return ''
      },
    )
    await audit(tx, {
      actorId: staff.id,
      action: 'ticket.replacement',
      subjectType: 'ticket',
      subjectId: ticketId,
      detail: { shipmentId, orderId: order.id, items: input.items },
    })
    const facts = await ticketMailFacts(tx, ticket)
    await enqueueMail(
      tx,
      'replacement-shipped',
      facts.teacher.email,
      replacementShippedMail(
        facts.teacher.name,
        { ...facts.ref, orderNumber: facts.orderNumber },
        parts,
        { name: carrier.carrierName, tracking: input.tracking, url: carrier.trackingUrl },
        ticketUrl(ticketId),
      ),
    )
    return shipmentId
  })
}
