import { idParams } from '../../../shared/schemas/ids'
import type { SheetView } from '../../../shared/types/sheets'

export default defineEventHandler(async (event): Promise<SheetView> => {
  const user = await requireUser(event)
  const { id } = paramsAs(event, idParams)
  return sheetView(await loadVisibleSheet(user, id))
})
