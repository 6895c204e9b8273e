// The fake provider's own hosted pages: a checkout page for a session and a payment page for
// an invoice, dressed as what they are: Tiltwright's local payment simulator (its palette and
// Nunito), with "Approve this payment" / "Decline this payment" instead of card numbers.
// Approving emits the same signed webhook the provider would. Plain HTML with no script, so the
// app's content-security policy has nothing to allow.
import { readFile } from 'node:fs/promises'
import { join } from 'node:path'
import { createError, defineEventHandler, readBody, sendRedirect, setResponseHeader, setResponseStatus } from 'h3'
import { palette } from '../../shared/utils/palette'
import { getObject, newId, nowSeconds, putObject, type FakeObject } from './store'
import { emitEvent } from './events'
import { payInvoice } from './api'

/** The two answers a tester can give; the form posts `decision` with one of them. */
export const DECISIONS = {
  approve: 'Approve this payment',
  decline: 'Decline this payment',
} as const

const esc = (s: unknown) => String(s ?? '').replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' }[c]!))
const money = (cents: number) => `$${(cents / 100).toFixed(2).replace(/\B(?=(\d{3})+(?!\d))/g, ',')}`

// The app's own Nunito files (runtimeConfig.fontDir), served under /fake-pay/fonts/.
const FONT_WEIGHTS = [400, 700, 800] as const
const fontFaces = FONT_WEIGHTS.map((w) => `@font-face{font-family:Nunito;font-weight:${w};font-display:swap;`
  + `src:url(/fake-pay/fonts/nunito-${w}.woff2) format("woff2")}`).join('')

const c = palette
function page(title: string, body: string) {
  return `<!doctype html><html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1">
<title>${esc(title)} — Tiltwright local payment simulator</title>
<style>
${fontFaces}
body{font-family:Nunito,ui-sans-serif,system-ui,sans-serif;background:${c.chalk.DEFAULT};color:${c.ink.DEFAULT};margin:0;padding:24px;font-size:17px}
main{max-width:460px;margin:0 auto;background:#fff;border:1px solid ${c.chalk.dark};border-top:6px solid ${c.beam[700]};border-radius:10px;padding:24px}
.label{display:inline-block;background:${c.brass[100]};color:${c.brass[700]};font-weight:800;padding:4px 10px;border-radius:999px;font-size:14px;margin-bottom:12px}
.brand{color:${c.beam[700]};font-weight:800;font-size:20px;margin:0 0 4px}
h1{font-size:24px;font-weight:800;color:${c.beam[900]};margin:8px 0}
table{width:100%;border-collapse:collapse;margin:12px 0}td{padding:6px 0;border-bottom:1px solid ${c.chalk.dark}}td.r{text-align:right}
button{margin-top:12px;width:100%;font:inherit;font-size:18px;font-weight:800;padding:12px;border-radius:8px;cursor:pointer}
button.approve{border:0;background:${c.beam[700]};color:#fff}button.decline{border:2px solid ${c.stop.DEFAULT};background:#fff;color:${c.stop.DEFAULT}}
.err{background:${c.stop.soft};color:${c.stop.DEFAULT};padding:8px;border-radius:6px;font-weight:700}
.ok{background:${c.go.soft};color:${c.go.DEFAULT};padding:8px;border-radius:6px;font-weight:700}
.void{background:${c.chalk.dark};color:${c.ink.DEFAULT};padding:8px;border-radius:6px;font-weight:800}
.hint{font-size:14px;color:${c.ink.faint}}a{color:${c.beam[600]};font-weight:700}
</style></head><body><main><p class="brand">Tiltwright</p><span class="label">Local payment simulator · no real money moves</span>${body}</main></body></html>`
}

function linesTable(lines: { description: string; amount: number }[], total: number) {
  return `<table>${lines.map((l) => `<tr><td>${esc(l.description)}</td><td class="r">${money(l.amount)}</td></tr>`).join('')}
<tr><td><strong>Total</strong></td><td class="r"><strong>${money(total)}</strong></td></tr></table>`
}

function decisionForm(action: string, amountCents: number, error?: string) {
  return `${error ? `<p class="err" role="alert">${esc(error)}</p>` : ''}
<form method="post" action="${esc(action)}">
<button type="submit" class="approve" name="decision" value="approve">${DECISIONS.approve}</button>
<button type="submit" class="decline" name="decision" value="decline">${DECISIONS.decline}</button></form>
<p class="hint">This stands in for the payment provider's page while Tiltwright runs locally. Approving pays
${money(amountCents)} as a card payment would (the signed webhook follows); declining is what a refused card looks like.</p>`
}

function decisionOf(raw: unknown): 'approve' | 'decline' | 'unknown' {
  return raw === 'approve' || raw === 'decline' ? raw : 'unknown'
}

const DECISION_ERRORS = {
  decline: 'The payment was declined (as the simulator was asked). Approve it, or go back.',
  unknown: 'Choose "Approve this payment" or "Decline this payment".',
}

