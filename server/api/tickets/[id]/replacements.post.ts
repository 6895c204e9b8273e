// Free replacement parts sent on the ticket's order, through the order engine: the stock is
// taken, a replacement shipment with its parts and tracking is recorded, the timeline says so
// and the teacher is mailed. Support and admin only (404 for everyone else); 409 when the order
// is not paid or approved, or a part is short.
import { idParams } from '../../../../shared/schemas/ids'
import { replacementSchema } from '../../../../shared/schemas/tickets'

export default defineEventHandler(async (event): Promise<{ shipmentId: number }> => {
  const user = await requireUser(event)
  const { id } = paramsAs(event, idParams, 'That ticket')
  await loadTicketFor(user, id, 'staff')
  const input = await readBodyAs(event, replacementSchema)
  const shipmentId = await sendReplacement(user, id, input)
  setResponseStatus(event, 201)
  return { shipmentId }
})
