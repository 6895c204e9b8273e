// Tickets (docs/api.md "Tickets and the help queue"): who may see a ticket, the one shape of a
// ticket in every list (the customer's, a rig's, the help queue) and in its thread, posting
// messages and notes with their attachments and sheet, and the ticket's mail. The customer side
// never reads a row of ticket_messages with `internal` set: every query here that a customer's
// reply comes from says so in its WHERE.
import { and, asc, count, desc, eq, inArray, isNull, lt, ne, or, sql, type SQL } from 'drizzle-orm'
import { alias } from 'drizzle-orm/mysql-core'
import {
  orders,
  rigs,
  schools,
  shipments,
  stockReplies,
  ticketAttachments,
  ticketMessages,
  tickets,
  tuningSheets,
  users,
} from '../database/schema'
import {
  customerMessageMail,
  staffReplyMail,
  ticketOpenedMail,
} from '../emails/tickets'
import { isStaff, ROLE_LABELS, type SessionUser } from '../../shared/utils/roles'
import {
  PENDING_UPLOAD_HOURS,
  statusAfterMessage,
  ticketRef,
} from '../../shared/utils/tickets'
import { removeStoredFile } from '../services/files'
import type { TicketStatus } from '../../shared/utils/states'
import type { TicketMessageInput } from '../../shared/schemas/tickets'
import type {
  AttachmentView,
  QueueRow,
  StockReplyView,
  TicketMessageView,
  TicketSheet,
  TicketSummary,
  TicketThread,
} from '../../shared/types/tickets'

export type TicketRow = typeof tickets.$inferSelect
type AttachmentRow = typeof ticketAttachments.$inferSelect

/** Who the caller is to a ticket: the staff (everything, notes included), the customer side
 *  (the school's teacher; a builder of the rig, or who opened it), or nobody (404). */
export type TicketAccess = 'staff' | 'customer' | null

// ── Who may see it ───────────────────────────────────────────────────────────────────────────

/** A builder sees the tickets of the rigs they are assigned to in a build space they belong to
 *  now, and the tickets they opened while they still belong to it. */
function builderSees(userId: number): SQL {
  return sql`exists (select 1 from build_members bm
    where bm.user_id = ${userId} and bm.order_id = ${tickets.orderId}
      and (bm.rig_id = ${tickets.rigId} or ${tickets.openedById} = ${userId}))`
}

/** The tickets the customer side may see, as a WHERE; staff see every ticket. */
export function visibleTickets(user: SessionUser): SQL | undefined {
  if (isStaff(user)) return undefined
  if (user.role === 'teacher' && user.schoolId) return eq(tickets.schoolId, user.schoolId)
  if (user.role === 'builder') return builderSees(user.id)
  return sql`false`
}

export async function ticketAccessFor(
  db: DbOrTx,
  user: SessionUser,
  ticket: TicketRow,
): Promise<TicketAccess> {
  if (isStaff(user)) return 'staff'
  if (user.role === 'teacher')
    return user.schoolId !== null && user.schoolId === ticket.schoolId ? 'customer' : null
  if (user.role !== 'builder') return null
  const [hit] = await db
    .select({ id: tickets.id })
    .from(tickets)
    .where(and(eq(tickets.id, ticket.id), builderSees(user.id)))
    .limit(1)
  return hit ? 'customer' : null
}

/** The ticket if the caller may see it (404 otherwise, for staff-only needs too: a customer is
 *  not told a staff route exists); locked in `tx` when given. */
export async function loadTicketFor(
  user: SessionUser,
  id: number,
  need: 'see' | 'staff' = 'see',
  tx?: Tx,
) {
  const db = tx ?? useDb()
  const q = db.select().from(tickets).where(eq(tickets.id, id)).limit(1)
  const [ticket] = tx ? await q.for('update') : await q
  const access = ticket ? await ticketAccessFor(db, user, ticket) : null
  if (!ticket || !access || (need === 'staff' && access !== 'staff')) throw notFound('That ticket')
  return { ticket, access }
}

