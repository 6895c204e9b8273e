// The fixed value lists of the shop and the back office, declared once: the database's enums
// (server/database/schema.ts), the zod schemas and the reply types all read them from here.
// Roles live in ./roles.ts and order states and payment methods in ./order-flow.ts.

/** What a product is. */
export const PRODUCT_KINDS = ['kit', 'part'] as const
export type ProductKind = (typeof PRODUCT_KINDS)[number]

/** A purchase order's review. */
export const PO_STATUSES = ['review', 'approved', 'rejected'] as const
export type PoStatus = (typeof PO_STATUSES)[number]

/** A school's tax-exemption certificate: none sent, waiting, accepted or refused. */
export const TAX_EXEMPTION_STATES = ['none', 'pending', 'accepted', 'rejected'] as const
export type TaxExemptionState = (typeof TAX_EXEMPTION_STATES)[number]

/** Units of a batch held for an order; `sent` are units that left in a replacement shipment
 *  (a ticket's parts), never released. */
export const RESERVATION_STATUSES = ['reserved', 'allocated', 'released', 'sent'] as const
export type ReservationStatus = (typeof RESERVATION_STATUSES)[number]

/** What an uploaded file is. */
export const UPLOAD_KINDS = ['purchase-order', 'tax-certificate'] as const
export type UploadKind = (typeof UPLOAD_KINDS)[number]

/** The documents made from an order's rows (served by /api/orders/[id]/documents/[kind]). */
export const ORDER_DOCUMENT_KINDS = ['invoice', 'receipt', 'packing-list'] as const
export type OrderDocumentKind = (typeof ORDER_DOCUMENT_KINDS)[number]

/** A durable job's life. */
export const JOB_STATES = ['pending', 'done', 'failed'] as const
export type JobState = (typeof JOB_STATES)[number]

/** What a single-use account link is for. */
export const TOKEN_PURPOSES = ['verify-email', 'reset-password'] as const
export type TokenPurpose = (typeof TOKEN_PURPOSES)[number]

/** What a shipment is: the order's own goods, or parts sent free from a ticket. */
export const SHIPMENT_KINDS = ['order', 'replacement'] as const
export type ShipmentKind = (typeof SHIPMENT_KINDS)[number]

/** A ticket's state: waiting on the staff, waiting on the customer side, or done. A customer's
 *  message moves it to `needs reply` (reopening a resolved one); a staff reply to
 *  `awaiting builder`. */
export const TICKET_STATUSES = ['needs reply', 'awaiting builder', 'resolved'] as const
export type TicketStatus = (typeof TICKET_STATUSES)[number]

export const TICKET_PRIORITIES = ['low', 'normal', 'urgent'] as const
export type TicketPriority = (typeof TICKET_PRIORITIES)[number]

/** What a ticket attachment is, judged from its bytes (server/services/files.ts). */
export const ATTACHMENT_KINDS = ['image', 'video', 'pdf'] as const
export type AttachmentKind = (typeof ATTACHMENT_KINDS)[number]
