// Jobs that talk to the payment provider. Each call carries an idempotency key derived from
// the order (server/services/payments.ts), so a retry never creates a second object; each
// records its outcome through a step of the order engine (server/utils/order-steps.ts).
import { and, asc, eq, inArray, isNull, lt } from 'drizzle-orm'
import { jobs, orders } from '../database/schema'
import { CARD_HOLD_HOURS } from '../../shared/utils/lifetimes'
import {
  checkoutStatus,
  createCardCheckout,
  createNetInvoice,
  expireCheckout,
  markInvoicePaidOutOfBand,
  refundPayment,
  voidInvoice,
} from '../services/payments'
import type { JobDefinition } from '../utils/jobs'
import { INVOICE_NET_DAYS } from '../../shared/utils/pricing'

type OrderJob = { orderId: number }

/** Opens the hosted checkout page of a card order. Given up (provider down for good, or at
 *  once by the checkout route), the order is removed and its stock released. */
export const openCheckoutJob: JobDefinition<OrderJob> = {
  maxAttempts: 6,
  async run({ orderId }) {
    const order = await loadOrder(useDb(), orderId)
    if (!order || order.status !== 'awaiting payment' || order.checkoutSessionId) return
    const { school, buyer } = await orderPeople(useDb(), order)
    const lines = await linesOf(useDb(), orderId)
    const checkout = await createCardCheckout({
      orderId,
      orderNumber: order.number!,
      email: buyer.email,
      name: buyer.name,
      schoolName: school.name,
      lines: chargeLinesFor(lines, order),
      successUrl: appUrl(`/orders/${orderId}?paid=1`),
      cancelUrl: appUrl(`/orders/${orderId}?card=cancelled`),
    })
    await recordCheckoutOpened(orderId, checkout)
  },
  async giveUp({ orderId }) {
    await discardUnopenedOrder(orderId)
  },
}

/** Issues the net-terms invoice of an approved purchase order. */
export const issueInvoiceJob: JobDefinition<OrderJob> = {
  async run({ orderId }) {
    const order = await loadOrder(useDb(), orderId)
    if (!order || order.invoiceId || order.status !== 'awaiting payment') return
    const { school, po } = await orderPeople(useDb(), order)
    const lines = await linesOf(useDb(), orderId)
    const invoice = await createNetInvoice({
      orderId,
      orderNumber: order.number!,
      email: po!.apEmail,
      name: `${school.name} accounts payable`,
      schoolName: school.name,
      poNumber: po!.poNumber,
      netDays: INVOICE_NET_DAYS,
      lines: chargeLinesFor(lines, order),
    })
    await recordInvoiceIssued(orderId, invoice)
  },
  async giveUp({ orderId }, _job, error) {
    await addOrderEvent(
      useDb(),
      orderId,
      'invoice-failed',
      `The invoice could not be issued at the payment service (${error}). An admin can try `
      + `again from the order page.`,
    )
  },
}

export const voidInvoiceJob: JobDefinition<OrderJob> = {
  async run({ orderId }) {
    const order = await loadOrder(useDb(), orderId)
    if (!order?.invoiceId || order.invoiceVoidedAt) return
    const r = await voidInvoice(order.invoiceId)
    if (r.status === 'void') await recordInvoiceVoided(orderId)
    // A paid invoice cannot be voided: its payment event arrives and is refunded.
  },
}

/** Closes the provider's invoice after an admin recorded a cheque or transfer. */
export const settleInvoiceJob: JobDefinition<OrderJob> = {
  async run({ orderId }) {
    const order = await loadOrder(useDb(), orderId)
    if (order?.invoiceId) await markInvoicePaidOutOfBand(order.invoiceId)
  },
}

/** Closes the checkout page of an order that ended, so it can no longer be paid. */
export const expireCheckoutJob: JobDefinition<OrderJob> = {
  async run({ orderId }) {
    const order = await loadOrder(useDb(), orderId)
    if (!order?.checkoutSessionId) return
    const s = await checkoutStatus(order.checkoutSessionId)
    if (s.open) await expireCheckout(order.checkoutSessionId)
  },
}

export const refundPaymentJob: JobDefinition<
  OrderJob & { paymentIntent: string, amountCents: number }
> = {
  async run({ orderId, paymentIntent, amountCents }) {
    const r = await refundPayment(paymentIntent, amountCents)
    await recordRefund(orderId, { refundId: r.refundId, amountCents })
  },
  async giveUp({ orderId }, _job, error) {
    await addOrderEvent(
      useDb(),
      orderId,
      'refund-failed',
      `The automatic refund failed (${error}); refund the payment by hand.`,
    )
  },
}

/** Card orders unpaid after the hold: asks the provider about each before cancelling it.
 *  Runs again after runtimeConfig.cardHoldSweepMs, and clears jobs finished a month ago. */
export const sweepCardHoldsJob: JobDefinition<Record<string, never>> = {
  // Recurring: it must never be given up.
  maxAttempts: Number.MAX_SAFE_INTEGER,
  async run() {
    const cfg = useRuntimeConfig()
    const hours = Number(cfg.cardHoldHours) || CARD_HOLD_HOURS
    const cutoff = new Date(Date.now() - hours * 3600_000)
    const stale = await useDb()
      .select({ id: orders.id })
      .from(orders)
      .where(
        and(
          eq(orders.paymentMethod, 'card'),
          eq(orders.status, 'awaiting payment'),
          isNull(orders.paidAt),
          lt(orders.createdAt, cutoff),
        ),
      )
      .orderBy(asc(orders.id))
      .limit(100)
    for (const { id } of stale) {
      try {
        await expireCardOrder(id, hours, async (sessionId) => {
          const s = await checkoutStatus(sessionId)
          return {
            ...s,
            objectId: sessionId,
            via: 'checkout',
            amountCents: s.amountCents,
            reference: s.paymentIntent ?? sessionId,
          }
        })
      } catch (e) {
        // The provider did not answer: the order waits for the next sweep rather than being
        // cancelled without knowing whether it was paid.
        console.error(`[card holds] order ${id}:`, e instanceof Error ? e.message : e)
      }
    }
    // Finished jobs are kept a month for looking back, then cleared. Deleted by id after a plain
    // read: a locking scan of the table would wait on this job's own row, held by its runner.
    const old = await useDb()
      .select({ id: jobs.id })
      .from(jobs)
      .where(and(eq(jobs.state, 'done'), lt(jobs.doneAt, new Date(Date.now() - 30 * 86_400_000))))
      .limit(500)
    if (old.length)
      await useDb()
        .delete(jobs)
        .where(
          inArray(
            jobs.id,
            old.map(j => j.id),
          ),
        )
    // Uploads left behind by a ticket form nobody sent.
    await dropAbandonedUploads()
    return { again: Number(cfg.cardHoldSweepMs) || 600_000 }
  },
}
