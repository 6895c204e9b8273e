// The payment provider's events. Verified by signature (the SDK's constructEvent, with the
// per-install signing secret), recorded by event id so a replay changes nothing, and checked
// against what the order recorded (its own session or invoice, amount, currency) before
// anything changes. Mail and refunds are queued as jobs, so the provider gets its answer fast.
import { eq } from 'drizzle-orm'
import { orders, paymentEvents } from '../../database/schema'
import { verifyWebhook, type PaymentEvent } from '../../services/payments'
import type { WebhookReply } from '../../../shared/types/shop'

/** The order the object belongs to: by the id stored on the order, else the one its
 *  metadata names (only so a mismatch can be shown on that order's timeline). */
async function orderFor(
  tx: Tx,
  column: typeof orders.checkoutSessionId | typeof orders.invoiceId,
  objectId: string,
  metadata: Record<string, string> | null | undefined,
) {
  const [own] = await tx.select({ id: orders.id }).from(orders).where(eq(column, objectId)).limit(1)
  if (own) return own.id
  const named = Number(metadata?.orderId)
  return Number.isSafeInteger(named) && named > 0 && (await loadOrder(tx, named)) ? named : null
}

async function handle(tx: Tx, evt: PaymentEvent) {
  if (evt.type === 'checkout.session.completed') {
    const s = evt.data.object
    if (s.payment_status !== 'paid') return 'ignored'
    const orderId = await orderFor(tx, orders.checkoutSessionId, s.id, s.metadata)
    if (!orderId) return 'unknown-order'
    const intent = typeof s.payment_intent === 'string' ? s.payment_intent : null
    return receivePayment(tx, orderId, {
      objectId: s.id,
      via: 'checkout',
      amountCents: s.amount_total ?? 0,
      currency: s.currency ?? '',
      paymentIntent: intent,
      reference: intent ?? s.id,
    })
  }
  if (evt.type === 'invoice.paid') {
    const inv = evt.data.object
    const orderId = await orderFor(tx, orders.invoiceId, inv.id!, inv.metadata)
    if (!orderId) return 'unknown-order'
    if ((inv as { paid_out_of_band?: boolean }).paid_out_of_band) return 'ignored'
    const intent = (inv as { payment_intent?: string | null }).payment_intent ?? null
    return receivePayment(tx, orderId, {
      objectId: inv.id!,
      via: 'invoice',
      amountCents: inv.amount_paid,
      currency: inv.currency,
      paymentIntent: intent,
      reference: `invoice ${inv.number ?? inv.id}`,
    })
  }
  return 'ignored'
}

export default defineEventHandler(async (event): Promise<WebhookReply> => {
  const raw = (await readRawBody(event, 'utf8')) ?? ''
  const signature = getHeader(event, 'stripe-signature')
  let evt: PaymentEvent
  try {
    if (!signature) throw new Error('no signature')
    evt = verifyWebhook(raw, signature)
  } catch {
    throw badRequest('The webhook signature did not verify.', 'bad-signature')
  }
  const outcome = await transactionWithRetry(async (tx) => {
    try {
      await tx.insert(paymentEvents).values({ id: evt.id, type: evt.type })
    } catch (e) {
      if (isDuplicateKey(e)) return 'duplicate'
      throw e
    }
    return handle(tx, evt)
  })
  return { received: true, duplicate: outcome === 'duplicate' }
})
