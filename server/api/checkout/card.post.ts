// Card checkout: reserve the stock and create the order in one transaction, then open the
// provider's hosted checkout page for it. The signed webhook marks it paid.
import { eq } from 'drizzle-orm'
import { z } from 'zod'
import { checkoutSourceSchema } from '../../../shared/schemas/shop'
import { checkoutAddressesSchema } from '../../../shared/schemas/address'
import { orders, schools } from '../../database/schema'
import { createCardCheckout } from '../../services/payments'
import { orderPlacedMail } from '../../emails/shop'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'teacher')
  const body = checkoutSourceSchema.and(z.object({ addresses: checkoutAddressesSchema.optional() }))
  const input = await readBodyAs(event, body)
  if (!user.schoolId) throw forbidden('Your account has no school to order for.')
  const placed = await transactionWithRetry(async (tx) => {
    const src = await resolveCheckout(tx, user, input)
    const order = await placeOrder(tx, user, 'card', src)
    return { ...order, src }
  })
  const [school] = await useDb().select().from(schools).where(eq(schools.id, user.schoolId)).limit(1)
  let checkout
  try {
    checkout = await createCardCheckout({
      orderId: placed.id, orderNumber: placed.number, email: user.email, name: user.name, schoolName: school?.name ?? '',
      lines: chargeLinesFor(placed.src.lines, placed.src.totals),
      successUrl: appUrl(`/orders/${placed.id}?paid=1`), cancelUrl: appUrl(`/orders/${placed.id}?card=cancelled`),
    })
  } catch (e) {
    console.error('[checkout] the payment service failed', e)
    await useDb().transaction(async (tx) => {
      const order = await loadOrder(tx, placed.id, true)
      await cancelOrderIn(tx, order!, user, 'The payment service could not open a checkout page, so the order was cancelled.')
    })
    throw createError({ statusCode: 502, message: 'The payment service did not answer. Nothing was charged; please try again in a minute.', data: { code: 'payments-down' } })
  }
  await useDb().transaction(async (tx) => {
    await tx.update(orders).set({ providerCustomerId: checkout.customerId, checkoutSessionId: checkout.sessionId, checkoutUrl: checkout.url }).where(eq(orders.id, placed.id))
    await addOrderEvent(tx, placed.id, 'checkout-opened', 'Card checkout opened on the payment page.', user.id)
    await enqueueMail(tx, 'order-placed', user.email, orderPlacedMail(user.name, { number: placed.number, totalCents: placed.src.totals.totalCents, method: 'card' }, appUrl(`/orders/${placed.id}`)))
  })
  setResponseStatus(event, 201)
  return { orderId: placed.id, number: placed.number, url: checkout.url }
})
