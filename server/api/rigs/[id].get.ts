// One rig: its checklist, builders, dimensions, calibration and tuning sheets, for the order's
// teacher, the build space's builders, support and admins; 404 for everyone else.
import { idParams } from '../../../shared/schemas/ids'
import type { RigView } from '../../../shared/types/build'

export default defineEventHandler(async (event): Promise<RigView> => {
  const user = await requireUser(event)
  const { id } = paramsAs(event, idParams, 'That rig')
  const { role } = await loadRigFor(user, id, 'see')
  return rigView(useDb(), id, role)
})
