// The check of a given set of gains: margins, stability and the step's metrics.
import { analyzeRequestSchema } from '../../../shared/schemas/planner'
import { analyzeLoop } from '../../../shared/utils/planner/analyze'

export default defineEventHandler(async (event) => {
  const { rig, gains } = await readBodyAs(event, analyzeRequestSchema)
  return analyzeLoop(rig, gains)
})
