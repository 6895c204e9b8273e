// Card checkout: the order, its reserved stock and the job that opens its payment page are
// written in one transaction; the job runs at once. The checkout ends with an order that has
// its payment page, or (the payment service failed) with no order and no stock held. If the
// database fails part-way, the durable job finishes it later and mails the pay link.
import { z } from 'zod'
import { checkoutSourceSchema } from '../../../shared/schemas/shop'
import { checkoutAddressesSchema } from '../../../shared/schemas/address'
import type { CardCheckoutReply } from '../../../shared/types/shop'

export default defineEventHandler(async (event): Promise<CardCheckoutReply> => {
  const user = await requireRole(event, 'teacher')
  const body = checkoutSourceSchema.and(z.object({ addresses: checkoutAddressesSchema.optional() }))
  const input = await readBodyAs(event, body)
  const placed = await placeCardOrder(user, input)
  const run = await runJobNow(placed.jobId)
  if (!run.done) {
    console.error('[checkout] the payment service failed:', run.error)
    await giveUpJob(placed.jobId, run.error ?? 'the payment service failed')
    throw createError({
      statusCode: 502,
      data: { code: 'payments-down' },
      message:
        'The payment service did not answer. Nothing was ordered or charged; please try again '
        + 'in a minute.',
    })
  }
  const order = await loadOrder(useDb(), placed.id)
  setResponseStatus(event, 201)
  return { orderId: placed.id, number: placed.number, url: order!.checkoutUrl }
})
