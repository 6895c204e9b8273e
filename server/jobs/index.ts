// Every kind of durable job and what runs it (server/utils/jobs.ts claims and retries them).
import { mailJob } from './mail'
import {
  expireCheckoutJob,
  issueInvoiceJob,
  openCheckoutJob,
  refundPaymentJob,
  settleInvoiceJob,
  sweepCardHoldsJob,
  voidInvoiceJob,
} from './payments'
import { fakeWebhookJob } from '../fake-payments/events'

export const jobKinds = {
  'mail': mailJob,
  'open-checkout': openCheckoutJob,
  'issue-invoice': issueInvoiceJob,
  'void-invoice': voidInvoiceJob,
  'refund-payment': refundPaymentJob,
  'settle-invoice': settleInvoiceJob,
  'expire-checkout': expireCheckoutJob,
  'sweep-card-holds': sweepCardHoldsJob,
  'fake-webhook': fakeWebhookJob,
}

export type JobKind = keyof typeof jobKinds