async function checkoutPage(session: FakeObject, method: string, form: Record<string, unknown>) {
  const lines = (session._lines as { description: string; quantity: number; amount_total: number }[])
    .map((l) => ({ description: l.quantity > 1 ? `${l.description} × ${l.quantity}` : l.description, amount: l.amount_total }))
  const head = `<h1>Pay ${esc(session.metadata?.orderNumber ? `order ${session.metadata.orderNumber}` : 'Tiltwright')}</h1>${linesTable(lines, session.amount_total)}`
  if (session.status === 'expired') {
    const back = session.cancel_url ? `<p><a href="${esc(session.cancel_url)}">Back to Tiltwright</a></p>` : ''
    return { status: method === 'POST' ? 409 : 200, html: page('Checkout closed', `${head}<p class="void" role="status">This checkout was closed: the order ended, so nothing can be paid here.</p>${back}`) }
  }
  if (session.status !== 'open') {
    return { status: 200, html: page('Paid', `${head}<p class="ok">This checkout is complete.</p><p><a href="${esc(session.success_url)}">Back to Tiltwright</a></p>`) }
  }
  const action = `/fake-pay/checkout/${session.id}`
  const cancel = session.cancel_url ? `<p><a href="${esc(session.cancel_url)}">Cancel and go back</a></p>` : ''
  if (method !== 'POST') return { status: 200, html: page('Checkout', head + decisionForm(action, session.amount_total) + cancel) }
  const verdict = decisionOf(form.decision)
  if (verdict !== 'approve') {
    return { status: verdict === 'decline' ? 402 : 422, html: page('Checkout', head + decisionForm(action, session.amount_total, DECISION_ERRORS[verdict]) + cancel) }
  }
  const intent = await putObject({ id: newId('pi'), object: 'payment_intent', created: nowSeconds(), amount: session.amount_total, currency: 'usd', status: 'succeeded', customer: session.customer, metadata: session.metadata })
  const paid = await putObject({ ...session, status: 'complete', payment_status: 'paid', payment_intent: intent.id })
  await emitEvent('checkout.session.completed', paid)
  return { redirect: String(session.success_url).replace('{CHECKOUT_SESSION_ID}', session.id) }
}

async function invoicePage(inv: FakeObject, method: string, form: Record<string, unknown>) {
  const due = inv.due_date ? new Date(inv.due_date * 1000).toISOString().slice(0, 10) : '—'
  const head = `<h1>Invoice ${esc(inv.number)}</h1><p>${esc(inv.description)}</p><p>Due ${esc(due)}</p>${linesTable(inv.lines.data, inv.amount_due)}`
  const back = `<p><a href="${esc(new URL('/orders', useRuntimeConfig().publicUrl).toString())}">Back to Tiltwright</a></p>`
  if (inv.status === 'paid') return { status: 200, html: page('Invoice paid', `${head}<p class="ok" role="status">This invoice is paid. Thank you.</p>${back}`) }
  if (inv.status === 'void') {
    return { status: method === 'POST' ? 409 : 200, html: page('Invoice void', `${head}<p class="void" role="status">This invoice is void: nothing is owed on it.</p>${back}`) }
  }
  if (inv.status !== 'open') return { status: 409, html: page('Invoice', `${head}<p class="err">This invoice cannot be paid (${esc(inv.status)}).</p>`) }
  const action = `/fake-pay/invoice/${inv.id}`
  if (method !== 'POST') return { status: 200, html: page('Invoice', head + decisionForm(action, inv.amount_due)) }
  const verdict = decisionOf(form.decision)
  if (verdict !== 'approve') return { status: verdict === 'decline' ? 402 : 422, html: page('Invoice', head + decisionForm(action, inv.amount_due, DECISION_ERRORS[verdict])) }
  await payInvoice(inv, false)
  return { redirect: action }
}

async function fontFile(weight: string) {
  if (!FONT_WEIGHTS.map(String).includes(weight)) return null
  return readFile(join(useRuntimeConfig().fontDir, `nunito-latin-${weight}-normal.woff2`)).catch(() => null)
}

export default defineEventHandler(async (event) => {
  if (!useRuntimeConfig().fakePayments) throw createError({ statusCode: 404 })
  const font = event.method === 'GET' ? event.path.match(/^\/fake-pay\/fonts\/nunito-(\d{3})\.woff2$/) : null
  if (font) {
    const bytes = await fontFile(font[1]!)
    if (!bytes) throw createError({ statusCode: 404 })
    setResponseHeader(event, 'content-type', 'font/woff2')
    setResponseHeader(event, 'cache-control', 'public, max-age=86400')
    return bytes
  }
  const m = event.path.split('?')[0]!.match(/^\/fake-pay\/(checkout|invoice)\/([\w]+)$/)
  if (!m || !['GET', 'POST'].includes(event.method)) throw createError({ statusCode: 404, message: 'No such payment page.' })
  const obj = await getObject(m[1] === 'checkout' ? 'checkout.session' : 'invoice', m[2]!)
  if (!obj) throw createError({ statusCode: 404, message: 'No such payment page.' })
  const form = event.method === 'POST' ? ((await readBody(event)) ?? {}) as Record<string, unknown> : {}
  const result = m[1] === 'checkout' ? await checkoutPage(obj, event.method, form) : await invoicePage(obj, event.method, form)
  if ('redirect' in result) return sendRedirect(event, result.redirect!, 303)
  setResponseStatus(event, result.status)
  setResponseHeader(event, 'content-type', 'text/html; charset=utf-8')
  return result.html
})
