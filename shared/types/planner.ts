// Replies of the Gain Planner's routes: the model's own results (shared/utils/planner/).
import type { LoopAnalysis } from '../utils/planner/analyze'
import type { GainPlan } from '../utils/planner/plan'

/** POST /api/planner/analyze. */
export type AnalyzeReply = LoopAnalysis
/** POST /api/planner/plan. */
export type PlanReply = GainPlan
