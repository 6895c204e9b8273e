// Save the planner's current inputs as a tuning sheet. The results are recomputed here.
import { createSheetSchema } from '../../../shared/schemas/planner'
import { sheetResults } from '../../../shared/utils/sheets'
import type { CreatedReply } from '../../../shared/types/common'

export default defineEventHandler(async (event): Promise<CreatedReply> => {
  const user = await requireRole(event, 'teacher', 'builder')
  const input = await readBodyAs(event, createSheetSchema)
  const id = await insertSheet(user.id, { ...input, results: sheetResults(input.inputs) })
  setResponseStatus(event, 201)
  return { id }
})
