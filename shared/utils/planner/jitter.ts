// Sensor noise to servo jitter: the ADC's noise with the ball still, through the controller,
// as the servo command's spread; and how the derivative filter N trades jitter against phase.
// CONTRACT STUB: proportional path only.
import { plantOf } from './plant'
import type { Discretization, Gains, Rig } from './schema'

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
  /** The same loop with other derivative filters, for the trade-off. */
  byFilter: JitterAtN[]
}

export function servoJitter(
  rig: Rig,
  gains: Gains,
  _options: { discretization?: Discretization } = {},
): ServoJitter | null {
  const noise = rig.adcNoiseCounts
  if (!noise) return null
  const ks = plantOf(rig).countsPerMeter
  const rmsDeg = (gains.kp * (noise / ks) * 180) / Math.PI
  return {
    noiseCounts: noise,
    rmsDeg,
    rmsUs: rmsDeg * (rig.servoUsPerDeg ?? 1000 / 90),
    peakToPeakDeg: 6 * rmsDeg,
    byFilter: [],
  }
}
