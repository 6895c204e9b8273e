// An admin approves a purchase order: optionally accepts the school's tax-exemption
// certificate, then the net-terms invoice is issued by a durable job (tried at once here).
// When the payment service is down the order stays approved and the job retries.
import type { AdminOrderReply } from '../../../../../shared/types/shop'
import { approveSchema } from '../../../../../shared/schemas/shop'

export default defineEventHandler(async (event): Promise<AdminOrderReply> => {
  const admin = await requireRole(event, 'admin')
  const input = await readBodyAs(event, approveSchema)
  const id = await visibleOrderId(event, admin)
  const { jobId } = await approvePurchaseOrder(admin, id, input.acceptTaxCertificate)
  const run = await runJobNow(jobId)
  return replyWithAdminOrder(
    id,
    admin,
    run.done
      ? null
      : 'The payment service did not answer; the invoice will be issued as soon as it does.',
  )
})
