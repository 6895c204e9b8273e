// The payment adapter: the official stripe SDK, configured only from runtimeConfig. In fake
// mode it talks to the app's own fake (server/fake-payments/) at the app's public URL; with a
// real key and no host it talks to the provider. Routes never see the SDK.
import Stripe from 'stripe'

export interface ChargeLine {
  description: string
  quantity: number
  unitAmountCents: number
}

export interface CheckoutRequest {
  orderId: number
  orderNumber: string
  email: string
  name: string
  schoolName: string
  lines: ChargeLine[]
  successUrl: string
  cancelUrl: string
}

export interface InvoiceRequest {
  orderId: number
  orderNumber: string
  email: string
  name: string
  schoolName: string
  poNumber: string
  lines: ChargeLine[]
  netDays: number
}

let cached: { key: string, stripe: Stripe } | undefined

function client(): Stripe {
  const cfg = useRuntimeConfig()
  const base = cfg.paymentsApiUrl || (cfg.fakePayments ? cfg.publicUrl : '')
  const key = `${cfg.paymentsSecretKey}|${base}`
  if (!cached || cached.key !== key) {
    const target = base ? new URL(base) : null
    cached = {
      key,
      stripe: new Stripe(cfg.paymentsSecretKey, {
        telemetry: false,
        maxNetworkRetries: 1,
        timeout: 15_000,
        ...(target
          ? {
              host: target.hostname,
              port: target.port || (target.protocol === 'https:' ? 443 : 80),
              protocol: target.protocol.replace(':', '') as 'http' | 'https',
            }
          : {}),
      }),
    }
  }
  return cached.stripe
}

/** Every call that creates something carries an idempotency key derived from the order, so
 *  a retried job gets the provider's first answer instead of a second object. */
const once = (key: string) => ({ idempotencyKey: `tiltwright-${key}` })

async function customerFor(
  r: { email: string, name: string, schoolName: string, orderId: number },
  purpose: string,
) {
  const c = await client().customers.create(
    {
      email: r.email,
      name: r.name,
      description: r.schoolName,
      metadata: { orderId: String(r.orderId) },
    },
    once(`customer-${purpose}-${r.orderId}`),
  )
  return c.id
}

/** A hosted checkout page for a card payment of the order. */
export async function createCardCheckout(r: CheckoutRequest) {
  const customer = await customerFor(r, 'checkout')
  const session = await client().checkout.sessions.create(
    {
      mode: 'payment',
      customer,
      client_reference_id: String(r.orderId),
      metadata: { orderId: String(r.orderId), orderNumber: r.orderNumber },
      line_items: r.lines.map(l => ({
        quantity: l.quantity,
        price_data: {
          currency: 'usd',
          unit_amount: l.unitAmountCents,
          product_data: { name: l.description },
        },
      })),
      success_url: r.successUrl,
      cancel_url: r.cancelUrl,
    },
    once(`checkout-${r.orderId}`),
  )
  if (!session.url) throw new Error('the payment provider gave no checkout page')
  return { customerId: customer, sessionId: session.id, url: session.url }
}

/** An invoice sent for payment on net terms, finalized so it has a number and a payment page. */
export async function createNetInvoice(r: InvoiceRequest) {
  const stripe = client()
  const customer = await customerFor(r, 'invoice')
  const draft = await stripe.invoices.create(
    {
      customer,
      collection_method: 'send_invoice',
      days_until_due: r.netDays,
      auto_advance: false,
      currency: 'usd',
      metadata: { orderId: String(r.orderId), orderNumber: r.orderNumber, poNumber: r.poNumber },
      description: `Tiltwright order ${r.orderNumber}, purchase order ${r.poNumber}`,
    },
    once(`invoice-${r.orderId}`),
  )
  // A retried job gets the same draft back: look at it as it is now before adding anything.
  const current = await stripe.invoices.retrieve(draft.id!)
  if (current.status !== 'draft') return invoiceReply(customer, current)
  if (!current.lines?.data?.length) {
    await stripe.invoices.addLines(draft.id!, {
      lines: r.lines.map(l => ({
        amount: l.unitAmountCents * l.quantity,
        description: l.quantity > 1 ? `${l.description} × ${l.quantity}` : l.description,
      })),
    })
  }
  const inv = await stripe.invoices.finalizeInvoice(draft.id!)
  return invoiceReply(customer, inv)
}

function invoiceReply(customer: string, inv: Stripe.Invoice) {
  return {
    customerId: customer,
    invoiceId: inv.id!,
    number: inv.number ?? inv.id!,
    url: inv.hosted_invoice_url ?? null,
    dueAt: inv.due_date ? new Date(inv.due_date * 1000) : null,
    amountDueCents: inv.amount_due,
  }
}

/** What the provider says of a checkout session now: paid or not, for how much. */
export async function checkoutStatus(sessionId: string) {
  const s = await client().checkout.sessions.retrieve(sessionId)
  return {
    paid: s.payment_status === 'paid',
    open: s.status === 'open',
    amountCents: s.amount_total ?? 0,
    currency: s.currency ?? '',
    paymentIntent: typeof s.payment_intent === 'string' ? s.payment_intent : null,
  }
}

/** Closes an unpaid checkout session so it can no longer be paid. */
export async function expireCheckout(sessionId: string) {
  await client().checkout.sessions.expire(sessionId)
}

/** Voids an open invoice: it can no longer be paid, and the provider's page says so. */
export async function voidInvoice(invoiceId: string) {
  const inv = await client().invoices.retrieve(invoiceId)
  if (inv.status === 'void') return { status: 'void' as const }
  if (inv.status === 'paid') return { status: 'paid' as const }
  await client().invoices.voidInvoice(invoiceId, {}, once(`void-${invoiceId}`))
  return { status: 'void' as const }
}

/** Refunds a payment in full; one refund per payment, however often it is asked for. */
export async function refundPayment(paymentIntent: string, amountCents: number) {
  const r = await client().refunds.create(
    { payment_intent: paymentIntent, amount: amountCents },
    once(`refund-${paymentIntent}`),
  )
  return { refundId: r.id, status: r.status }
}

/** An admin recorded a cheque or transfer: close the provider's invoice without a charge. */
export async function markInvoicePaidOutOfBand(invoiceId: string) {
  const inv = await client().invoices.retrieve(invoiceId)
  if (inv.status !== 'open') return
  await client().invoices.pay(invoiceId, { paid_out_of_band: true }, once(`settle-${invoiceId}`))
}

/** Verifies a webhook's signature and returns the event; throws when it does not verify. */
export function verifyWebhook(rawBody: string, signature: string): Stripe.Event {
  return client().webhooks.constructEvent(
    rawBody,
    signature,
    useRuntimeConfig().paymentsWebhookSecret,
  )
}

/** Signs a payload the way the provider does (the fake uses it to deliver its events). */
export function signWebhookPayload(payload: string): string {
  return client().webhooks.generateTestHeaderString({
    payload,
    secret: useRuntimeConfig().paymentsWebhookSecret,
  })
}

export type PaymentEvent = Stripe.Event
