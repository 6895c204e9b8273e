// An admin changes a staff account: its role (support or admin) or whether it is disabled.
// Disabling ends every session of that person at once.
import { idParams } from '../../../../shared/schemas/ids'
import { updateStaffSchema } from '../../../../shared/schemas/staff'
import type { StaffMember } from '../../../../shared/types/staff'

export default defineEventHandler(async (event): Promise<StaffMember> => {
  const admin = await requireRole(event, 'admin')
  const { id } = paramsAs(event, idParams)
  const change = await readBodyAs(event, updateStaffSchema)
  return updateStaffMember(admin, id, change)
})
