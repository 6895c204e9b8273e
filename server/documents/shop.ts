// The shop's documents, built from the rows they describe. Prices come from the stored lines
// (what was quoted or ordered), never from today's catalog.
import type { schools } from '../database/schema'
import { formatCents, INVOICE_NET_DAYS, type Totals } from '../../shared/utils/pricing'
import { renderDocument, toDate, type DocLineSpec } from './pdf'

type School = typeof schools.$inferSelect
interface Line { name: string; quantity: number; tierMinQuantity: number; unitPriceCents: number; lineTotalCents: number }
type Money = Pick<Totals, 'subtotalCents' | 'shippingCents' | 'taxCents' | 'totalCents' | 'taxExempt' | 'taxRateBasisPoints'>

export function schoolLines(s: School, attention?: string): string[] {
  return [s.name, s.district, attention ? `Attn: ${attention}` : null, s.addressLine1, s.addressLine2, `${s.city}, ${s.region} ${s.postalCode}`, s.country === 'US' ? null : s.country]
    .filter((x): x is string => !!x)
}

const pricedLines = (lines: Line[]): DocLineSpec[] => lines.map((l) => ({
  description: l.name, quantity: l.quantity, unitCents: l.unitPriceCents, totalCents: l.lineTotalCents,
  note: `Classroom tier: ${l.tierMinQuantity}+ units`,
}))

function totals(m: Money) {
  const rate = `${(m.taxRateBasisPoints / 100).toFixed(2)}%`
  return [
    { label: 'Subtotal', cents: m.subtotalCents },
    { label: m.shippingCents ? 'Shipping' : 'Shipping (free freight)', cents: m.shippingCents },
    { label: m.taxExempt ? 'Sales tax (exempt, certificate on file)' : `Sales tax (${rate})`, cents: m.taxCents },
    { label: 'Total (USD)', cents: m.totalCents, strong: true },
  ]
}

export function quotePdf(q: Money & { number: string; createdAt: Date; validUntil: Date }, lines: Line[], school: School, preparedFor: string) {
  return renderDocument({
    title: 'Quote', number: q.number, partyLabel: 'Quote for', party: schoolLines(school, preparedFor),
    meta: [['Quote date', toDate(q.createdAt)], ['Valid until', toDate(q.validUntil)], ['Currency', 'US dollars'], ['Payment terms', `Card, or purchase order on net ${INVOICE_NET_DAYS} invoice`]],
    lines: pricedLines(lines), showPrices: true, totals: totals(q),
    notes: [
      `This quote is valid until ${toDate(q.validUntil)}. Prices, classroom tiers, shipping and tax are fixed at the amounts above while it is valid; an order placed from it is charged exactly these amounts.`,
      `To order, pay by card online, or send a purchase order quoting ${q.number}; we invoice on net ${INVOICE_NET_DAYS} terms once the purchase order is approved.`,
      'Stock is reserved when the order is placed, not when the quote is issued.',
      'Small steel balls are a choking hazard for young children. Follow your school\'s own safety rules when the rigs are built and powered.',
    ],
  })
}

export interface InvoiceInfo { number: string; dueAt: Date | null; poNumber: string; orderNumber: string; issuedAt: Date; payUrl: string | null }

export function invoicePdf(inv: InvoiceInfo, money: Money, lines: Line[], school: School, apEmail: string, paid?: { at: Date; reference: string | null }) {
  return renderDocument({
    title: paid ? 'Receipt' : 'Invoice', number: inv.number, partyLabel: 'Bill to', party: [...schoolLines(school), `Accounts payable: ${apEmail}`],
    meta: [
      ['Invoice date', toDate(inv.issuedAt)], ['Order', inv.orderNumber], ['Purchase order', inv.poNumber],
      ['Terms', `Net ${INVOICE_NET_DAYS}`], ['Due date', inv.dueAt ? toDate(inv.dueAt) : '—'],
      ...(paid ? [['Paid', `${toDate(paid.at)}${paid.reference ? ` (${paid.reference})` : ''}`] as [string, string]] : []),
    ],
    lines: pricedLines(lines), showPrices: true, totals: totals(money), stamp: paid ? 'PAID' : undefined,
    notes: paid
      ? [`Received with thanks: ${formatCents(money.totalCents)}. Keep this receipt with purchase order ${inv.poNumber}.`]
      : [
          `Please pay ${formatCents(money.totalCents)} by ${inv.dueAt ? toDate(inv.dueAt) : 'the due date'}, quoting invoice ${inv.number} and purchase order ${inv.poNumber}.`,
          inv.payUrl ? `Pay online: ${inv.payUrl}` : 'Pay by bank transfer or cheque to Tiltwright.',
        ],
  })
}

export function cardReceiptPdf(order: Money & { number: string; paidAt: Date }, lines: Line[], school: School, buyer: string) {
  return renderDocument({
    title: 'Receipt', number: order.number, partyLabel: 'Sold to', party: schoolLines(school, buyer),
    meta: [['Paid', toDate(order.paidAt)], ['Method', 'Card, online'], ['Order', order.number]],
    lines: pricedLines(lines), showPrices: true, totals: totals(order), stamp: 'PAID',
    notes: [`Received with thanks: ${formatCents(order.totalCents)}.`],
  })
}

export function packingListPdf(order: { number: string }, items: { name: string; quantity: number; batchCode: string }[], school: School, buyer: string, shipment?: { carrier: string; tracking: string }) {
  return renderDocument({
    title: 'Packing list', number: order.number, partyLabel: 'Ship to', party: schoolLines(school, buyer),
    meta: [['Packed', toDate(new Date())], ...(shipment ? [['Carrier', shipment.carrier], ['Tracking', shipment.tracking]] as [string, string][] : [])],
    lines: items.map((i) => ({ description: i.name, quantity: i.quantity, note: `Production batch ${i.batchCode}` })), showPrices: false,
    notes: [
      'Check every item against this list when the boxes arrive and tell us within 14 days if anything is missing or damaged.',
      'Small steel balls are a choking hazard for young children: count them out and back in at each lesson.',
    ],
  })
}
