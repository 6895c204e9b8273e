// Several tuning sheets' predicted step responses on one plot (the rig page's sheet history):
// each sheet's rig and gains simulated from rest at the middle of its beam through one and the
// same setpoint step, positions given in mm from the start so the curves share an axis.
import type { SheetInputs } from '../schemas/planner'
import { simulate } from './planner/simulate'

export interface OverlayCurve {
  label: string
  t: number[]
  /** mm from where the ball started. */
  x: number[]
  /** Beam angle, degrees. */
  angle: number[]
}

export interface Overlay {
  curves: OverlayCurve[]
  /** The setpoint, mm from the start. */
  setpoint: { t: number[], x: number[] }
}

const STEP_AT = 0.5

export function overlayResponses(sheets: { title: string, inputs: SheetInputs }[]): Overlay {
  const first = sheets[0]
  if (!first) return { curves: [], setpoint: { t: [], x: [] } }
  const span = (i: SheetInputs) => i.rig.sensorLength ?? i.rig.beamLength
  const step = first.inputs.targets.stepSize ?? span(first.inputs) / 4
  const duration = Math.min(
    30,
    Math.max(6, ...sheets.map(s => 2.5 * s.inputs.targets.settlingTime + STEP_AT)),
  )
  const curves = sheets.map(({ title, inputs }) => {
    const mid = span(inputs) / 2
    const r = simulate(inputs.rig, inputs.gains, {
      duration,
      initialPosition: mid,
      initialSetpoint: mid,
      setpoint: mid + step,
      setpointTime: STEP_AT,
      nudge: null,
      discretization: inputs.targets.discretization,
    })
    return {
      label: title,
      t: r.t,
      x: r.x.map(v => (v - mid) * 1000),
      angle: r.beamAngle.map(v => (v * 180) / Math.PI),
    }
  })
  const t = curves[0]!.t
  return { curves, setpoint: { t, x: t.map(s => (s < STEP_AT ? 0 : step * 1000)) } }
}
