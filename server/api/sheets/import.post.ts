// Import a tuning-sheet file (Tiltwright's JSON shape). Its results are recomputed, not trusted.
import { sheetFileSchema } from '../../../shared/schemas/planner'
import { sheetResults } from '../../../shared/utils/sheets'
import type { CreatedReply } from '../../../shared/types/common'

export default defineEventHandler(async (event): Promise<CreatedReply> => {
  const user = await requireRole(event, 'teacher', 'builder')
  const file = await readBodyAs(event, sheetFileSchema)
  const id = await insertSheet(user.id, {
    title: file.title,
    note: file.note ?? null,
    inputs: file.inputs,
    results: sheetResults(file.inputs),
  })
  setResponseStatus(event, 201)
  return { id }
})
