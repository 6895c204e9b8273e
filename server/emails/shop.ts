// The shop's e-mails. Each is written to the outbox in the transaction of its change.
import { formatCents, INVOICE_NET_DAYS } from '../../shared/utils/pricing'
import { renderMail, type MailItem } from './layout'

/** Who no name is known for: the accounts-payable address a purchase order gives. */
export const ACCOUNTS_PAYABLE = 'accounts payable'

/** Every mail about an order or a quote lists its items. */
interface WithItems {
  lines: MailItem[]
}

export function quoteIssuedMail(
  name: string,
  q: { number: string, totalCents: number, validUntil: string } & WithItems,
  url: string,
) {
  return renderMail(`Your Tiltwright quote ${q.number}`, name, [
    {
      paragraph:
        `Quote ${q.number} for ${formatCents(q.totalCents)} is attached as a PDF for your `
        + `purchasing office. It is valid until ${q.validUntil}.`,
    },
    {
      paragraph:
        'Order from it at the quoted prices by card, or with a purchase order on net '
        + `${INVOICE_NET_DAYS} terms.`,
    },
    { items: q.lines },
    { link: { label: 'Open the quote', url } },
  ])
}

export function orderPlacedMail(
  name: string,
  o: { number: string, totalCents: number, method: 'card' | 'purchase-order' } & WithItems,
  url: string,
) {
  return renderMail(`Order ${o.number} placed`, name, [
    {
      paragraph:
        `We have your order ${o.number} for ${formatCents(o.totalCents)} and have reserved `
        + `its stock.`,
    },
    {
      paragraph:
        o.method === 'card'
          ? 'It will be confirmed as soon as the card payment goes through.'
          : 'Our team reviews the purchase order, usually within one working day, and then '
            + 'sends the invoice.',
    },
    { items: o.lines },
    { link: { label: 'Follow the order', url } },
  ])
}

/** To each admin when a purchase order arrives for review. */
export function poReviewMail(
  name: string,
  o: { number: string, poNumber: string, schoolName: string, totalCents: number } & WithItems,
  url: string,
) {
  return renderMail(`Purchase order ${o.poNumber} to review (order ${o.number})`, name, [
    {
      paragraph:
        `${o.schoolName} sent purchase order ${o.poNumber} for order ${o.number}, `
        + `${formatCents(o.totalCents)}. Its stock is reserved while it waits for review.`,
    },
    {
      paragraph:
        `Check the document, then approve it (the net ${INVOICE_NET_DAYS} invoice goes out) `
        + 'or reject it with a reason the teacher will read.',
    },
    { items: o.lines },
    { link: { label: 'Review the purchase order', url } },
  ])
}

export function poApprovedMail(
  name: string,
  o: {
    number: string
    poNumber: string
    totalCents: number
    exemptionAccepted: boolean
  } & WithItems,
  url: string,
) {
  return renderMail(`Purchase order ${o.poNumber} approved`, name, [
    {
      paragraph:
        `Your purchase order ${o.poNumber} for order ${o.number} is approved. The invoice `
        + `(net ${INVOICE_NET_DAYS}) follows in a separate e-mail to you and your `
        + `accounts-payable contact.`,
    },
    ...(o.exemptionAccepted
      ? [
          {
            paragraph:
              `We accepted your school's tax-exemption certificate, so no sales tax is `
              + `charged: the order's total is now ${formatCents(o.totalCents)}, and later `
              + `orders carry no sales tax either.`,
          },
        ]
      : []),
    { items: o.lines },
    { link: { label: 'Follow the order', url } },
  ])
}

/** `wayBack` is the one way to order the same again (shared/utils/resubmit.ts), as a full URL. */
export function poRejectedMail(
  name: string,
  o: { number: string, poNumber: string, reason: string } & WithItems,
  url: string,
  wayBack: { label: string, url: string },
) {
  return renderMail(`Purchase order ${o.poNumber} could not be accepted`, name, [
    {
      paragraph:
        `We could not accept purchase order ${o.poNumber} for order ${o.number}. The reason `
        + `given: ${o.reason}`,
    },
    {
      paragraph:
        'The order is cancelled and its stock released. To order the same items, send a '
        + 'corrected purchase order '
        + 'from the link below: it opens the purchase-order checkout with the same lines.',
    },
    { items: o.lines },
    { link: wayBack },
    { link: { label: 'See the refused order', url } },
  ])
}

