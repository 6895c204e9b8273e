// Tiltwright's local payment simulator: the slice of the provider's HTTP API the app uses
// (customers, checkout sessions with expire, invoices with add lines/finalize/pay/void,
// payment intents, refunds, events), answering the official SDK. Registered under /v1/** by
// nuxt.config only in fake mode, and only for the per-install secret key. Idempotency keys
// are honoured like the provider's: a repeated POST gets the first answer back.
import { createHash, timingSafeEqual } from 'node:crypto'
import {
  createError,
  defineEventHandler,
  getHeader,
  getQuery,
  readRawBody,
  setResponseStatus,
  type H3Event,
} from 'h3'
import { asInt, asList, asRecord, asString, parseBracketForm, type FormValue } from './form'
import {
  getObject,
  listObjects,
  newId,
  nowSeconds,
  publicView,
  putObject,
  type FakeObject,
} from './store'
import { emitEvent } from './events'
import { simulatorSettings, updateSimulator } from './simulator'

type Body = Record<string, FormValue>
type Route = {
  method: string
  pattern: RegExp
  run: (m: string[], body: Body, event: H3Event) => Promise<FakeObject | Record<string, unknown>>
}

function providerError(
  status: number,
  message: string,
  type = 'invalid_request_error',
  param?: string,
) {
  return createError({ statusCode: status, data: { error: { type, message, param } } })
}

async function mustGet(type: string, id: string) {
  const obj = await getObject(type, id)
  if (!obj)
    throw providerError(
      404,
      `No such ${type.replace('checkout.', '')}: '${id}'`,
      'invalid_request_error',
      'id',
    )
  return obj
}

export const pageUrl = (kind: 'checkout' | 'invoice', id: string) =>
  new URL(`/fake-pay/${kind}/${id}`, useRuntimeConfig().publicUrl).toString()

function sessionLines(body: Body) {
  return asList(body.line_items).map((li) => {
    const l = li as Body
    const price = (l.price_data ?? {}) as Body
    const product = (price.product_data ?? {}) as Body
    const quantity = asInt(l.quantity, 1)
    const unit = asInt(price.unit_amount, -1)
    if (unit < 0 || quantity < 1)
      throw providerError(
        400,
        'Each line item needs price_data.unit_amount and a quantity.',
        'invalid_request_error',
        'line_items',
      )
    return {
      id: newId('li'),
      object: 'item',
      description: asString(product.name) ?? 'Item',
      quantity,
      amount_total: unit * quantity,
      price: { unit_amount: unit, currency: asString(price.currency) ?? 'usd' },
    }
  })
}

function invoiceTotals(inv: FakeObject): FakeObject {
  const total = (inv.lines.data as { amount: number }[]).reduce((s, l) => s + l.amount, 0)
  const paid = inv.status === 'paid' ? total : 0
  return {
    ...inv,
    subtotal: total,
    total,
    amount_due: total,
    amount_paid: paid,
    amount_remaining: total - paid,
  }
}

export async function payInvoice(inv: FakeObject, outOfBand: boolean) {
  const intent = outOfBand
    ? null
    : await putObject({
        id: newId('pi'),
        object: 'payment_intent',
        created: nowSeconds(),
        amount: inv.amount_due,
        currency: inv.currency,
        status: 'succeeded',
        customer: inv.customer,
        metadata: inv.metadata,
        amount_refunded: 0,
      })
  const paid = invoiceTotals({
    ...inv,
    status: 'paid',
    paid_out_of_band: outOfBand,
    payment_intent: intent?.id ?? null,
    status_transitions: { ...inv.status_transitions, paid_at: nowSeconds() },
  })
  await putObject(paid)
  await emitEvent('invoice.paid', paid)
  return paid
}

