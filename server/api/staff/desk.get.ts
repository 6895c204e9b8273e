// The staff desk: what is waiting on support and admins (server/utils/staff-desk.ts).
import type { StaffDesk } from '../../../shared/types/staff'

export default defineEventHandler(async (event): Promise<StaffDesk> => {
  const user = await requireRole(event, 'support', 'admin')
  return staffDesk(user)
})
