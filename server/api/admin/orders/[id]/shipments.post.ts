// An admin records a shipment with one of the known carriers; the teacher is e-mailed the
// tracking and the packing list. 201 with the refreshed order (the new shipment is its last).
import type { AdminOrderReply } from '../../../../../shared/types/shop'
import { shipmentSchema } from '../../../../../shared/schemas/shop'

export default defineEventHandler(async (event): Promise<AdminOrderReply> => {
  const admin = await requireRole(event, 'admin')
  const input = await readBodyAs(event, shipmentSchema)
  const id = await visibleOrderId(event, admin)
  await shipOrder(admin, id, input)
  setResponseStatus(event, 201)
  return replyWithAdminOrder(id, admin)
})