/** A newest-first list page; `type` filters events by their type. */
async function listOf(type: string, event: H3Event) {
  const q = getQuery(event)
  const limit = Math.min(100, Math.max(1, Number(q.limit) || 10))
  const data = (await listObjects(type, 500))
    .filter(o => !q.type || o.type === q.type)
    .slice(0, limit)
  return { object: 'list', data: data.map(publicView), has_more: false, url: `/v1/${type}s` }
}

const routes: Route[] = [
  {
    method: 'POST',
    pattern: /^\/v1\/customers$/,
    run: async (_m, b) =>
      putObject({
        id: newId('cus'),
        object: 'customer',
        created: nowSeconds(),
        livemode: false,
        email: asString(b.email) ?? null,
        name: asString(b.name) ?? null,
        description: asString(b.description) ?? null,
        metadata: asRecord(b.metadata),
      }),
  },
  {
    method: 'GET',
    pattern: /^\/v1\/customers\/([\w]+)$/,
    run: async m => mustGet('customer', m[1]!),
  },

  {
    method: 'POST',
    pattern: /^\/v1\/checkout\/sessions$/,
    run: async (_m, b) => {
      if (asString(b.mode) !== 'payment')
        throw providerError(
          400,
          'The fake supports mode=payment only.',
          'invalid_request_error',
          'mode',
        )
      const success = asString(b.success_url)
      if (!success)
        throw providerError(
          400,
          'Missing required param: success_url.',
          'invalid_request_error',
          'success_url',
        )
      const lines = sessionLines(b)
      if (!lines.length)
        throw providerError(
          400,
          'Missing required param: line_items.',
          'invalid_request_error',
          'line_items',
        )
      const id = newId('cs_test')
      const total = lines.reduce((s, l) => s + l.amount_total, 0)
      return putObject({
        id,
        object: 'checkout.session',
        created: nowSeconds(),
        livemode: false,
        mode: 'payment',
        currency: 'usd',
        customer: asString(b.customer) ?? null,
        client_reference_id: asString(b.client_reference_id) ?? null,
        metadata: asRecord(b.metadata),
        amount_subtotal: total,
        amount_total: total,
        payment_status: 'unpaid',
        status: 'open',
        payment_intent: null,
        success_url: success,
        cancel_url: asString(b.cancel_url) ?? null,
        url: pageUrl('checkout', id),
        expires_at: nowSeconds() + 24 * 3600,
        _lines: lines,
      })
    },
  },
  {
    method: 'GET',
    pattern: /^\/v1\/checkout\/sessions\/([\w]+)$/,
    run: async m => mustGet('checkout.session', m[1]!),
  },

  {
    method: 'POST',
    pattern: /^\/v1\/invoices$/,
    run: async (_m, b) => {
      const customer = asString(b.customer)
      if (!customer || !(await getObject('customer', customer)))
        throw providerError(400, 'No such customer.', 'invalid_request_error', 'customer')
      return putObject(
        invoiceTotals({
          id: newId('in'),
          object: 'invoice',
          created: nowSeconds(),
          livemode: false,
          customer,
          currency: asString(b.currency) ?? 'usd',
          collection_method: asString(b.collection_method) ?? 'charge_automatically',
          days_until_due: asInt(b.days_until_due, 0) || null,
          auto_advance: asString(b.auto_advance) === 'true',
          description: asString(b.description) ?? null,
          metadata: asRecord(b.metadata),
          status: 'draft',
          number: null,
          hosted_invoice_url: null,
          invoice_pdf: null,
          due_date: null,
          lines: { object: 'list', data: [], has_more: false, url: '/v1/invoices/lines' },
          status_transitions: { finalized_at: null, paid_at: null },
        }),
      )
    },
  },
  {
    method: 'GET',
    pattern: /^\/v1\/invoices$/,
    run: async (_m, _b, event) => listOf('invoice', event),
  },
  {
    method: 'GET',
    pattern: /^\/v1\/invoices\/([\w]+)$/,
    run: async m => mustGet('invoice', m[1]!),
  },
  {
    method: 'POST',
    pattern: /^\/v1\/invoices\/([\w]+)\/add_lines$/,
    run: async (m, b) => {
      const inv = await mustGet('invoice', m[1]!)
      if (inv.status !== 'draft')
        throw providerError(400, 'Lines can be added to a draft invoice only.')
      const lines = asList(b.lines).map(l => ({
        id: newId('il'),
        object: 'line_item',
        amount: asInt((l as Body).amount),
        description: asString((l as Body).description) ?? '',
      }))
      return putObject(
        invoiceTotals({ ...inv, lines: { ...inv.lines, data: [...inv.lines.data, ...lines] } }),
      )
    },
  },
  {
    method: 'POST',
    pattern: /^\/v1\/invoices\/([\w]+)\/finalize$/,
    run: async (m) => {
      const inv = await mustGet('invoice', m[1]!)
      if (inv.status !== 'draft') throw providerError(400, 'This invoice is already finalized.')
      const count = (await listObjects('invoice', 100_000)).filter(i => i.number).length
      const created = nowSeconds()
      const finalized = invoiceTotals({
        ...inv,
        status: 'open',
        number: `TWF-${String(count + 1001).padStart(5, '0')}`,
        hosted_invoice_url: pageUrl('invoice', inv.id),
        due_date:
          inv.collection_method === 'send_invoice'
            ? created + (inv.days_until_due ?? 30) * 86_400
            : null,
        status_transitions: { ...inv.status_transitions, finalized_at: created },
      })
      await putObject(finalized)
      await emitEvent('invoice.finalized', finalized)
      return finalized
    },
  },
  {
    method: 'POST',
    pattern: /^\/v1\/invoices\/([\w]+)\/pay$/,
    run: async (m, b) => {
      const inv = await mustGet('invoice', m[1]!)
      if (inv.status === 'paid')
        throw providerError(400, 'Invoice is already paid.', 'invalid_request_error')
      if (inv.status !== 'open') throw providerError(400, 'Only an open invoice can be paid.')
      return payInvoice(inv, asString(b.paid_out_of_band) === 'true')
    },
  },

  {
    method: 'POST',
    pattern: /^\/v1\/invoices\/([\w]+)\/void$/,
    run: async (m) => {
      const inv = await mustGet('invoice', m[1]!)
      if (inv.status === 'void') return inv
      if (inv.status !== 'open')
        throw providerError(400, `An invoice that is ${inv.status} cannot be voided.`)
      const voided = invoiceTotals({
        ...inv,
        status: 'void',
        status_transitions: { ...inv.status_transitions, voided_at: nowSeconds() },
      })
      await putObject(voided)
      await emitEvent('invoice.voided', voided)
      return voided
    },
  },
  {
    method: 'POST',
    pattern: /^\/v1\/checkout\/sessions\/([\w]+)\/expire$/,
    run: async (m) => {
      const session = await mustGet('checkout.session', m[1]!)
      if (session.status !== 'open')
        throw providerError(400, `A session that is ${session.status} cannot be expired.`)
      const expired = await putObject({ ...session, status: 'expired' })
      await emitEvent('checkout.session.expired', expired)
      return expired
    },
  },

  {
    method: 'GET',
    pattern: /^\/v1\/payment_intents\/([\w]+)$/,
    run: async m => mustGet('payment_intent', m[1]!),
  },
  {
    method: 'POST',
    pattern: /^\/v1\/refunds$/,
    run: async (_m, b) => {
      const id = asString(b.payment_intent)
      if (!id)
        throw providerError(
          400,
          'Missing required param: payment_intent.',
          'invalid_request_error',
          'payment_intent',
        )
      const intent = await mustGet('payment_intent', id)
      const left = intent.amount - (intent.amount_refunded ?? 0)
      const amount = asInt(b.amount, left)
      if (amount < 1 || amount > left)
        throw providerError(
          400,
          `Refund amount must be between 1 and ${left}.`,
          'invalid_request_error',
          'amount',
        )
      const refund = await putObject({
        id: newId('re'),
        object: 'refund',
        created: nowSeconds(),
        amount,
        currency: intent.currency,
        payment_intent: id,
        status: 'succeeded',
        metadata: asRecord(b.metadata),
      })
      await putObject({ ...intent, amount_refunded: (intent.amount_refunded ?? 0) + amount })
      await emitEvent('refund.created', refund)
      return refund
    },
  },
  { method: 'GET', pattern: /^\/v1\/refunds\/([\w]+)$/, run: async m => mustGet('refund', m[1]!) },

  {
    method: 'GET',
    pattern: /^\/v1\/simulator\/settings$/,
    run: async () => ({ object: 'simulator_settings', ...(await simulatorSettings()) }),
  },
  {
    method: 'POST',
    pattern: /^\/v1\/simulator\/settings$/,
    run: async (_m, b) => ({
      object: 'simulator_settings',
      ...(await updateSimulator({
        api: asString(b.api),
        webhooks: asString(b.webhooks),
        slowMs: asString(b.slowMs),
      })),
    }),
  },

  {
    method: 'GET',
    pattern: /^\/v1\/events$/,
    run: async (_m, _b, event) => listOf('event', event),
  },
  { method: 'GET', pattern: /^\/v1\/events\/([\w]+)$/, run: async m => mustGet('event', m[1]!) },
]

