// The ticket counts the navigation shows (customers: replies waiting on them; staff: the
// queue's), read once per page in the browser and shared by the header and the staff layout.
import type { TicketCounts } from '~~/shared/types/tickets'

export function useTicketCounts() {
  const counts = useState<TicketCounts | null>('ticket-counts', () => null)
  const { user } = useCurrentUser()
  const api = useApi()
  async function load() {
    if (!user.value) {
      counts.value = null
      return
    }
    try {
      counts.value = await api<TicketCounts>('/api/tickets/counts')
    } catch {
      // The badge is a comfort: without it the links still work.
    }
  }
  return { counts, load }
}
