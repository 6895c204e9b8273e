// Suggested gains for a rig and targets. Open to anyone, nothing saved; rate-limited in
// nuxt.config (routeRules) because it is computation on demand.
import { planRequestSchema } from '../../../shared/schemas/planner'
import { planGains } from '../../../shared/utils/planner/plan'
import type { PlanReply } from '../../../shared/types/planner'

export default defineEventHandler(async (event): Promise<PlanReply> => {
  const { rig, targets } = await readBodyAs(event, planRequestSchema)
  return planGains(rig, targets)
})
