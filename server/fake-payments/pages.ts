// The fake provider's own hosted pages: a checkout page for a session and a payment page for
// an invoice, dressed as what they are: Tiltwright's local payment simulator (its palette and
// Nunito), with "Approve this payment" / "Decline this payment" instead of card numbers.
// Approving emits the same signed webhook the provider would. Plain HTML with no script, so the
// app's content-security policy has nothing to allow.
import { readFile } from 'node:fs/promises'
import { join } from 'node:path'
import {
  createError,
  defineEventHandler,
  readBody,
  sendRedirect,
  setResponseHeader,
  setResponseStatus,
} from 'h3'
import {
  closedInvoicePage,
  DECISION_ERRORS,
  decisionForm,
  decisionOf,
  esc,
  FONT_WEIGHTS,
  invoiceHead,
  linesTable,
  page,
  type InvoiceLike,
} from './html'
import { getObject, newId, nowSeconds, putObject, type FakeObject } from './store'
import { emitEvent } from './events'
import { payInvoice } from './api'

async function checkoutPage(session: FakeObject, method: string, form: Record<string, unknown>) {
  const lines = (
    session._lines as { description: string, quantity: number, amount_total: number }[]
  ).map(l => ({
    description: l.quantity > 1 ? `${l.description} × ${l.quantity}` : l.description,
    amount: l.amount_total,
  }))
  const orderNumber = session.metadata?.orderNumber
  const payWhat = orderNumber ? `order ${orderNumber}` : 'Tiltwright'
  const head = `<h1>Pay ${esc(payWhat)}</h1>${linesTable(lines, session.amount_total)}`
  if (session.status === 'expired') {
    const back = session.cancel_url
      ? `<p><a href="${esc(session.cancel_url)}">Back to Tiltwright</a></p>`
      : ''
    const words
      = '<p class="void" role="status">This checkout was closed: the order ended, so nothing can '
        + 'be paid here.</p>'
    return {
      status: method === 'POST' ? 409 : 200,
      html: page('Checkout closed', `${head}${words}${back}`),
    }
  }
  if (session.status !== 'open') {
    return {
      status: 200,
      html: page(
        'Paid',
        `${head}<p class="ok">This checkout is complete.</p><p><a `
        + `href="${esc(session.success_url)}">Back to Tiltwright</a></p>`,
      ),
    }
  }
  const action = `/fake-pay/checkout/${session.id}`
  const cancel = session.cancel_url
    ? `<p><a href="${esc(session.cancel_url)}">Cancel and go back</a></p>`
    : ''
  if (method !== 'POST')
    return {
      status: 200,
      html: page('Checkout', head + decisionForm(action, session.amount_total) + cancel),
    }
  const verdict = decisionOf(form.decision)
  if (verdict !== 'approve') {
    return {
      status: verdict === 'decline' ? 402 : 422,
      html: page(
        'Checkout',
        head + decisionForm(action, session.amount_total, DECISION_ERRORS[verdict]) + cancel,
      ),
    }
  }
  const intent = await putObject({
    id: newId('pi'),
    object: 'payment_intent',
    created: nowSeconds(),
    amount: session.amount_total,
    currency: 'usd',
    status: 'succeeded',
    customer: session.customer,
    metadata: session.metadata,
  })
  const paid = await putObject({
    ...session,
    status: 'complete',
    payment_status: 'paid',
    payment_intent: intent.id,
  })
  await emitEvent('checkout.session.completed', paid)
  return { redirect: String(session.success_url).replace('{CHECKOUT_SESSION_ID}', session.id) }
}

async function invoicePage(inv: FakeObject, method: string, form: Record<string, unknown>) {
  // Accounts payable may have no account: the way back is the home page, not a signed-in page.
  const back = new URL('/', useRuntimeConfig().publicUrl).toString()
  const closed = closedInvoicePage(inv as unknown as InvoiceLike, back, method)
  if (closed) return closed
  const head = invoiceHead(inv as unknown as InvoiceLike)
  const action = `/fake-pay/invoice/${inv.id}`
  if (method !== 'POST')
    return { status: 200, html: page('Invoice', head + decisionForm(action, inv.amount_due)) }
  const verdict = decisionOf(form.decision)
  if (verdict !== 'approve')
    return {
      status: verdict === 'decline' ? 402 : 422,
      html: page('Invoice', head + decisionForm(action, inv.amount_due, DECISION_ERRORS[verdict])),
    }
  await payInvoice(inv, false)
  return { redirect: action }
}

async function fontFile(weight: string) {
  if (!FONT_WEIGHTS.map(String).includes(weight)) return null
  return readFile(join(useRuntimeConfig().fontDir, `nunito-latin-${weight}-normal.woff2`)).catch(
    () => null,
  )
}

export default defineEventHandler(async (event) => {
  if (!useRuntimeConfig().fakePayments) throw createError({ statusCode: 404 })
  const font
    = event.method === 'GET' ? event.path.match(/^\/fake-pay\/fonts\/nunito-(\d{3})\.woff2$/) : null
  if (font) {
    const bytes = await fontFile(font[1]!)
    if (!bytes) throw createError({ statusCode: 404 })
    setResponseHeader(event, 'content-type', 'font/woff2')
    setResponseHeader(event, 'cache-control', 'public, max-age=86400')
    return bytes
  }
  const m = event.path.split('?')[0]!.match(/^\/fake-pay\/(checkout|invoice)\/([\w]+)$/)
  if (!m || !['GET', 'POST'].includes(event.method))
    throw createError({ statusCode: 404, message: 'No such payment page.' })
  const obj = await getObject(m[1] === 'checkout' ? 'checkout.session' : 'invoice', m[2]!)
  if (!obj) throw createError({ statusCode: 404, message: 'No such payment page.' })
  const form
    = event.method === 'POST' ? (((await readBody(event)) ?? {}) as Record<string, unknown>) : {}
  const result
    = m[1] === 'checkout'
      ? await checkoutPage(obj, event.method, form)
      : await invoicePage(obj, event.method, form)
  if ('redirect' in result) return sendRedirect(event, result.redirect!, 303)
  setResponseStatus(event, result.status)
  setResponseHeader(event, 'content-type', 'text/html; charset=utf-8')
  return result.html
})
