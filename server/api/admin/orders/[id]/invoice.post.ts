// An admin tries an approved purchase order's invoice again (after the payment service was
// down); the job keeps its key, so the provider still issues one invoice only.
import type { AdminOrderReply } from '../../../../../shared/types/shop'

export default defineEventHandler(async (event): Promise<AdminOrderReply> => {
  const admin = await requireRole(event, 'admin')
  const id = await visibleOrderId(event, admin)
  const { jobId } = await retryInvoice(admin, id)
  const run = await runJobNow(jobId)
  return replyWithAdminOrder(
    id,
    admin,
    run.done
      ? null
      : 'The payment service still does not answer; '
        + 'the invoice will be issued as soon as it does.',
  )
})