// ── The one shape of a ticket in lists ───────────────────────────────────────────────────────

const assignees = alias(users, 'assignee')
const openers = alias(users, 'opener')

const lastVisible = (column: SQL) => sql`(select ${column} from ticket_messages lm
  join users lu on lu.id = lm.author_id
  where lm.ticket_id = ${tickets.id} and lm.internal = false
  order by lm.created_at desc, lm.id desc limit 1)`

/** The columns every ticket list reads (joined by `summaryFrom`). */
const summaryColumns = {
  t: tickets,
  schoolName: schools.name,
  orderNumber: orders.number,
  rigSerial: rigs.serial,
  rigName: rigs.name,
  openedByName: openers.name,
  assigneeName: assignees.name,
  messageCount: sql<number>`(select count(*) from ticket_messages mc
    where mc.ticket_id = ${tickets.id} and mc.internal = false)`.mapWith(Number),
  lastRole: lastVisible(sql`lu.role`).mapWith(String),
  preview: lastVisible(sql`left(lm.body, 160)`).mapWith(String),
}
type SummaryRecord = {
  t: TicketRow
  schoolName: string
  orderNumber: string | null
  rigSerial: string | null
  rigName: string | null
  openedByName: string
  assigneeName: string | null
  messageCount: number
  lastRole: string | null
  preview: string | null
}

/** A select of ticket summaries; the caller adds where, order and paging. */
export function summaryQuery(db: DbOrTx) {
  return db
    .select(summaryColumns)
    .from(tickets)
    .innerJoin(schools, eq(schools.id, tickets.schoolId))
    .innerJoin(orders, eq(orders.id, tickets.orderId))
    .innerJoin(openers, eq(openers.id, tickets.openedById))
    .leftJoin(rigs, eq(rigs.id, tickets.rigId))
    .leftJoin(assignees, eq(assignees.id, tickets.assigneeId))
}

/** How many tickets `where` picks. Filters and searches read the tickets table (and messages
 *  through a subquery) only, so the count needs no join: it is counted from an index. */
export function summaryCount(db: DbOrTx, where: SQL | undefined) {
  return db
    .select({ n: count() })
    .from(tickets)
    .where(where)
}

export function summaryOf(r: SummaryRecord): TicketSummary {
  const t = r.t
  return {
    id: t.id,
    ref: ticketRef(t.id),
    subject: t.subject,
    status: t.status,
    priority: t.priority,
    createdAt: t.createdAt.toISOString(),
    lastMessageAt: t.lastMessageAt.toISOString(),
    statusChangedAt: t.statusChangedAt.toISOString(),
    rig: t.rigId ? { id: t.rigId, serial: r.rigSerial!, name: r.rigName ?? r.rigSerial! } : null,
    order: { id: t.orderId, number: r.orderNumber ?? '' },
    schoolName: r.schoolName,
    openedByName: r.openedByName,
    assignee: t.assigneeId ? { id: t.assigneeId, name: r.assigneeName ?? '' } : null,
    messageCount: r.messageCount,
    lastFrom: r.lastRole === 'support' || r.lastRole === 'admin' ? 'staff' : 'customer',
  }
}

export function queueRowOf(r: SummaryRecord): QueueRow {
  return { ...summaryOf(r), schoolId: r.t.schoolId, preview: r.preview ?? '' }
}

export async function ticketSummary(db: DbOrTx, id: number): Promise<TicketSummary> {
  const [row] = await summaryQuery(db).where(eq(tickets.id, id)).limit(1)
  if (!row) throw notFound('That ticket')
  return summaryOf(row)
}

/** The list's status filter: one status, `open` (not resolved), or any. */
export function statusWhere(
  status: TicketStatus | 'open' | 'any' | undefined,
): SQL | undefined {
  if (status === 'open') return ne(tickets.status, 'resolved')
  return status && status !== 'any' ? eq(tickets.status, status) : undefined
}

