// The shop's documents, built from the rows they describe. Prices, tier wording, tax rate and
// addresses come from what was quoted or ordered, never from today's catalog or settings.
import type { schools } from '../database/schema'
import {
  formatCents,
  INVOICE_NET_DAYS,
  lineTierWording,
  type Totals,
} from '../../shared/utils/pricing'
import { taxLineLabel, taxNotes } from '../../shared/utils/tax'
import { addressLines, type PostalAddress } from '../../shared/schemas/address'
import { remittanceLines, VENDOR } from '../../shared/utils/vendor'
import { schoolPostalAddress } from '../utils/destination'
import { formatDay } from '../../shared/utils/dates'
import { renderDocument, type DocLineSpec } from './pdf'

type School = typeof schools.$inferSelect
interface Line {
  name: string
  quantity: number
  tierMinQuantity: number
  unitPriceCents: number
  lineTotalCents: number
  tierLabel?: string | null
}
type Money = Pick<
  Totals,
  | 'subtotalCents'
  | 'shippingCents'
  | 'taxCents'
  | 'totalCents'
  | 'taxExempt'
  | 'taxRateBasisPoints'
  | 'taxState'
>
/**
 * An order's money with the addresses it was placed with (none on orders placed before checkout
 * asked).
 */
type OrderMoney = Money & {
  shipTo?: PostalAddress | null
  billTo?: PostalAddress | null
  deliveryNote?: string | null
}

const withAttention = (a: PostalAddress, attention?: string) =>
  addressLines(attention && !a.attention ? { ...a, attention } : a)

function shipToLines(
  order: Pick<OrderMoney, 'shipTo' | 'deliveryNote'>,
  school: School,
  attention?: string,
) {
  const note = order.deliveryNote ? [`Delivery note: ${order.deliveryNote}`] : []
  return [...withAttention(order.shipTo ?? schoolPostalAddress(school), attention), ...note]
}

const billTo = (order: OrderMoney, school: School) => order.billTo ?? schoolPostalAddress(school)

const capitalised = (s: string) => s.charAt(0).toUpperCase() + s.slice(1)

const pricedLines = (lines: Line[]): DocLineSpec[] =>
  lines.map(l => ({
    description: l.name,
    quantity: l.quantity,
    unitCents: l.unitPriceCents,
    totalCents: l.lineTotalCents,
    note: capitalised(lineTierWording(l)),
  }))

function totals(m: Money, charged = false) {
  return [
    { label: 'Subtotal', cents: m.subtotalCents },
    { label: m.shippingCents ? 'Shipping' : 'Shipping (free freight)', cents: m.shippingCents },
    { label: taxLineLabel(m, { charged }), cents: m.taxCents },
    { label: 'Total (USD)', cents: m.totalCents, strong: true },
  ]
}

const SAFETY
  = 'Small steel balls are a choking hazard for young children. '
    + 'Follow your school\'s own safety rules when the rigs are built and powered.'

export function quotePdf(
  q: Money & { number: string, createdAt: Date, validUntil: Date },
  lines: Line[],
  school: School,
  preparedFor: string,
) {
  const valid = formatDay(q.validUntil)
  return renderDocument({
    title: 'Quote',
    number: q.number,
    parties: [
      { label: 'Quote for', lines: withAttention(schoolPostalAddress(school), preparedFor) },
    ],
    meta: [
      ['Quote date', formatDay(q.createdAt)],
      ['Valid until', valid],
      ['Currency', 'US dollars'],
      ['Payment terms', `Card, or purchase order on net ${INVOICE_NET_DAYS} invoice`],
      ['Our tax id', VENDOR.taxId],
    ],
    lines: pricedLines(lines),
    showPrices: true,
    totals: totals(q),
    notes: [
      `This quote is valid until ${valid}. Prices, classroom tiers and shipping are fixed at `
      + `the amounts above while it `
      + 'is valid; an order placed from it is charged exactly these amounts, with sales tax for '
      + 'the order\'s ship-to state '
      + '(and none once the school\'s exemption is accepted).',
      ...taxNotes(q),
      `To order, pay by card online, or send a purchase order quoting ${q.number}; we invoice `
      + `on net ${INVOICE_NET_DAYS} `
      + 'terms once the purchase order is approved.',
      'Stock is reserved when the order is placed, not when the quote is issued.',
      SAFETY,
    ],
  })
}

export interface InvoiceInfo {
  number: string
  dueAt: Date | null
  poNumber: string
  orderNumber: string
  issuedAt: Date
  payUrl: string | null
}

/** The invoice as accounts payable reads it; `paid` makes it the receipt. An invoice whose order
 *  was cancelled says VOID and carries no payment instructions; one already paid says PAID. */
