// An admin records a shipment; the teacher is e-mailed the tracking and the packing list.
import { shipmentSchema } from '../../../../../shared/schemas/shop'

export default defineEventHandler(async (event) => {
  const admin = await requireRole(event, 'admin')
  const input = await readBodyAs(event, shipmentSchema)
  const id = await visibleOrderId(event, admin)
  const shipmentId = await shipOrder(admin, id, input)
  setResponseStatus(event, 201)
  return { id: shipmentId, order: await replyWithOrder(id, admin) }
})