/** A page of ticket summaries (the customer's list, the queue): counted and read alike. */
export function pagedTickets<T>(
  q: { page: number, pageSize: number },
  where: SQL | undefined,
  order: SQL[],
  shape: (r: SummaryRecord) => T,
) {
  const db = useDb()
  return pagedList(
    q,
    summaryCount(db, where),
    summaryQuery(db)
      .where(where)
      .orderBy(...order),
    shape,
  )
}

/** A search in the subject and the message bodies (notes too when `notes`). */
export function ticketSearch(pattern: string, notes: boolean): SQL {
  return or(
    sql`${tickets.subject} like ${pattern}`,
    sql`exists (select 1 from ticket_messages sm where sm.ticket_id = ${tickets.id}
      and sm.body like ${pattern} ${notes ? sql`` : sql`and sm.internal = false`})`,
  )!
}

// ── The thread ──────────────────────────────────────────────────────────────────────────────

export function attachmentView(a: AttachmentRow): AttachmentView {
  return {
    id: a.id,
    kind: a.kind,
    filename: a.filename,
    contentType: a.contentType,
    size: a.size,
    width: a.width,
    height: a.height,
    url: `/api/ticket-attachments/${a.id}`,
  }
}

async function sheetsByid(db: DbOrTx, ids: number[]): Promise<Map<number, TicketSheet>> {
  if (!ids.length) return new Map()
  const rows = await db
    .select({ s: tuningSheets, authorName: users.name })
    .from(tuningSheets)
    .innerJoin(users, eq(users.id, tuningSheets.authorId))
    .where(inArray(tuningSheets.id, ids))
  return new Map(
    rows.map(r => [r.s.id, { ...rigSheetOf(r), results: r.s.results, rigId: r.s.rigId }]),
  )
}

export async function ticketThread(
  db: DbOrTx,
  ticket: TicketRow,
  access: Exclude<TicketAccess, null>,
): Promise<TicketThread> {
  const staff = access === 'staff'
  const rows = await db
    .select({
      m: ticketMessages,
      authorName: users.name,
      authorRole: users.role,
      stockTitle: stockReplies.title,
    })
    .from(ticketMessages)
    .innerJoin(users, eq(users.id, ticketMessages.authorId))
    .leftJoin(stockReplies, eq(stockReplies.id, ticketMessages.stockReplyId))
    .where(
      and(
        eq(ticketMessages.ticketId, ticket.id),
        staff ? undefined : eq(ticketMessages.internal, false),
      ),
    )
    .orderBy(asc(ticketMessages.createdAt), asc(ticketMessages.id))
  const ids = rows.map(r => r.m.id)
  const [files, sheets, replacements, summary] = await Promise.all([
    ids.length
      ? db
          .select()
          .from(ticketAttachments)
          .where(inArray(ticketAttachments.messageId, ids))
          .orderBy(asc(ticketAttachments.id))
      : Promise.resolve([] as AttachmentRow[]),
    sheetsByid(
      db,
      rows.map(r => r.m.sheetId).filter((x): x is number => x !== null),
    ),
    shipmentViews(db, eq(shipments.ticketId, ticket.id)),
    ticketSummary(db, ticket.id),
  ])
  const messages = rows.map(
    (r): TicketMessageView => ({
      id: r.m.id,
      author: {
        name: r.authorName,
        side: r.authorRole === 'support' || r.authorRole === 'admin' ? 'staff' : 'customer',
      },
      internal: staff && r.m.internal,
      body: r.m.body,
      createdAt: r.m.createdAt.toISOString(),
      attachments: files.filter(f => f.messageId === r.m.id).map(attachmentView),
      sheet: r.m.sheetId ? (sheets.get(r.m.sheetId) ?? null) : null,
      stockReplyTitle: staff ? (r.stockTitle ?? null) : null,
    }),
  )
  return {
    ticket: summary,
    messages,
    replacements,
    may: { reply: true, staff, resolve: ticket.status !== 'resolved' },
  }
}

