// Sensor noise to servo jitter: the ADC's noise with the ball still, through the controller the
// firmware runs, as the servo command's spread; and how the derivative filter N trades that
// jitter against phase margin (docs/planner-model.md, "Servo jitter").
// White reading noise of σ_n counts gives a command of σ_u = σ_n·sqrt(Σ h_k²), h the impulse
// response of the controller from the reading to the command (the exported constants):
//   h_0 = Kp + b,   h_k = b·(a − 1)·a^(k−1) for k ≥ 1,
//   Σ h_k² = (Kp + b)² + b²·(1 − a)/(1 + a).
// The integral term is left out: its response to one reading never decays on its own (the loop
// bounds it), and at the noise's frequencies it is tiny beside Kp and the derivative.
import { actuatorOf } from './actuator'
import { analyzeLoop } from './analyze'
import { firmwareConstants } from './firmware'
import { plantOf } from './plant'
import type { Discretization, Gains, Rig } from './schema'

const DEG = 180 / Math.PI

/** The filters the trade-off is shown for. */
export const JITTER_FILTERS = [2, 5, 10, 20] as const

export interface JitterAtN {
  n: number
  /** RMS servo command, degrees. */
  rmsDeg: number
  /** Phase margin with that N, degrees; null when unstable. */
  phaseMarginDeg: number | null
}

export interface ServoJitter {
  noiseCounts: number
  rmsDeg: number
  rmsUs: number
  /** About ±3 σ, degrees peak to peak. */
  peakToPeakDeg: number
  /** The proportional term's share alone (Kp·σ), degrees RMS. */
  proportionalRmsDeg: number
  /** The derivative filter N of these gains. */
  n: number
  /** The same loop with other derivative filters, for the trade-off. */
  byFilter: JitterAtN[]
}

/** RMS command per RMS reading noise (both in the model's units) of the exported controller. */
export function noiseGain(rig: Rig, gains: Gains, discretization?: Discretization): number {
  const fw = firmwareConstants(rig, gains, { discretization })
  const h0 = gains.kp + fw.b
  return Math.sqrt(h0 * h0 + (fw.b * fw.b * (1 - fw.a)) / (1 + fw.a))
}

export function servoJitter(
  rig: Rig,
  gains: Gains,
  options: { discretization?: Discretization } = {},
): ServoJitter | null {
  const noise = rig.adcNoiseCounts
  if (!noise) return null
  const sigma = noise / plantOf(rig).countsPerMeter // m
  const usPerDeg = actuatorOf(rig).usPerRad / DEG
  const rmsOf = (g: Gains) => noiseGain(rig, g, options.discretization) * sigma * DEG
  const rmsDeg = rmsOf(gains)
  const byFilter = JITTER_FILTERS.map((n) => {
    const g = { ...gains, n }
    return {
      n,
      rmsDeg: rmsOf(g),
      phaseMarginDeg: analyzeLoop(rig, g, { discretization: options.discretization })
        .phaseMarginDeg,
    }
  })
  return {
    noiseCounts: noise,
    rmsDeg,
    rmsUs: rmsDeg * usPerDeg,
    peakToPeakDeg: 6 * rmsDeg,
    proportionalRmsDeg: gains.kp * sigma * DEG,
    n: gains.n,
    byFilter,
  }
}