/** To accounts payable (no name known: `name` null) and to the teacher (by name). */
export function invoiceIssuedMail(
  o: {
    number: string
    invoiceNumber: string
    totalCents: number
    dueAt: string
    poNumber: string
  } & WithItems,
  payUrl: string | null,
  name: string | null = null,
) {
  return renderMail(
    `Invoice ${o.invoiceNumber} for purchase order ${o.poNumber}`,
    name ?? ACCOUNTS_PAYABLE,
    [
      {
        paragraph:
          `Invoice ${o.invoiceNumber} for Tiltwright order ${o.number} (purchase order `
          + `${o.poNumber}) is attached: ${formatCents(o.totalCents)}, due ${o.dueAt} `
          + `(net ${INVOICE_NET_DAYS}).`,
      },
      { items: o.lines },
      ...(payUrl ? [{ link: { label: 'Pay the invoice online', url: payUrl } }] : []),
    ],
  )
}

export function paymentReceivedMail(
  name: string,
  o: { number: string, totalCents: number } & WithItems,
  url: string,
) {
  return renderMail(`Payment received for order ${o.number}`, name, [
    {
      paragraph:
        `Thank you: we received ${formatCents(o.totalCents)} for order ${o.number}. The `
        + `receipt is attached.`,
    },
    { items: o.lines },
    { link: { label: 'Follow the order', url } },
  ])
}

export function shippedMail(
  name: string,
  o: { number: string, carrier: string, tracking: string } & WithItems,
  url: string,
) {
  return renderMail(`Order ${o.number} has shipped`, name, [
    {
      paragraph:
        `Order ${o.number} is on its way with ${o.carrier}, tracking number ${o.tracking}. `
        + `The packing list is attached.`,
    },
    {
      paragraph:
        'When the boxes arrive, unpack the steel balls first and keep them away from young '
        + 'children.',
    },
    { items: o.lines },
    { link: { label: 'Follow the order', url } },
  ])
}

export function orderCancelledMail(
  name: string,
  o: { number: string, reason?: string } & WithItems,
  url: string,
) {
  return renderMail(`Order ${o.number} cancelled`, name, [
    {
      paragraph:
        `Order ${o.number} is cancelled and nothing will be charged for it. Its reserved `
        + `stock is released.`,
    },
    ...(o.reason ? [{ paragraph: `The reason given: ${o.reason}` }] : []),
    { items: o.lines },
    { link: { label: 'See the order', url } },
  ])
}

/** To accounts payable and the teacher when a cancelled order's invoice is voided. */
export function invoiceVoidedMail(
  o: { number: string, invoiceNumber: string, poNumber: string, reason: string } & WithItems,
  name: string | null = null,
) {
  return renderMail(
    `Invoice ${o.invoiceNumber} is void: do not pay it`,
    name ?? ACCOUNTS_PAYABLE,
    [
      {
        paragraph:
          `Tiltwright order ${o.number} (purchase order ${o.poNumber}) is cancelled, so `
          + `invoice ${o.invoiceNumber} `
          + 'is void. Please do not pay it; nothing is owed for this order.',
      },
      { paragraph: `The reason given: ${o.reason}` },
      { items: o.lines },
      { paragraph: 'If a payment is already on its way, we refund it in full when it arrives.' },
    ],
  )
}

/** To the payer when money arrived for an order that had already ended. */
export function paymentRefundedMail(
  name: string,
  o: { number: string, amountCents: number, status: string } & WithItems,
  url: string,
) {
  return renderMail(`Refund for order ${o.number}`, name, [
    {
      paragraph:
        `A payment of ${formatCents(o.amountCents)} reached us for order ${o.number} after the `
        + `order was ${o.status}. `
        + 'We have refunded it in full; depending on the bank it shows within 5–10 working days.',
    },
    {
      paragraph: 'Nothing else is needed from you. If you still want the kits, place a new order.',
    },
    { items: o.lines },
    { link: { label: 'See the order', url } },
  ])
}