/** The per-install secret key, compared in constant time. */
function keyMatches(header: string, key: string) {
  const a = createHash('sha256').update(header).digest()
  const b = createHash('sha256').update(`Bearer ${key}`).digest()
  return key.length > 0 && timingSafeEqual(a, b)
}

const sleep = (ms: number) => new Promise(r => setTimeout(r, ms))

export default defineEventHandler(async (event) => {
  const cfg = useRuntimeConfig()
  if (!cfg.fakePayments) throw createError({ statusCode: 404 })
  if (!keyMatches(getHeader(event, 'authorization') ?? '', String(cfg.paymentsSecretKey))) {
    setResponseStatus(event, 401)
    return { error: { type: 'invalid_request_error', message: 'Invalid API Key provided.' } }
  }
  const path = event.path.split('?')[0]!
  if (!path.startsWith('/v1/simulator/')) {
    const faults = await simulatorSettings()
    if (faults.api === 'fail') {
      setResponseStatus(event, 503)
      return {
        error: {
          type: 'api_error',
          message: 'The local payment simulator is set to fail (simulator settings).',
        },
      }
    }
    if (faults.api === 'slow') await sleep(faults.slowMs)
  }
  for (const r of routes) {
    const m = path.match(r.pattern)
    if (!m || r.method !== event.method) continue
    const idemKey = event.method === 'POST' ? getHeader(event, 'idempotency-key') : undefined
    const idemHash = (key: string) =>
      createHash('sha256').update(`${event.method} ${path} ${key}`).digest('hex').slice(0, 40)
    const idemId = idemKey ? `idem_${idemHash(idemKey)}` : null
    if (idemId) {
      const seen = await getObject('idempotency', idemId)
      if (seen) return seen.response
    }
    const body
      = event.method === 'POST' ? parseBracketForm((await readRawBody(event, 'utf8')) ?? '') : {}
    try {
      const result = await r.run(m, body, event)
      const reply
        = 'id' in result && typeof result.object === 'string'
          ? publicView(result as FakeObject)
          : result
      if (idemId) await putObject({ id: idemId, object: 'idempotency', response: reply })
      return reply
    } catch (e: any) {
      if (e?.data?.error) {
        setResponseStatus(event, e.statusCode)
        return e.data
      }
      throw e
    }
  }
  setResponseStatus(event, 404)
  const message
    = `Unrecognized request URL (${event.method}: ${path}). `
      + 'The local payment simulator implements only what Tiltwright uses.'
  return { error: { type: 'invalid_request_error', message } }
})
