// The Gain Planner: targets in, suggested gains, their check, firmware constants, hardware
// limits and warnings out. Inputs are expected to have passed rigSchema / targetsSchema.
import { analyzePlantLoop, type LoopAnalysis } from './analyze'
import { designGains, filterTimeConstant, type GainDesign } from './design'
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
}

export function planGains(rig: Rig, targets: Targets): GainPlan {
  const plant = plantOf(rig)
  const design = designGains(plant, targets)
  const stepSize = targets.stepSize ?? plant.sensorLength / 4
  let gains: Gains | null = null
  let rejectedGains: Gains | null = null
  let analysis: LoopAnalysis | null = null
  let firmware: FirmwareConstants | null = null
  let limits: PlannerLimits | null = null
  const extra: PlannerWarning[] = []
  if (design.feasible && design.kp !== null && design.kd !== null && design.ki !== null) {
    gains = {
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
    analysis = analyzePlantLoop(plant, gains, {
      discretization,
      horizon: 10 * targets.settlingTime,
    })
    if (analysis.stable) {
      limits = computeLimits(rig, gains, analysis, discretization)
      firmware = firmwareConstants(rig, gains, { discretization: targets.discretization })
      extra.push(...firmware.warnings)
    } else {
      rejectedGains = gains
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
    proportional: null,
    reason: null,
  }
}
