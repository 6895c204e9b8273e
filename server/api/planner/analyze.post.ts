// The check of a given set of gains: margins, stability and the step's metrics.
import { analyzeRequestSchema } from '../../../shared/schemas/planner'
import { analyzeLoop } from '../../../shared/utils/planner/analyze'
import type { AnalyzeReply } from '../../../shared/types/planner'

export default defineEventHandler(async (event): Promise<AnalyzeReply> => {
  const { rig, gains } = await readBodyAs(event, analyzeRequestSchema)
  return analyzeLoop(rig, gains)
})
