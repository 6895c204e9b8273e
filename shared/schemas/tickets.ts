// Request bodies and queries of the tickets, the help queue and the stock replies
// (docs/tickets.md). The same schemas check the pages' forms and the server's input.
import { z } from 'zod'
import { listQuerySchema } from './list'
import { multiLine, plainId, singleLine, wholeNumber } from './text'
import { TICKET_PRIORITIES, TICKET_STATUSES } from '../utils/states'
import {
  ATTACHMENTS_PER_MESSAGE,
  MESSAGE_MAX,
  NOTE_MAX,
  QUEUE_SORTS,
  SUBJECT_MAX,
  TICKET_AGES,
} from '../utils/tickets'
import { shipmentSchema } from './shop'

const subject = singleLine(
  z
    .string({ error: 'Say in a few words what is wrong.' })
    .trim()
    .min(4, 'Say in a few words what is wrong (at least 4 characters).')
    .max(SUBJECT_MAX, `Keep the subject to ${SUBJECT_MAX} characters or fewer.`),
)

const messageBody = (empty: string, max = MESSAGE_MAX) =>
  multiLine(
    z
      .string({ error: empty })
      .trim()
      .min(1, empty)
      .max(max, `Keep it to ${max} characters or fewer.`),
  )

const attachmentIds = z
  .array(plainId('No such attachment.'), { error: 'Attachments are a list of upload ids.' })
  .max(ATTACHMENTS_PER_MESSAGE, `At most ${ATTACHMENTS_PER_MESSAGE} files a message.`)
  .refine(ids => new Set(ids).size === ids.length, 'The same file is attached twice.')
  .default([])

const sheetId = plainId('Choose one of the tuning sheets listed.').nullish()

/** POST /api/tickets: on a rig (builders and teachers) or an order (teachers), never both. */
export const openTicketSchema = z
  .object({
    rigId: plainId('Choose the rig this is about.').optional(),
    orderId: plainId('Choose the order this is about.').optional(),
    subject,
    message: messageBody('Describe what the rig does and what you have tried.'),
    sheetId,
    attachmentIds,
  })
  .superRefine((v, ctx) => {
    if ((v.rigId === undefined) === (v.orderId === undefined))
      ctx.addIssue({
        code: 'custom',
        path: ['rigId'],
        message: 'Choose the rig (or the order) this ticket is about.',
      })
  })
export type OpenTicketInput = z.infer<typeof openTicketSchema>

/** POST /api/tickets/:id/messages. `resolve` (staff only) resolves the ticket with the reply;
 *  `stockReplyId` records the stock reply the staff member started from. */
export const ticketMessageSchema = z.object({
  body: messageBody('Write a message before sending.'),
  sheetId,
  attachmentIds,
  resolve: z.boolean({ error: 'resolve is true or false.' }).default(false),
  stockReplyId: plainId('No such stock reply.').nullish(),
})
export type TicketMessageInput = z.infer<typeof ticketMessageSchema>

/** POST /api/tickets/:id/notes (support and admin). */
export const ticketNoteSchema = z.object({
  body: messageBody('Write the note before saving it.', NOTE_MAX),
})

/** PATCH /api/tickets/:id. Staff may change any field; the customer side may only resolve. */
export const ticketUpdateSchema = z
  .object({
    status: z.enum(TICKET_STATUSES, { error: 'Choose a status from the list.' }).optional(),
    priority: z.enum(TICKET_PRIORITIES, { error: 'Choose low, normal or urgent.' }).optional(),
    assigneeId: plainId('Choose someone on the staff.').nullable().optional(),
  })
  .refine(v => Object.keys(v).length > 0, 'Change at least one thing.')
export type TicketUpdateInput = z.infer<typeof ticketUpdateSchema>

/** POST /api/help-queue/assign: several tickets to one person (null unassigns). */
export const bulkAssignSchema = z.object({
  ticketIds: z
    .array(plainId('No such ticket.'), { error: 'Choose the tickets to assign.' })
    .min(1, 'Choose at least one ticket.')
    .max(100, 'At most 100 tickets at once.'),
  assigneeId: plainId('Choose someone on the staff.').nullable(),
})

/** GET /api/help-queue. `assignee` is `me`, `none` or a staff id. The page starts on `open`
 *  tickets; `any` says every status in the address (an empty filter would fall back to open). */
export const queueQuerySchema = listQuerySchema(QUEUE_SORTS, 'createdAt', 'asc').extend({
  status: z
    .enum([...TICKET_STATUSES, 'open', 'any'] as const, { error: 'Filter by a known status.' })
    .optional(),
  priority: z.enum(TICKET_PRIORITIES, { error: 'Filter by low, normal or urgent.' }).optional(),
  assignee: z
    .string()
    .regex(/^(me|none|[1-9]\d{0,15})$/, 'Filter by me, none or a staff id.')
    .optional(),
  school: plainId('Filter by a school from the list.').optional(),
  age: z.enum(TICKET_AGES, { error: 'Filter by a known age.' }).optional(),
})
export type QueueQuery = z.infer<typeof queueQuerySchema>

/** GET /api/tickets: the customer's own list; optionally one rig's or one order's. */
export const ticketListQuery = listQuerySchema(['lastMessageAt', 'createdAt'] as const,
  'lastMessageAt', 'desc').extend({
  status: z
    .enum([...TICKET_STATUSES, 'open'] as const, { error: 'Filter by a known status.' })
    .optional(),
  rigId: plainId('No such rig.').optional(),
  orderId: plainId('No such order.').optional(),
})

/** POST / PATCH /api/stock-replies. */
export const stockReplySchema = z.object({
  title: singleLine(
    z
      .string({ error: 'Give the stock reply a short title.' })
      .trim()
      .min(3, 'Give the stock reply a short title (at least 3 characters).')
      .max(80, 'Keep the title to 80 characters or fewer.'),
  ),
  body: messageBody('Write the text of the stock reply.', MESSAGE_MAX),
})

/** POST /api/tickets/:id/replacements: free parts sent on the ticket's order. */
export const replacementSchema = shipmentSchema.extend({
  items: z
    .array(
      z.object({
        productId: plainId('Choose a part from the list.'),
        quantity: wholeNumber('Enter how many.', 'Whole units only.').pipe(
          z.number().min(1, 'At least 1.').max(20, 'At most 20 of a part.'),
        ),
      }),
      { error: 'Choose the parts to send.' },
    )
    .min(1, 'Choose at least one part to send.')
    .max(10, 'At most 10 different parts in one shipment.'),
})
export type ReplacementInput = z.infer<typeof replacementSchema>
