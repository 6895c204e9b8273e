// What the planner page asks its jobs for (shared/utils/planner/jobs.ts): the drawn scenario,
// the stability map's window, the loop view. The page (composables/usePlanner.ts) and the
// keystroke benchmark (bench/keystroke.ts) build their requests here, so the benchmark times
// exactly what a keystroke runs.
import type { PlannerJobArgs, PlannerJobName } from './planner/jobs'
import type { GainPlan } from './planner/plan'
import type { Discretization, Gains, Rig, Targets } from './planner/schema'
import type { SimulateOptions } from './planner/simulate'

/** Cells a side of the page's stability map. */
export const PAGE_MAP_RESOLUTION = 60
/** Points of the page's loop view. */
export const PAGE_LOOP_VIEW_POINTS = 200

/** The drawn run: from the middle of the track, the setpoint moved at 0.5 s, perhaps a nudge. */
export function responseScenario(
  rig: Rig,
  targets: Targets,
  discretization: Discretization,
  nudge: boolean,
): SimulateOptions {
  const mid = (rig.sensorLength ?? rig.beamLength) / 2
  const step = targets.stepSize ?? (rig.sensorLength ?? rig.beamLength) / 4
  const duration = Math.min(
    30,
    Math.max(6, 2.5 * targets.settlingTime + (nudge ? targets.settlingTime + 1 : 0)),
  )
  return {
    duration,
    initialPosition: mid,
    initialSetpoint: mid,
    setpoint: mid + step,
    setpointTime: 0.5,
    nudge: nudge ? { time: 1 + targets.settlingTime * 1.5, speed: 0.15 } : null,
    discretization,
  }
}

/** The stability map around `ref` (the suggestion, or the gains it stands for). */
export function mapRequest(
  rig: Rig,
  targets: Targets,
  ref: Gains,
  discretization: Discretization,
): PlannerJobArgs<'map'> {
  return {
    rig,
    options: {
      kpRange: [ref.kp * 0.02, ref.kp * 3],
      kdRange: [0, Math.max(ref.kd, 0.05) * 3],
      n: targets.derivativeFilterN,
      derivativeOn: targets.derivativeOn,
      ki: targets.form === 'PID' ? ref.ki : 0,
      discretization,
    },
    resolution: PAGE_MAP_RESOLUTION,
  }
}

type Request = { [K in PlannerJobName]: { name: K, args: PlannerJobArgs<K> } }[PlannerJobName]

/**
 * The jobs a change of the rig runs once the plan is back, with the suggested gains and the
 * page's first view (nudge on, no comparison, no what-if): the drawn run, the map, the loop
 * view and (with a noise figure) the jitter.
 */
export function jobsAfterPlan(rig: Rig, targets: Targets, plan: GainPlan): Request[] {
  const gains = plan.gains ?? plan.proportional
  const out: Request[] = []
  const d = plan.discretization
  if (gains)
    out.push({
      name: 'simulate',
      args: { rig, gains, options: responseScenario(rig, targets, d, true) },
    })
  const ref = plan.gains ?? plan.rejectedGains ?? plan.proportional
  if (ref) out.push({ name: 'map', args: mapRequest(rig, targets, ref, d) })
  if (plan.gains) {
    out.push({
      name: 'loopView',
      args: {
        rig,
        gains: plan.gains,
        options: { discretization: d, points: PAGE_LOOP_VIEW_POINTS },
      },
    })
    if (rig.adcNoiseCounts)
      out.push({ name: 'jitter', args: { rig, gains: plan.gains, discretization: d } })
  }
  return out
}
