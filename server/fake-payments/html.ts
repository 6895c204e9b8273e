// The local payment simulator's HTML, with no server state: the page frame in Tiltwright's
// palette and Nunito, the lines, the Approve / Decline form, and what an invoice that can no
// longer be paid says. pages.ts serves it; unit tests read it directly.
import { palette } from '../../shared/utils/palette'
import { formatDay } from '../../shared/utils/dates'

/** The two answers a tester can give; the form posts `decision` with one of them. */
export const DECISIONS = {
  approve: 'Approve this payment',
  decline: 'Decline this payment',
} as const

const ENTITIES: Record<string, string> = {
  '&': '&amp;',
  '<': '&lt;',
  '>': '&gt;',
  '"': '&quot;',
  '\'': '&#39;',
}
export const esc = (s: unknown) => String(s ?? '').replace(/[&<>"']/g, c => ENTITIES[c]!)
export const money = (cents: number) =>
  `$${(cents / 100).toFixed(2).replace(/\B(?=(\d{3})+(?!\d))/g, ',')}`

// The app's own Nunito files (runtimeConfig.fontDir), served under /fake-pay/fonts/.
export const FONT_WEIGHTS = [400, 700, 800] as const
const fontFaces = FONT_WEIGHTS.map(
  w =>
    `@font-face{font-family:Nunito;font-weight:${w};font-display:swap;`
    + `src:url(/fake-pay/fonts/nunito-${w}.woff2) format("woff2")}`,
).join('')

const c = palette
const STYLE = [
  fontFaces,
  'body{font-family:Nunito,ui-sans-serif,system-ui,sans-serif;'
  + `background:${c.chalk.DEFAULT};color:${c.ink.DEFAULT};margin:0;padding:24px;font-size:17px}`,
  `main{max-width:460px;margin:0 auto;background:#fff;border:1px solid ${c.chalk.dark};`
  + `border-top:6px solid ${c.beam[700]};border-radius:10px;padding:24px}`,
  `.label{display:inline-block;background:${c.brass[100]};color:${c.brass[700]};font-weight:800;`
  + 'padding:4px 10px;border-radius:999px;font-size:14px;margin-bottom:12px}',
  `.brand{color:${c.beam[700]};font-weight:800;font-size:20px;margin:0 0 4px}`,
  `h1{font-size:24px;font-weight:800;color:${c.beam[900]};margin:8px 0}`,
  `table{width:100%;border-collapse:collapse;margin:12px 0}td{padding:6px 0;border-bottom:1px `
  + `solid ${c.chalk.dark}}`,
  'td.r{text-align:right}',
  'button{margin-top:12px;width:100%;font:inherit;font-size:18px;font-weight:800;padding:12px;'
  + 'border-radius:8px;cursor:pointer}',
  `button.approve{border:0;background:${c.beam[700]};color:#fff}`,
  `button.decline{border:2px solid ${c.stop.DEFAULT};background:#fff;color:${c.stop.DEFAULT}}`,
  '.err,.ok,.void{padding:8px;border-radius:6px;font-weight:700}.void{font-weight:800}',
  `.err{background:${c.stop.soft};color:${c.stop.DEFAULT}}`,
  `.ok{background:${c.go.soft};color:${c.go.DEFAULT}}`,
  `.void{background:${c.chalk.dark};color:${c.ink.DEFAULT}}`,
  `.hint{font-size:14px;color:${c.ink.faint}}a{color:${c.beam[600]};font-weight:700}`,
].join('\n')

export function page(title: string, body: string) {
  return `<!doctype html><html lang="en"><head><meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>${esc(title)} — Tiltwright local payment simulator</title>
<style>
${STYLE}
</style></head><body><main><p class="brand">Tiltwright</p>
<span class="label">Local payment simulator · no real money moves</span>${body}</main>
</body></html>`
}

export function linesTable(lines: { description: string, amount: number }[], total: number) {
  const rows = lines
    .map(l => `<tr><td>${esc(l.description)}</td><td class="r">${money(l.amount)}</td></tr>`)
    .join('')
  return `<table>${rows}
<tr><td><strong>Total</strong></td><td class="r"><strong>${money(total)}</strong></td></tr></table>`
}

export function decisionForm(action: string, amountCents: number, error?: string) {
  return `${error ? `<p class="err" role="alert">${esc(error)}</p>` : ''}
<form method="post" action="${esc(action)}">
<button type="submit" class="approve" name="decision" value="approve">${DECISIONS.approve}</button>
<button type="submit" class="decline" name="decision" value="decline">${DECISIONS.decline}</button>
</form>
<p class="hint">This stands in for the payment provider's page while Tiltwright runs locally.
Approving pays ${money(amountCents)} as a card payment would (the signed webhook follows);
declining is what a refused card looks like.</p>`
}

export function decisionOf(raw: unknown): 'approve' | 'decline' | 'unknown' {
  return raw === 'approve' || raw === 'decline' ? raw : 'unknown'
}

export const DECISION_ERRORS = {
  decline: 'The payment was declined (as the simulator was asked). Approve it, or go back.',
  unknown: 'Choose "Approve this payment" or "Decline this payment".',
}

export interface InvoiceLike {
  id: string
  number?: string
  description?: string
  due_date?: number | null
  status: string
  amount_due: number
  lines: { data: { description: string, amount: number }[] }
}

export function invoiceHead(inv: InvoiceLike) {
  // Only an open invoice is due; a paid or void one says so below instead.
  const due = inv.due_date ? formatDay(new Date(inv.due_date * 1000)) : null
  return (
    `<h1>Invoice ${esc(inv.number)}</h1><p>${esc(inv.description)}</p>`
    + (inv.status === 'open' && due ? `<p>Due ${esc(due)}</p>` : '')
    + linesTable(inv.lines.data, inv.amount_due)
  )
}

/** The page of an invoice that cannot be paid any more (paid, void, or otherwise closed): no
 *  form, no button. Null while it is open. */
export function closedInvoicePage(
  inv: InvoiceLike,
  backUrl: string,
  method: string,
): { status: number, html: string } | null {
  const head = invoiceHead(inv)
  const back = `<p><a href="${esc(backUrl)}">Tiltwright's home page</a></p>`
  const say = (title: string, cls: string, words: string, status: number) => ({
    status,
    html: page(title, `${head}<p class="${cls}" role="status">${words}</p>${back}`),
  })
  if (inv.status === 'paid')
    return say('Invoice paid', 'ok', 'This invoice is paid. Thank you.', 200)
  if (inv.status === 'void')
    return say(
      'Invoice void',
      'void',
      'This invoice is void: nothing is owed on it.',
      method === 'POST' ? 409 : 200,
    )
  if (inv.status !== 'open')
    return say('Invoice', 'err', `This invoice cannot be paid (${esc(inv.status)}).`, 409)
  return null
}
