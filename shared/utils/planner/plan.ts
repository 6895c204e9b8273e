// The Gain Planner: targets in, suggested gains, their check, firmware constants, hardware
// limits and warnings out. Inputs are expected to have passed rigSchema / targetsSchema.
import { analyzePlantLoop, type LoopAnalysis } from './analyze'
import {
  designGains,
  filterTimeConstant,
  naturalFrequency,
  placeGains,
  zetaFromOvershoot,
  type GainDesign,
} from './design'
import { firmwareConstants, type FirmwareConstants } from './firmware'
import { computeLimits, type PlannerLimits } from './limits'
import { plantOf, type Plant } from './plant'
import type { Discretization, Gains, Rig, Targets } from './schema'
import { collectWarnings, type PlannerWarning } from './warnings'

/**
 * The design's ζ, ω_n, third pole, integral pole and settling-time bounds, as designGains gives
 * them.
 */
export interface GainPlan
  extends Pick<
    GainDesign,
    'zeta' | 'wn' | 'p3' | 'integralPole' | 'fastestSettlingTime' | 'recommendedSettlingTime'
  > {
  plant: Plant
  /**
   * The targets can be met: the method yields gains (lag-aware: p3 > 0; P only: never) and those
   * gains pass analyzeLoop's check. Near p3 = 0, or with a heavy derivative filter, the formulas
   * can give gains that the exact check (true delay, filter, sampling) finds unstable; those
   * are refused too, and kept in rejectedGains.
   */
  feasible: boolean
  /** null when infeasible. */
  gains: Gains | null
  /** Gains the formulas gave but the check refused (unstable); null otherwise. Never load these. */
  rejectedGains: Gains | null
  /** analyzeLoop of the suggestion; null when infeasible. */
  analysis: LoopAnalysis | null
  /** Constants to paste; null when infeasible. */
  firmware: FirmwareConstants | null
  limits: PlannerLimits | null
  /** The setpoint step the limits were checked against, m. */
  stepSize: number
  warnings: PlannerWarning[]
  /** How the exported firmware discretises (Tustin falls back to backward Euler when refused):
   *  the analysis, the margins and the drawn response all use this. */
  discretization: Discretization
  /**
   * P only: the gains the method gives (Kp = ω_n²/K_b, Kd = Ki = 0), for drawing the swing it
   * predicts and its verdict. Never loaded as a suggestion; null for PD and PID.
   */
  proportional: Gains | null
  /** Why there is no suggestion, in plain words (the real reason); null when feasible. */
  reason: string | null
  /**
   * PID: the placement's ζ and ω_n were moved on the sampled loop until its predicted response
   * met the targets (docs/planner-model.md §3); zeta and wn above are the ones used.
   */
  refined: boolean
}

interface Checked {
  design: GainDesign
  gains: Gains
  discretization: Discretization
  analysis: LoopAnalysis
}

/** Gains from a placement, the discretisation the firmware will run, and their check. */
function check(plant: Plant, targets: Targets, design: GainDesign): Checked | null {
  if (design.kp === null || design.kd === null || design.ki === null || !design.feasible) {
    return null
  }
  const gains: Gains = {
    kp: design.kp,
    kd: design.kd,
    ki: design.ki,
    n: targets.derivativeFilterN,
    derivativeOn: targets.derivativeOn,
  }
  // Tustin is only honoured where it is stable; the check then matches what the firmware runs.
  let discretization: Discretization = targets.discretization ?? 'backward-euler'
  if (
    discretization === 'tustin'
    && filterTimeConstant(gains.kp, gains.kd, gains.n) < plant.period / 2
  ) {
    discretization = 'backward-euler'
  }
  const analysis = analyzePlantLoop(plant, gains, {
    discretization,
    horizon: 10 * targets.settlingTime,
  })
  return { design, gains, discretization, analysis }
}

/** Overshoot and settling the sampled loop must reach for a suggestion to meet its targets. */
export const TARGET_TOLERANCE = {
  /** Percentage points over the overshoot asked for. */
  overshootPct: 0.5,
  /** Fraction over the settling time asked for. */
  settling: 0.02,
} as const

function meets(a: LoopAnalysis, targets: Targets): boolean {
  const { overshootPct: os, settlingTime: ts } = a.step
  return (
    a.stable
    && os !== null
    && ts !== null
    && os <= targets.overshootPct + TARGET_TOLERANCE.overshootPct
    && ts <= targets.settlingTime * (1 + TARGET_TOLERANCE.settling)
  )
}

/** Most placements the PID refinement tries (each costs one check of the sampled loop). */
export const PID_REFINE_STEPS = 12