// ── Writing ─────────────────────────────────────────────────────────────────────────────────

/** A sheet sent with a message: one of the ticket's rig, or one the caller wrote; 422 on
 *  `sheetId` otherwise. */
export async function checkSheet(
  db: DbOrTx,
  user: SessionUser,
  rigId: number | null,
  sheetId: number | null | undefined,
): Promise<number | null> {
  if (!sheetId) return null
  const [s] = await db
    .select({ authorId: tuningSheets.authorId, rigId: tuningSheets.rigId })
    .from(tuningSheets)
    .where(and(eq(tuningSheets.id, sheetId), eq(tuningSheets.archived, false)))
    .limit(1)
  const fits = s && ((rigId !== null && s.rigId === rigId) || s.authorId === user.id)
  if (!fits)
    throw invalid({ sheetId: 'Choose one of your tuning sheets or one saved on this rig.' })
  return sheetId
}

/** Gives the caller's own pending uploads to the message (locked first); 422 on
 *  `attachmentIds` when one is not theirs, already sent, or gone. */
export async function claimAttachments(
  tx: Tx,
  user: SessionUser,
  ticketId: number,
  messageId: number,
  ids: number[],
) {
  if (!ids.length) return
  const rows = await tx
    .select()
    .from(ticketAttachments)
    .where(inArray(ticketAttachments.id, ids))
    .for('update')
  const mine = rows.filter(a => a.uploadedById === user.id && a.messageId === null)
  if (mine.length !== ids.length)
    throw invalid({
      attachmentIds:
        'One of the files is no longer waiting to be sent. Remove it and attach it again.',
    })
  await tx
    .update(ticketAttachments)
    .set({ messageId, ticketId })
    .where(inArray(ticketAttachments.id, ids))
}

/** The columns a status change sets: when it changed, and when it was resolved (cleared when a
 *  ticket opens again). Nothing when the status stays. */
export function statusChange(from: TicketStatus, to: TicketStatus, at: Date) {
  if (from === to) return {}
  return { status: to, statusChangedAt: at, resolvedAt: to === 'resolved' ? at : null }
}

/** The stock reply a staff message started from; 422 on `stockReplyId` when it does not exist. */
async function checkStockReply(db: DbOrTx, id: number | null | undefined) {
  if (!id) return null
  const [row] = await db
    .select({ id: stockReplies.id })
    .from(stockReplies)
    .where(eq(stockReplies.id, id))
    .limit(1)
  if (!row) throw invalid({ stockReplyId: 'That stock reply no longer exists.' })
  return id
}

// ── Mail ────────────────────────────────────────────────────────────────────────────────────

export const supportAddress = () =>
  String(useRuntimeConfig().supportEmail || 'support@tiltwright.test')

/** What the ticket's mail says about it, and the order's teacher (its buyer). */
export async function ticketMailFacts(db: DbOrTx, ticket: TicketRow) {
  const [row] = await db
    .select({
      schoolName: schools.name,
      orderNumber: orders.number,
      teacherName: users.name,
      teacherEmail: users.email,
      rigSerial: rigs.serial,
      rigName: rigs.name,
    })
    .from(orders)
    .innerJoin(schools, eq(schools.id, orders.schoolId))
    .innerJoin(users, eq(users.id, orders.placedById))
    .leftJoin(rigs, eq(rigs.id, ticket.rigId ?? 0))
    .where(eq(orders.id, ticket.orderId))
    .limit(1)
  const r = row!
  const rig = ticket.rigId && r.rigSerial
    ? `rig ${r.rigSerial}${r.rigName && r.rigName !== r.rigSerial ? ` (${r.rigName})` : ''}`
    : null
  return {
    ref: {
      ref: ticketRef(ticket.id),
      subject: ticket.subject,
      schoolName: r.schoolName,
      about: rig ? `${rig} of order ${r.orderNumber}` : `order ${r.orderNumber}`,
    },
    orderNumber: r.orderNumber ?? '',
    teacher: { name: r.teacherName, email: mailAddressOf({ email: r.teacherEmail }) },
  }
}

