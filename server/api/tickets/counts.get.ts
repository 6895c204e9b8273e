// What the navigation counts: a customer's tickets with a reply waiting on them; the staff's
// tickets needing a reply, assigned to them and unassigned.
import type { TicketCounts } from '../../../shared/types/tickets'

export default defineEventHandler(async (event): Promise<TicketCounts> => {
  const user = await requireUser(event)
  return ticketCounts(user)
})
