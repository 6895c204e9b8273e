// Save the planner's current inputs as a tuning sheet. The results are recomputed here. A sheet
// saved to a rig needs the right to work on it (else the rig is not found) and marks the rig
// active.
import { createSheetSchema } from '../../../shared/schemas/planner'
import { sheetResults } from '../../../shared/utils/sheets'
import type { CreatedReply } from '../../../shared/types/common'

export default defineEventHandler(async (event): Promise<CreatedReply> => {
  const user = await requireRole(event, 'teacher', 'builder')
  const input = await readBodyAs(event, createSheetSchema)
  const results = sheetResults(input.inputs)
  const id = await transactionWithRetry(async (tx) => {
    if (input.rigId !== undefined) {
      await lockRigFor(tx, user, input.rigId, 'work')
      await touchRig(tx, input.rigId)
    }
    return insertSheet(user.id, { ...input, results }, tx)
  })
  setResponseStatus(event, 201)
  return { id }
})
