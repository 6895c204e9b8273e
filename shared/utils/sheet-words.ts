// A tuning sheet in words, for the rig page's sheet history and the sheets a ticket shows the
// staff: its gains in the builder's units and what was measured on the real rig.
import type { MeasuredRun } from '../schemas/build'
import type { Gains } from './planner/schema'
import { gainsInDegrees } from './planner-form'

const n = (v: number, digits = 3) => Number(v.toPrecision(digits))

/** "Kp 1.2°/mm, Kd 0.4°·s/mm" (and Ki when the sheet has one). */
export function gainsText(gains: Gains): string {
  const g = gainsInDegrees(gains)
  const parts = [`Kp ${n(g.kpDegPerMm)}°/mm`, `Kd ${n(g.kdDegPerMmPerS)}°·s/mm`]
  if (gains.ki) parts.push(`Ki ${n(g.kiDegPerMmS)}°/(mm·s)`)
  return parts.join(', ')
}

/** "settled in 1.4 s, 12 % overshoot, 300 samples logged", or "—" when nothing was measured. */
export function measuredText(m: MeasuredRun | null): string {
  if (!m) return '—'
  const parts = []
  if (m.settlingTime !== undefined) parts.push(`settled in ${n(m.settlingTime)} s`)
  if (m.overshootPct !== undefined) parts.push(`${n(m.overshootPct)} % overshoot`)
  if (m.samples?.length) parts.push(`${m.samples.length} samples logged`)
  return parts.join(', ') || '—'
}
