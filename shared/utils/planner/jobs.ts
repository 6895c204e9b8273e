// The planner's heavy work as named jobs with plain (structured-clone safe) arguments and
// results, so the page can run them off the main thread (composables/usePlannerJob.ts) and the
// benchmark can time exactly what the page runs.
import { analyzeLoop, type AnalyzeOptions } from './analyze'
import { whatIfEnvelope } from './envelope'
import { firmwareConstants, type FirmwareOptions } from './firmware'
import { servoJitter } from './jitter'
import { loopView, type LoopViewOptions } from './loop-view'
import { stabilityMap, type StabilityMapOptions } from './map'
import { fitRun, type RunSample } from './measured-run'
import { planGains } from './plan'
import type { Discretization, Gains, Rig, Targets } from './schema'
import { simulate, type SimulateOptions } from './simulate'

export const PLANNER_JOBS = {
  plan: (a: { rig: Rig, targets: Targets }) => planGains(a.rig, a.targets),
  analyze: (a: { rig: Rig, gains: Gains, options?: AnalyzeOptions }) =>
    analyzeLoop(a.rig, a.gains, a.options),
  firmware: (a: { rig: Rig, gains: Gains, options?: FirmwareOptions }) =>
    firmwareConstants(a.rig, a.gains, a.options),
  simulate: (a: { rig: Rig, gains: Gains, options?: SimulateOptions }) =>
    simulate(a.rig, a.gains, a.options),
  map: (a: { rig: Rig, options: StabilityMapOptions, resolution?: number }) =>
    stabilityMap(a.rig, a.options, a.resolution),
  envelope: (a: { rig: Rig, gains: Gains, options?: SimulateOptions }) =>
    whatIfEnvelope(a.rig, a.gains, a.options),
  loopView: (a: { rig: Rig, gains: Gains, options?: LoopViewOptions }) =>
    loopView(a.rig, a.gains, a.options),
  jitter: (a: { rig: Rig, gains: Gains, discretization?: Discretization }) =>
    servoJitter(a.rig, a.gains, { discretization: a.discretization }),
  fitRun: (a: { rig: Rig, gains: Gains, run: RunSample[] }) => fitRun(a.rig, a.gains, a.run),
}

export type PlannerJobName = keyof typeof PLANNER_JOBS
export type PlannerJobArgs<K extends PlannerJobName> = Parameters<(typeof PLANNER_JOBS)[K]>[0]
export type PlannerJobResult<K extends PlannerJobName> = ReturnType<(typeof PLANNER_JOBS)[K]>

export function runPlannerJob<K extends PlannerJobName>(
  name: K,
  args: PlannerJobArgs<K>,
): PlannerJobResult<K> {
  const job = PLANNER_JOBS[name] as (a: PlannerJobArgs<K>) => PlannerJobResult<K>
  return job(args)
}
