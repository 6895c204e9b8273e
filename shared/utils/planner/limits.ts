// What the hardware lets a set of gains do (docs/planner-model.md §4, Limits). The step simulation
// is
// linear, so its peak command and peak servo speed scale with the step: the largest step is
// the hardware limit divided by the peak per metre. The servo is centred on a level beam,
// so the command may swing ±travel/2.
import type { LoopAnalysis } from './analyze'
import { filterTimeConstant } from './design'
import { beamAngleRange } from './geometry'
import { plantOf } from './plant'
import { derivativeCoefficients } from './sampled'
import type { Discretization, Gains, Rig } from './schema'

const DEG = 180 / Math.PI

export interface PlannerLimits {
  /** Largest setpoint step whose peak command stays inside ±travel/2, m; null if unknown. */
  maxStepTravel: number | null
  /** Largest setpoint step the servo's slew limit can follow, m; null if unknown. */
  maxStepSlew: number | null
  /** The smaller of the two, m. */
  maxStep: number | null
  /** ±travel/2, rad. */
  servoHalfTravel: number
  /**
   * The command range that still tilts the beam further: ±travel/2, or less where the lever linkage
   * folds back, rad.
   */
  usableServoTravel: number
  /** omega_max, rad/s. */
  servoSlewLimit: number
  /** Largest beam angle the servo can give, rad (exact linkage for a lever drive). */
  beamAngleLimit: number
  /** The same from the small-angle ratio, rad. */
  beamAngleLimitSmallAngle: number
  /** False when the pushrod cannot follow the servo over its whole travel. */
  linkageReachable: boolean
  /** Largest ball acceleration the beam can give, eta·g·sin(beam angle limit), m/s². */
  maxBallAcceleration: number
  /** Servo jump per ADC count of noise, Kp(1 + N)/k_s (docs/planner-model.md §4), rad. */
  servoJumpPerCount: number
  servoJumpPerCountDeg: number
  /** What the firmware actually does on a one-count jump, (Kp + b)/k_s, degrees. */
  servoJumpPerCountFirmwareDeg: number
}

export function computeLimits(
  rig: Rig,
  gains: Gains,
  analysis: LoopAnalysis | null,
  discretization: Discretization = 'backward-euler',
): PlannerLimits {
  const plant = plantOf(rig)
  const range = beamAngleRange(rig)
  const peakU = analysis?.step.peakCommandPerMeter ?? null
  const peakRate = analysis?.step.peakServoRatePerMeter ?? null
  // The usable command range: the servo's travel, or the linkage's fold point if that comes first.
  const usable = Math.min(Math.abs(range.maxAtServoAngle), Math.abs(range.minAtServoAngle))
  const maxStepTravel = peakU !== null && peakU > 0 ? usable / peakU : null
  const maxStepSlew = peakRate !== null && peakRate > 0 ? plant.slewLimit / peakRate : null
  const maxStep
    = maxStepTravel === null
      ? maxStepSlew
      : maxStepSlew === null
        ? maxStepTravel
        : Math.min(maxStepTravel, maxStepSlew)
  const jump = (gains.kp * (1 + gains.n)) / plant.countsPerMeter
  const tf = filterTimeConstant(gains.kp, gains.kd, gains.n)
  const { b } = derivativeCoefficients(gains.kd, tf, plant.period, discretization)
  const alphaLimit = Math.min(Math.abs(range.max), Math.abs(range.min))
  return {
    maxStepTravel,
    maxStepSlew,
    maxStep,
    servoHalfTravel: plant.halfTravel,
    usableServoTravel: usable,
    servoSlewLimit: plant.slewLimit,
    beamAngleLimit: alphaLimit,
    beamAngleLimitSmallAngle: range.smallAngle,
    linkageReachable: range.reachable,
    maxBallAcceleration: plant.eta * plant.gravity * Math.sin(Math.min(alphaLimit, Math.PI / 2)),
    servoJumpPerCount: jump,
    servoJumpPerCountDeg: jump * DEG,
    servoJumpPerCountFirmwareDeg: ((gains.kp + b) * DEG) / plant.countsPerMeter,
  }
}
