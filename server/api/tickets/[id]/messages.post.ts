// A message on a ticket, from either side: the caller's pending files and a sheet go with it;
// a customer's reopens or hands the ticket to support, a staff reply hands it to the customer
// side (or resolves it). The other side is mailed (never a builder: they have no address).
import { idParams } from '../../../../shared/schemas/ids'
import { ticketMessageSchema } from '../../../../shared/schemas/tickets'
import type { CreatedReply } from '../../../../shared/types/common'

export default defineEventHandler(async (event): Promise<CreatedReply> => {
  const user = await requireUser(event)
  const { id } = paramsAs(event, idParams, 'That ticket')
  const input = await readBodyAs(event, ticketMessageSchema)
  const messageId = await postTicketMessage(user, id, input)
  setResponseStatus(event, 201)
  return { id: messageId }
})
