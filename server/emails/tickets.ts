// The e-mails of tickets: a new ticket and a customer's message to support, a staff reply and
// replacement parts to the order's teacher. Builders get none (they have no address), and no
// mail ever carries an internal note: these renderers take only what the customer side sees.
import { renderMail } from './layout'

interface TicketRef {
  /** "T-12". */
  ref: string
  subject: string
  schoolName: string
  /** "TW-10007-03 (Bench 2)" or the order number for a ticket on the whole order. */
  about: string
}

const subjectLine = (t: TicketRef, what: string) => `${t.ref}: ${what} — ${t.subject}`

/** To support: a builder or teacher opened a ticket. */
export function ticketOpenedMail(
  t: TicketRef,
  from: { name: string, role: string },
  message: string,
  url: string,
) {
  return renderMail(subjectLine(t, 'new ticket'), 'Tiltwright support', [
    {
      paragraph:
        `${from.name} (${from.role}, ${t.schoolName}) opened ticket ${t.ref} about ${t.about}.`,
    },
    { paragraph: message },
    { link: { label: `Open ${t.ref} in the help queue`, url } },
  ])
}

/** To the assignee, or support when nobody has it: the customer side wrote again. */
export function customerMessageMail(
  to: string,
  t: TicketRef,
  from: { name: string, role: string },
  message: string,
  url: string,
) {
  return renderMail(subjectLine(t, `new message from ${from.name}`), to, [
    { paragraph: `${from.name} (${from.role}, ${t.schoolName}) wrote on ${t.ref}:` },
    { paragraph: message },
    { link: { label: `Answer ${t.ref}`, url } },
  ])
}

/** To the order's teacher: support answered (the reply quoted, never a note). */
export function staffReplyMail(
  teacher: string,
  t: TicketRef,
  staff: string,
  reply: string,
  resolved: boolean,
  url: string,
) {
  return renderMail(subjectLine(t, 'support replied'), teacher, [
    { paragraph: `${staff} of Tiltwright support answered ticket ${t.ref} about ${t.about}:` },
    { paragraph: reply },
    {
      paragraph: resolved
        ? 'Support marked the ticket resolved. If the rig still misbehaves, reply on the ticket '
        + 'and it opens again.'
        : 'Your students see this reply on the rig\'s page and the ticket. Reply there when '
          + 'you have tried it.',
    },
    { link: { label: `Read ${t.ref}`, url } },
  ])
}

/** To the order's teacher: free parts are on their way. */
export function replacementShippedMail(
  teacher: string,
  t: TicketRef & { orderNumber: string },
  parts: { name: string, quantity: number }[],
  carrier: { name: string, tracking: string, url: string | null },
  ticketUrl: string,
) {
  return renderMail(subjectLine(t, 'replacement parts shipped'), teacher, [
    {
      paragraph:
        `Tiltwright sent replacement parts for ticket ${t.ref} (order ${t.orderNumber}), free of `
        + 'charge:',
    },
    ...parts.map(p => ({ paragraph: `${p.name} × ${p.quantity}` })),
    { paragraph: `Carrier: ${carrier.name}, tracking ${carrier.tracking}.` },
    ...(carrier.url ? [{ link: { label: 'Track the parcel', url: carrier.url } }] : []),
    { link: { label: `Read ${t.ref}`, url: ticketUrl } },
  ])
}
