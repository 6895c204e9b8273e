// Sheets are archived rather than deleted: a ticket may still point at one.
import { eq } from 'drizzle-orm'
import { idParams } from '../../../shared/schemas/ids'
import { canEditSheet } from '../../../shared/utils/sheets'
import { tuningSheets } from '../../database/schema'
import type { OkReply } from '../../../shared/types/common'

export default defineEventHandler(async (event): Promise<OkReply> => {
  const user = await requireUser(event)
  const { id } = paramsAs(event, idParams)
  const sheet = await loadVisibleSheet(user, id)
  if (!canEditSheet(user, sheet)) throw forbidden('Only the sheet\'s author can remove it.')
  await useDb().update(tuningSheets).set({ archived: true }).where(eq(tuningSheets.id, id))
  return { ok: true }
})
