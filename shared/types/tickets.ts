// Replies of the ticket, help-queue and stock-reply routes (docs/tickets.md): the contract the
// pages and the server type against. A customer's reply never carries an internal note, a
// stock reply's title or the staff's assignment detail beyond a name.
import type { ListReply } from '../schemas/list'
import type { OrderStatus } from '../utils/order-flow'
import type { AttachmentKind, TicketPriority, TicketStatus } from '../utils/states'
import type { OrderEventView, ShipmentView } from './shop'
import type { RigSheet, RigView } from './build'

export interface TicketRigRef {
  id: number
  serial: string
  name: string
}
export interface TicketOrderRef {
  id: number
  number: string
}

/** One ticket in a list (the customer's /tickets, a rig's tickets, the help queue). */
export interface TicketSummary {
  id: number
  /** "T-1042" (ticketRef). */
  ref: string
  subject: string
  status: TicketStatus
  priority: TicketPriority
  createdAt: string
  lastMessageAt: string
  statusChangedAt: string
  rig: TicketRigRef | null
  order: TicketOrderRef
  schoolName: string
  openedByName: string
  /** The staff member working it (a name only for customers). */
  assignee: { id: number, name: string } | null
  /** Messages both sides see (notes not counted). */
  messageCount: number
  /** Who wrote the last message both sides see. */
  lastFrom: 'customer' | 'staff'
}
export type TicketListReply = ListReply<TicketSummary>

/** A row of the help queue: a summary with the school's id and the last message's opening. */
export interface QueueRow extends TicketSummary {
  schoolId: number
  /** The first 160 characters of the last message both sides see. */
  preview: string
}
export type QueueReply = ListReply<QueueRow>

/** An uploaded file: `url` downloads it (images and videos may also be shown by <img>/<video>,
 *  which never run content). */
export interface AttachmentView {
  id: number
  kind: AttachmentKind
  filename: string
  contentType: string
  size: number
  width: number | null
  height: number | null
  url: string
}

/** A tuning sheet attached to a message: everything needed to show it inline. */
export interface TicketSheet extends RigSheet {
  results: Record<string, unknown>
  rigId: number | null
}

export interface TicketMessageView {
  id: number
  author: { name: string, side: 'customer' | 'staff' }
  /** Always false for a customer: notes are not in their reply at all. */
  internal: boolean
  body: string
  createdAt: string
  attachments: AttachmentView[]
  sheet: TicketSheet | null
  /** The stock reply it started from (staff only; null for customers). */
  stockReplyTitle: string | null
}

/** What the caller may do on the ticket (the server checks each again). */
export interface TicketPermissions {
  reply: boolean
  /** Internal notes, status, priority, assignment, replacements: support and admin. */
  staff: boolean
  /** The customer side may mark its own ticket resolved. */
  resolve: boolean
}

/** GET /api/tickets/:id. */
export interface TicketThread {
  ticket: TicketSummary
  messages: TicketMessageView[]
  /** Replacement parts sent on this ticket. */
  replacements: ShipmentView[]
  may: TicketPermissions
}

/** GET /api/tickets/counts: what the navigation shows. Customers get `awaitingYou` (tickets with
 *  a staff reply waiting on them); the staff get the queue's counts. Fields a role has no use for
 *  are null. */
export interface TicketCounts {
  awaitingYou: number | null
  needsReply: number | null
  assignedToMe: number | null
  unassigned: number | null
}

/** GET /api/tickets/:id/context (support and admin): the order and rig, read-only. */
export interface TicketContext {
  order: {
    id: number
    number: string
    status: OrderStatus
    schoolName: string
    teacherName: string
    placedAt: string
    paidAt: string | null
    items: { productId: number, name: string, quantity: number }[]
    shipments: ShipmentView[]
    timeline: OrderEventView[]
  }
  /** The rig as its page shows it (checklist, sheets, measured runs); null for an order ticket. */
  rig: RigView | null
  /** The other tickets on the same rig (or order), newest first. */
  related: TicketSummary[]
}

/** A part support may send as a replacement. */
export interface ReplacementPart {
  productId: number
  name: string
  kind: 'kit' | 'part'
  available: number
}

/** GET /api/help-queue/options: the queue's filter and assignment choices. */
export interface QueueOptions {
  staff: { id: number, name: string, role: 'support' | 'admin' }[]
  schools: { id: number, name: string }[]
  parts: ReplacementPart[]
}

export interface StockReplyView {
  id: number
  title: string
  body: string
  updatedAt: string
  /** How many sent messages started from it. */
  uses: number
}
export interface StockRepliesReply {
  data: StockReplyView[]
}
