// The fake provider's own hosted pages: a checkout page for a session and a payment page
// for an invoice. A test card is accepted or declined; paying emits the signed webhook.
// Plain HTML with no script, so the app's content-security policy has nothing to allow.
import { createError, defineEventHandler, readBody, sendRedirect, setResponseHeader, setResponseStatus } from 'h3'
import { getObject, newId, nowSeconds, putObject, type FakeObject } from './store'
import { emitEvent } from './events'
import { payInvoice } from './api'

export const TEST_CARDS = {
  accepted: '4242424242424242',
  declined: '4000000000000002',
}

const esc = (s: unknown) => String(s ?? '').replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' }[c]!))
const money = (cents: number) => `$${(cents / 100).toFixed(2).replace(/\B(?=(\d{3})+(?!\d))/g, ',')}`

function page(title: string, body: string) {
  return `<!doctype html><html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1">
<title>${esc(title)} — test payment service</title>
<style>
body{font-family:system-ui,sans-serif;background:#eef1f4;color:#1b2430;margin:0;padding:24px}
main{max-width:440px;margin:0 auto;background:#fff;border-radius:10px;padding:24px;box-shadow:0 1px 4px #0002}
.banner{background:#3d2f7a;color:#fff;font-weight:700;padding:6px 10px;border-radius:6px;font-size:13px;margin-bottom:16px}
table{width:100%;border-collapse:collapse;margin:12px 0}td{padding:4px 0;border-bottom:1px solid #e3e7ec}td.r{text-align:right}
label{display:block;font-weight:700;margin-top:12px}input{width:100%;box-sizing:border-box;font-size:18px;padding:10px;border:1px solid #8893a0;border-radius:6px}
button{margin-top:16px;width:100%;font-size:18px;font-weight:700;padding:12px;border:0;border-radius:6px;background:#3d2f7a;color:#fff;cursor:pointer}
.err{background:#fde8e6;color:#8a1c12;padding:8px;border-radius:6px;font-weight:700}.ok{background:#e4f3ea;color:#1d5b36;padding:8px;border-radius:6px;font-weight:700}
.hint{font-size:14px;color:#4a5562}a{color:#3d2f7a}
</style></head><body><main><div class="banner">TEST MODE · local payment stand-in · no real money moves</div>${body}</main></body></html>`
}

function linesTable(lines: { description: string; amount: number }[], total: number) {
  return `<table>${lines.map((l) => `<tr><td>${esc(l.description)}</td><td class="r">${money(l.amount)}</td></tr>`).join('')}
<tr><td><strong>Total</strong></td><td class="r"><strong>${money(total)}</strong></td></tr></table>`
}

function cardForm(action: string, label: string, error?: string) {
  return `${error ? `<p class="err" role="alert">${esc(error)}</p>` : ''}
<form method="post" action="${esc(action)}">
<label for="card">Card number</label><input id="card" name="card" inputmode="numeric" autocomplete="off" required>
<button type="submit">${esc(label)}</button></form>
<p class="hint">Test cards: ${TEST_CARDS.accepted.replace(/(\d{4})(?=\d)/g, '$1 ')} is accepted; ${TEST_CARDS.declined.replace(/(\d{4})(?=\d)/g, '$1 ')} is declined.</p>`
}

function checkCard(raw: unknown): 'accepted' | 'declined' | 'unknown' {
  const digits = String(raw ?? '').replace(/\D/g, '')
  return digits === TEST_CARDS.accepted ? 'accepted' : digits === TEST_CARDS.declined ? 'declined' : 'unknown'
}

const CARD_ERRORS = {
  declined: 'The card was declined. Try another card.',
  unknown: 'Use one of the test cards below.',
}

async function checkoutPage(session: FakeObject, method: string, form: Record<string, unknown>) {
  const lines = (session._lines as { description: string; quantity: number; amount_total: number }[])
    .map((l) => ({ description: l.quantity > 1 ? `${l.description} × ${l.quantity}` : l.description, amount: l.amount_total }))
  const head = `<h1>Pay ${esc(session.metadata?.orderNumber ? `order ${session.metadata.orderNumber}` : 'Tiltwright')}</h1>${linesTable(lines, session.amount_total)}`
  if (session.status !== 'open') {
    return { status: 200, html: page('Paid', `${head}<p class="ok">This checkout is complete.</p><p><a href="${esc(session.success_url)}">Back to Tiltwright</a></p>`) }
  }
  const action = `/fake-pay/checkout/${session.id}`
  const cancel = session.cancel_url ? `<p><a href="${esc(session.cancel_url)}">Cancel and go back</a></p>` : ''
  if (method !== 'POST') return { status: 200, html: page('Checkout', head + cardForm(action, `Pay ${money(session.amount_total)}`) + cancel) }
  const verdict = checkCard(form.card)
  if (verdict !== 'accepted') {
    return { status: verdict === 'declined' ? 402 : 422, html: page('Checkout', head + cardForm(action, `Pay ${money(session.amount_total)}`, CARD_ERRORS[verdict]) + cancel) }
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
  if (inv.status !== 'open') return { status: 409, html: page('Invoice', `${head}<p class="err">This invoice cannot be paid (${esc(inv.status)}).</p>`) }
  const action = `/fake-pay/invoice/${inv.id}`
  if (method !== 'POST') return { status: 200, html: page('Invoice', head + cardForm(action, `Pay ${money(inv.amount_due)}`)) }
  const verdict = checkCard(form.card)
  if (verdict !== 'accepted') return { status: verdict === 'declined' ? 402 : 422, html: page('Invoice', head + cardForm(action, `Pay ${money(inv.amount_due)}`, CARD_ERRORS[verdict])) }
  await payInvoice(inv, false)
  return { redirect: action }
}

export default defineEventHandler(async (event) => {
  if (!useRuntimeConfig().fakePayments) throw createError({ statusCode: 404 })
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
