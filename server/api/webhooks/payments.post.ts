// The payment provider's events. Verified by signature (the SDK's constructEvent), recorded
// by event id so a replay changes nothing, handled in one short transaction; mail goes to
// the outbox, so the provider gets its answer quickly.
import { paymentEvents } from '../../database/schema'
import { verifyWebhook, type PaymentEvent } from '../../services/payments'

function orderIdOf(obj: { metadata?: Record<string, string> | null }): number | null {
  const id = Number(obj.metadata?.orderId)
  return Number.isSafeInteger(id) && id > 0 ? id : null
}

async function handle(tx: Tx, evt: PaymentEvent) {
  if (evt.type === 'checkout.session.completed') {
    const session = evt.data.object
    const orderId = orderIdOf(session)
    if (orderId && session.payment_status === 'paid') {
      await markOrderPaid(tx, orderId, { message: `Card payment of ${formatCentsForEvent(session.amount_total)} received.`, reference: typeof session.payment_intent === 'string' ? session.payment_intent : session.id, actorId: null })
    }
  } else if (evt.type === 'invoice.paid') {
    const inv = evt.data.object
    const orderId = orderIdOf(inv)
    if (orderId) await markOrderPaid(tx, orderId, { message: `Invoice ${inv.number ?? ''} paid: ${formatCentsForEvent(inv.amount_paid)}.`.replace('  ', ' '), reference: inv.number ?? inv.id ?? null, actorId: null })
  }
}

export default defineEventHandler(async (event) => {
  const raw = (await readRawBody(event, 'utf8')) ?? ''
  const signature = getHeader(event, 'stripe-signature')
  let evt: PaymentEvent
  try {
    if (!signature) throw new Error('no signature')
    evt = verifyWebhook(raw, signature)
  } catch {
    throw badRequest('The webhook signature did not verify.', 'bad-signature')
  }
  const first = await useDb().transaction(async (tx) => {
    try {
      await tx.insert(paymentEvents).values({ id: evt.id, type: evt.type })
    } catch (e) {
      if (isDuplicateKey(e)) return false
      throw e
    }
    await handle(tx, evt)
    return true
  })
  return { received: true, duplicate: !first }
})
