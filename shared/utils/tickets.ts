// The rules of a ticket that the server and the pages share (docs/tickets.md): words for its
// states, how a message moves it, the queue's age filter and the attachment limits.
import type { Role } from './roles'
import type { AttachmentKind, TicketPriority, TicketStatus } from './states'

export const TICKET_STATUS_LABELS: Record<TicketStatus, string> = {
  'needs reply': 'Needs reply',
  'awaiting builder': 'Awaiting builder',
  'resolved': 'Resolved',
}

/** The same states in the customer's words: whose move it is. */
export const TICKET_STATUS_FOR_CUSTOMER: Record<TicketStatus, string> = {
  'needs reply': 'With Tiltwright support',
  'awaiting builder': 'Reply from support: your turn',
  'resolved': 'Resolved',
}

export const TICKET_PRIORITY_LABELS: Record<TicketPriority, string> = {
  low: 'Low',
  normal: 'Normal',
  urgent: 'Urgent',
}

/** Sorting by priority puts urgent first when descending. */
export const PRIORITY_RANK: Record<TicketPriority, number> = { low: 0, normal: 1, urgent: 2 }

/** The status a ticket takes when someone of this role posts a message (not a note). A
 *  customer's message always hands it to the staff, reopening a resolved ticket; a staff reply
 *  hands it to the customer side unless the staff member resolves it with the same reply. */
export function statusAfterMessage(
  role: Role,
  resolveWithReply = false,
): TicketStatus {
  if (role === 'teacher' || role === 'builder') return 'needs reply'
  return resolveWithReply ? 'resolved' : 'awaiting builder'
}

/** The queue's age filter: tickets opened at least this many hours ago. */
export const TICKET_AGES = ['1d', '3d', '7d', '30d'] as const
export type TicketAge = (typeof TICKET_AGES)[number]
export const TICKET_AGE_HOURS: Record<TicketAge, number> = {
  '1d': 24,
  '3d': 72,
  '7d': 168,
  '30d': 720,
}
export const TICKET_AGE_LABELS: Record<TicketAge, string> = {
  '1d': 'Open more than a day',
  '3d': 'More than 3 days',
  '7d': 'More than a week',
  '30d': 'More than 30 days',
}

/** The queue's sort keys (GET /api/help-queue). */
export const QUEUE_SORTS = [
  'createdAt',
  'lastMessageAt',
  'priority',
  'status',
  'subject',
  'school',
] as const
export type QueueSort = (typeof QUEUE_SORTS)[number]

export const SUBJECT_MAX = 120
export const MESSAGE_MAX = 8000
export const NOTE_MAX = 4000
/** Files one message may carry. */
export const ATTACHMENTS_PER_MESSAGE = 6
/** Uploads a person may hold that no message has sent yet (refused past this, under a lock). */
export const PENDING_UPLOADS_MAX = 12
/** An upload no message has sent within this many hours is deleted by the recurring sweep. */
export const PENDING_UPLOAD_HOURS = 24

const MB = 1024 * 1024
/** The largest file of each kind; a short phone video fits in the video limit. */
export const ATTACHMENT_LIMIT_BYTES: Record<AttachmentKind, number> = {
  image: 8 * MB,
  pdf: 8 * MB,
  video: 40 * MB,
}
export const ATTACHMENT_MAX_BYTES = Math.max(...Object.values(ATTACHMENT_LIMIT_BYTES))
/** An image larger than this on either side, or with more pixels than the next limit, is refused
 *  whatever its file size: a small file can claim a huge picture (a decompression bomb). */
export const IMAGE_MAX_SIDE = 12_000
export const IMAGE_MAX_PIXELS = 40_000_000

/** The types a ticket accepts, judged from the bytes, and what each is. */
export const ATTACHMENT_TYPES = {
  'image/png': 'image',
  'image/jpeg': 'image',
  'image/webp': 'image',
  'application/pdf': 'pdf',
  'video/mp4': 'video',
  'video/quicktime': 'video',
  'video/webm': 'video',
} as const satisfies Record<string, AttachmentKind>
export type AttachmentType = keyof typeof ATTACHMENT_TYPES

/** What the file picker offers (the server judges the bytes regardless). */
export const ATTACHMENT_ACCEPT = Object.keys(ATTACHMENT_TYPES).join(',')

/** A byte count for people: "850 KB", "3.4 MB". */
export function formatBytes(n: number): string {
  if (n < 1024) return `${n} B`
  if (n < MB) return `${Math.round(n / 1024)} KB`
  return `${(n / MB).toFixed(1)} MB`
}

/** The words of the attachment limits, for the form and the errors. */
export const ATTACHMENT_RULE
  = `Photos (PNG, JPEG, WebP) up to ${formatBytes(ATTACHMENT_LIMIT_BYTES.image)}, PDFs up to `
    + `${formatBytes(ATTACHMENT_LIMIT_BYTES.pdf)}, short videos (MP4, MOV, WebM) up to `
    + `${formatBytes(ATTACHMENT_LIMIT_BYTES.video)}; at most ${ATTACHMENTS_PER_MESSAGE} files a `
    + `message.`

/** A ticket's reference as people say it: "T-1042". */
export const ticketRef = (id: number) => `T-${id}`
