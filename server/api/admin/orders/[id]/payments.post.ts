// An admin records a payment that arrived outside the payment page (a cheque, a transfer);
// a job then closes the provider's invoice as paid out of band.
import type { AdminOrderReply } from '../../../../../shared/types/shop'
import { recordPaymentSchema } from '../../../../../shared/schemas/shop'

export default defineEventHandler(async (event): Promise<AdminOrderReply> => {
  const admin = await requireRole(event, 'admin')
  const input = await readBodyAs(event, recordPaymentSchema)
  const id = await visibleOrderId(event, admin)
  await recordPayment(admin, id, input.reference)
  return replyWithAdminOrder(id, admin)
})