export const ticketUrl = (id: number) => appUrl(`/tickets/${id}`)

const fromOf = (user: SessionUser) => ({ name: user.name, role: ROLE_LABELS[user.role] })

/** Support hears of a new ticket. */
export async function mailTicketOpened(tx: Tx, ticket: TicketRow, user: SessionUser, text: string) {
  const facts = await ticketMailFacts(tx, ticket)
  await enqueueMail(
    tx,
    'ticket-opened',
    supportAddress(),
    ticketOpenedMail(facts.ref, fromOf(user), text, ticketUrl(ticket.id)),
  )
}

/** Posts a message both sides see: the caller's pending files and sheet go with it, the status
 *  follows statusAfterMessage (only staff resolve with a reply), and the other side is mailed. */
export async function postTicketMessage(
  user: SessionUser,
  ticketId: number,
  input: TicketMessageInput,
): Promise<number> {
  return transactionWithRetry(async (tx) => {
    const { ticket, access } = await loadTicketFor(user, ticketId, 'see', tx)
    const staff = access === 'staff'
    const sheetId = await checkSheet(tx, user, ticket.rigId, input.sheetId)
    const stockReplyId = staff ? await checkStockReply(tx, input.stockReplyId) : null
    const now = new Date()
    const [ins] = await tx
      .insert(ticketMessages)
      .values({
        ticketId,
        authorId: user.id,
        internal: false,
        body: input.body,
        sheetId,
        stockReplyId,
        createdAt: now,
      })
      .$returningId()
    await claimAttachments(tx, user, ticketId, ins!.id, input.attachmentIds)
    const to = statusAfterMessage(user.role, staff && input.resolve)
    await tx
      .update(tickets)
      .set({ lastMessageAt: now, ...statusChange(ticket.status, to, now) })
      .where(eq(tickets.id, ticketId))
    const facts = await ticketMailFacts(tx, ticket)
    if (staff) {
      if (to !== ticket.status)
        await audit(tx, {
          actorId: user.id,
          action: 'ticket.status',
          subjectType: 'ticket',
          subjectId: ticketId,
          detail: { from: ticket.status, to, withReply: true },
        })
      await enqueueMail(
        tx,
        'ticket-reply',
        facts.teacher.email,
        staffReplyMail(
          facts.teacher.name,
          facts.ref,
          user.name,
          input.body,
          to === 'resolved',
          ticketUrl(ticketId),
        ),
      )
    } else {
      const assignee = await activeStaff(tx, ticket.assigneeId)
      await enqueueMail(
        tx,
        'ticket-message',
        assignee?.email ?? supportAddress(),
        customerMessageMail(
          assignee?.name ?? 'Tiltwright support',
          facts.ref,
          fromOf(user),
          input.body,
          ticketUrl(ticketId),
        ),
      )
    }
    return ins!.id
  })
}

/** An active support or admin account (an assignee), or null. */
export async function activeStaff(db: DbOrTx, id: number | null | undefined) {
  if (!id) return null
  const [u] = await db
    .select({ id: users.id, name: users.name, email: users.email })
    .from(users)
    .where(
      and(
        eq(users.id, id),
        inArray(users.role, ['support', 'admin']),
        isNull(users.disabledAt),
      ),
    )
    .limit(1)
  return u ?? null
}

/** 422 on `assigneeId` unless it names an active support or admin account (null unassigns). */
export async function checkAssignee(db: DbOrTx, id: number | null | undefined) {
  if (id === null || id === undefined) return
  if (!(await activeStaff(db, id)))
    throw invalid({ assigneeId: 'Choose someone on the support staff from the list.' })
}