export function invoicePdf(
  inv: InvoiceInfo,
  money: OrderMoney,
  lines: Line[],
  school: School,
  apEmail: string,
  paid?: { at: Date, reference: string | null },
  state: { voided?: boolean, settled?: boolean } = {},
) {
  const due = inv.dueAt ? formatDay(inv.dueAt) : null
  const paidMeta: [string, string][] = paid
    ? [['Paid', `${formatDay(paid.at)}${paid.reference ? ` (${paid.reference})` : ''}`]]
    : []
  const owed = !paid && !state.voided && !state.settled
  const stamp = state.voided ? 'VOID' : paid || state.settled ? 'PAID' : undefined
  return renderDocument({
    title: paid ? 'Receipt' : 'Invoice',
    number: inv.number,
    parties: [
      {
        label: 'Bill to',
        lines: [...addressLines(billTo(money, school)), `Accounts payable: ${apEmail}`],
      },
      { label: 'Ship to', lines: shipToLines(money, school) },
    ],
    meta: [
      ['Invoice date', formatDay(inv.issuedAt)],
      ['Order', inv.orderNumber],
      ['Purchase order', inv.poNumber],
      ...(owed
        ? ([
            ['Terms', `Net ${INVOICE_NET_DAYS}`],
            ['Due date', due ?? '—'],
          ] as [string, string][])
        : []),
      ['Our tax id', VENDOR.taxId],
      ...paidMeta,
    ],
    lines: pricedLines(lines),
    showPrices: true,
    totals: totals(money, true),
    stamp,
    blocks: state.voided
      ? [
          {
            heading: 'This invoice is void',
            lines: ['The order was cancelled, so nothing is owed on this invoice. Do not pay it.'],
          },
        ]
      : owed
        ? [
            { heading: 'Remit to', lines: [VENDOR.remitTo.join(', ')] },
            {
              heading: `How to pay ${formatCents(money.totalCents)} by ${due ?? 'the due date'}`,
              lines: remittanceLines({ invoice: inv.number, po: inv.poNumber, payUrl: inv.payUrl }),
            },
          ]
        : [],
    notes: [
      ...(paid
        ? [
            `Received with thanks: ${formatCents(money.totalCents)}. Keep this receipt with `
            + `purchase order ${inv.poNumber}.`,
          ]
        : []),
      ...(state.settled && !paid
        ? [`Paid in full: ${formatCents(money.totalCents)}. Nothing more is owed.`]
        : []),
      ...(state.voided ? [] : taxNotes(money, { charged: true })),
      ...(owed ? ['The bank details and tax id above are invented for this demonstration.'] : []),
    ],
  })
}

export function cardReceiptPdf(
  order: OrderMoney & { number: string, paidAt: Date },
  lines: Line[],
  school: School,
  buyer: string,
) {
  return renderDocument({
    title: 'Receipt',
    number: order.number,
    parties: [
      { label: 'Sold to', lines: withAttention(billTo(order, school), buyer) },
      { label: 'Ship to', lines: shipToLines(order, school) },
    ],
    meta: [
      ['Paid', formatDay(order.paidAt)],
      ['Method', 'Card, online'],
      ['Order', order.number],
      ['Our tax id', VENDOR.taxId],
    ],
    lines: pricedLines(lines),
    showPrices: true,
    totals: totals(order, true),
    stamp: 'PAID',
    notes: [
      `Received with thanks: ${formatCents(order.totalCents)}.`,
      ...taxNotes(order, { charged: true }),
    ],
  })
}

export function packingListPdf(
  order: { number: string, shipTo?: PostalAddress | null, deliveryNote?: string | null },
  items: { name: string, quantity: number, batchCode: string }[],
  school: School,
  buyer: string,
  shipment?: { carrier: string, tracking: string },
) {
  const shipped: [string, string][] = shipment
    ? [
        ['Carrier', shipment.carrier],
        ['Tracking', shipment.tracking],
      ]
    : []
  return renderDocument({
    title: 'Packing list',
    number: order.number,
    parties: [{ label: 'Ship to', lines: shipToLines(order, school, buyer) }],
    meta: [['Packed', formatDay(new Date())], ...shipped],
    lines: items.map(i => ({
      description: i.name,
      quantity: i.quantity,
      note: `Production batch ${i.batchCode}`,
    })),
    showPrices: false,
    notes: [
      'Check every item against this list when the boxes arrive and tell us within 14 days if '
      + 'anything is missing or damaged.',
      'Small steel balls are a choking hazard for young children: count them out and back in '
      + 'at each lesson.',
    ],
  })
}
