import { eq } from 'drizzle-orm'
import { idParams } from '../../../shared/schemas/ids'
import { updateSheetSchema } from '../../../shared/schemas/planner'
import { canEditSheet } from '../../../shared/utils/sheets'
import { tuningSheets } from '../../database/schema'
import type { SheetView } from '../../../shared/types/sheets'

export default defineEventHandler(async (event): Promise<SheetView> => {
  const user = await requireUser(event)
  const { id } = paramsAs(event, idParams)
  const input = await readBodyAs(event, updateSheetSchema)
  const sheet = await loadVisibleSheet(user, id)
  if (!canEditSheet(user, sheet)) throw forbidden('Only the sheet\'s author can change it.')
  // What the body leaves out stays as it is (a rename sends only the title); null clears.
  const changes = {
    ...(input.title ? { title: input.title } : {}),
    ...(input.note !== undefined ? { note: input.note } : {}),
    ...(input.verdict !== undefined ? { verdict: input.verdict } : {}),
    ...(input.measured !== undefined ? { measured: input.measured } : {}),
  }
  if (Object.keys(changes).length)
    await transactionWithRetry(async (tx) => {
      await tx.update(tuningSheets).set(changes).where(eq(tuningSheets.id, id))
      if (sheet.rigId !== null) await touchRig(tx, sheet.rigId)
    })
  return sheetView(await loadVisibleSheet(user, id))
})
