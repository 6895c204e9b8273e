// An admin records a payment that arrived outside the payment page (a cheque, a transfer);
// the provider's invoice is then closed as paid out of band, whose webhook changes nothing more.
import { recordPaymentSchema } from '../../../../../shared/schemas/shop'
import { markInvoicePaidOutOfBand } from '../../../../services/payments'

export default defineEventHandler(async (event) => {
  const admin = await requireRole(event, 'admin')
  const input = await readBodyAs(event, recordPaymentSchema)
  const order = await adminOrderStep(event, admin, 'recordPayment', async (tx, o) => {
    await markOrderPaid(tx, o.id, { message: `Payment recorded by ${admin.name} (reference ${input.reference}).`, reference: input.reference, actorId: admin.id })
    return o
  })
  if (order.invoiceId) {
    try {
      await markInvoicePaidOutOfBand(order.invoiceId)
    } catch (e) {
      console.error('[payments] could not close the invoice at the provider', e)
      await addOrderEvent(useDb(), order.id, 'invoice-open', 'The payment is recorded, but the invoice at the payment service could not be closed; close it there by hand.', admin.id)
    }
  }
  return replyWithOrder(order.id, admin)
})
