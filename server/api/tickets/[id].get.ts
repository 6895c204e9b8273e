// One ticket's thread as the caller may see it: staff get the internal notes and the stock
// replies used; the customer side never does. 404 for anyone else.
import { idParams } from '../../../shared/schemas/ids'
import type { TicketThread } from '../../../shared/types/tickets'

export default defineEventHandler(async (event): Promise<TicketThread> => {
  const user = await requireUser(event)
  const { id } = paramsAs(event, idParams, 'That ticket')
  const { ticket, access } = await loadTicketFor(user, id)
  return ticketThread(useDb(), ticket, access)
})