/** The customer-side counts and the staff's queue counts for the navigation. */
export async function ticketCounts(user: SessionUser) {
  const db = useDb()
  const n = async (where: SQL | undefined) => {
    const [row] = await db.select({ n: count() }).from(tickets).where(where)
    return row?.n ?? 0
  }
  if (!isStaff(user)) {
    return {
      awaitingYou: await n(and(visibleTickets(user), eq(tickets.status, 'awaiting builder'))),
      needsReply: null,
      assignedToMe: null,
      unassigned: null,
    }
  }
  const open = ne(tickets.status, 'resolved')
  const [needsReply, assignedToMe, unassigned] = await Promise.all([
    n(eq(tickets.status, 'needs reply')),
    n(and(open, eq(tickets.assigneeId, user.id))),
    n(and(open, isNull(tickets.assigneeId))),
  ])
  return { awaitingYou: null, needsReply, assignedToMe, unassigned }
}

/** The newest first, for the other tickets of a rig or an order. */
export const newestFirst = [desc(tickets.createdAt), desc(tickets.id)]

// ── Stock replies ───────────────────────────────────────────────────────────────────────────

export const STOCK_REPLY_TITLE_TAKEN = 'Another stock reply already has that title.'

/** Changes a stock reply that is not archived (404 otherwise), with its audit row. */
export async function changeStockReply(
  tx: Tx,
  user: SessionUser,
  id: number,
  set: Partial<typeof stockReplies.$inferInsert>,
  action: 'update' | 'archive',
) {
  const [res] = await tx
    .update(stockReplies)
    .set(set)
    .where(and(eq(stockReplies.id, id), isNull(stockReplies.archivedAt)))
  if (res.affectedRows !== 1) throw notFound('That stock reply')
  await audit(tx, {
    actorId: user.id,
    action: `stock-reply.${action}`,
    subjectType: 'stock-reply',
    subjectId: id,
  })
}

/** The stock replies not archived, by title, with how many sent messages started from each
 *  (or just the one with `id`). */
export async function stockReplyViews(db: DbOrTx, id?: number): Promise<StockReplyView[]> {
  const rows = await db
    .select({
      r: stockReplies,
      uses: sql<number>`(select count(*) from ticket_messages su
        where su.stock_reply_id = ${stockReplies.id})`.mapWith(Number),
    })
    .from(stockReplies)
    .where(and(isNull(stockReplies.archivedAt), id ? eq(stockReplies.id, id) : undefined))
    .orderBy(asc(stockReplies.title), asc(stockReplies.id))
  return rows.map(({ r, uses }) => ({
    id: r.id,
    title: r.title,
    body: r.body,
    updatedAt: r.updatedAt.toISOString(),
    uses,
  }))
}

/** Deletes uploads that no message sent within PENDING_UPLOAD_HOURS (an abandoned form): their
 *  files, then their rows. Run by the recurring sweep; returns how many went. */
export async function dropAbandonedUploads(now = new Date()): Promise<number> {
  const cutoff = new Date(now.getTime() - PENDING_UPLOAD_HOURS * 3600_000)
  const stale = await useDb()
    .select({ id: ticketAttachments.id, key: ticketAttachments.storageKey })
    .from(ticketAttachments)
    .where(and(isNull(ticketAttachments.messageId), lt(ticketAttachments.createdAt, cutoff)))
    .limit(200)
  if (!stale.length) return 0
  // The row goes only if a message has not claimed it meanwhile; then its file.
  const gone: typeof stale = []
  for (const s of stale) {
    const [res] = await useDb()
      .delete(ticketAttachments)
      .where(and(eq(ticketAttachments.id, s.id), isNull(ticketAttachments.messageId)))
    if (res.affectedRows === 1) gone.push(s)
  }
  for (const s of gone) await removeStoredFile(s.key)
  return gone.length
}