/**
 * docs/planner-model.md §3, PID refinement: the placement ignores the closed-loop zero the
 * integral brings (at −Ki/Kp), so its response overshoots and settles later than asked. Move
 * the placement's ζ and ω_n on the exact sampled loop until the predicted response meets the
 * targets: ζ by the overshoot missed (in ζ), ω_n by the ratio of settling times. Returns the
 * first placement that meets them, or null.
 */
function refinePid(plant: Plant, targets: Targets, first: Checked): Checked | null {
  let zeta = first.design.zeta
  let ts = targets.settlingTime
  let cur = first
  // The integral pole as a fraction of ω_n (docs/planner-model.md §3: 0.25 unless one is given);
  // lowered when more damping alone cannot bring the overshoot down.
  let ratio = 0.25
  const fixedPole = targets.integralPole !== undefined
  const zetaGoal = zetaFromOvershoot(targets.overshootPct)
  for (let i = 0; i < PID_REFINE_STEPS; i++) {
    const { overshootPct: os, settlingTime: got } = cur.analysis.step
    if (!cur.analysis.stable || os === null) return null
    const zGot = zetaFromOvershoot(Math.max(os, 1e-3))
    const osOver = os > targets.overshootPct + TARGET_TOLERANCE.overshootPct
    if (osOver && zeta >= 1 && !fixedPole) ratio *= 0.5
    else zeta = Math.min(1, Math.max(0.2, zeta + (osOver ? 1.2 : 0.5) * (zetaGoal - zGot)))
    const speed = got === null ? 0.5 : (targets.settlingTime * 0.99) / got
    ts = ts * Math.min(1.5, Math.max(0.4, speed))
    const wn = naturalFrequency(zeta, ts)
    const placed = fixedPole ? targets : { ...targets, integralPole: ratio * wn }
    const next = check(plant, targets, placeGains(plant, placed, zeta, wn))
    if (next === null) return null
    cur = next
    if (meets(cur.analysis, targets)) return cur
  }
  return null
}

export function planGains(rig: Rig, targets: Targets): GainPlan {
  const plant = plantOf(rig)
  let design = designGains(plant, targets)
  const stepSize = targets.stepSize ?? plant.sensorLength / 4
  let gains: Gains | null = null
  let rejectedGains: Gains | null = null
  let analysis: LoopAnalysis | null = null
  let firmware: FirmwareConstants | null = null
  let limits: PlannerLimits | null = null
  const extra: PlannerWarning[] = []
  let rejectedAnalysis: LoopAnalysis | null = null
  let refined = false
  let checked = check(plant, targets, design)
  if (
    checked !== null
    && checked.analysis.stable
    && targets.form === 'PID'
    && targets.method === 'lag-aware'
    && !meets(checked.analysis, targets)
  ) {
    const better = refinePid(plant, targets, checked)
    if (better !== null) {
      checked = better
      design = better.design
      refined = true
    }
  }
  if (checked !== null) {
    gains = checked.gains
    analysis = checked.analysis
    const discretization = checked.discretization
    if (analysis.stable) {
      limits = computeLimits(rig, gains, analysis, discretization)
      firmware = firmwareConstants(rig, gains, { discretization: targets.discretization })
      extra.push(...firmware.warnings)
    } else {
      rejectedGains = gains
      rejectedAnalysis = analysis
      gains = null
    }
  }
  const feasible = gains !== null
  const warnings = collectWarnings({
    rig,
    targets,
    plant,
    design,
    gains,
    rejectedGains,
    rejectedAnalysis,
    analysis: feasible ? analysis : null,
    limits,
    stepSize,
  })
  warnings.push(...extra)
  return {
    plant,
    feasible,
    gains,
    rejectedGains,
    zeta: design.zeta,
    wn: design.wn,
    p3: design.p3,
    integralPole: design.integralPole,
    fastestSettlingTime: design.fastestSettlingTime,
    recommendedSettlingTime: design.recommendedSettlingTime,
    analysis: feasible ? analysis : null,
    firmware,
    limits,
    stepSize,
    warnings,
    discretization: firmware?.discretization ?? targets.discretization ?? 'backward-euler',
    proportional:
      targets.form === 'P'
        ? {
            kp: (design.wn * design.wn) / plant.kb,
            kd: 0,
            ki: 0,
            n: targets.derivativeFilterN,
            derivativeOn: targets.derivativeOn,
          }
        : null,
    reason: feasible ? null : reasonOf(warnings),
    refined,
  }
}

/** The warning that says why there is no suggestion, in the order the causes are checked. */
const REASON_CODES = ['p-only-cannot-settle', 'targets-infeasible', 'suggestion-unstable'] as const

function reasonOf(warnings: PlannerWarning[]): string {
  for (const code of REASON_CODES) {
    const w = warnings.find(x => x.code === code)
    if (w) return w.message
  }
  return 'No gains can be suggested for these inputs.'
}
