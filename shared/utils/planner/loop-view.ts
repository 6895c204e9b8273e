// The loop's frequency response for the page's loop view: magnitude and phase of the loop the
// firmware runs, the crossovers and the sensitivity peak Ms.
// CONTRACT STUB: evaluates the continuous stand-in; to be replaced by the discrete loop.
import { loopParamsOf } from './analyze'
import { analyzeFrequency, loopMagnitude2, loopPhase } from './frequency'
import { plantOf } from './plant'
import type { Discretization, Gains, Rig } from './schema'

export interface LoopView {
  /** rad/s, ascending, up to the Nyquist frequency π/T. */
  w: number[]
  magnitudeDb: number[]
  phaseDeg: number[]
  /** rad/s; null = none. */
  gainCrossover: number | null
  phaseCrossover: number | null
  /** max |1/(1 + L)| over frequency; null when the loop is unstable. */
  sensitivityPeak: number | null
  /** rad/s where Ms occurs. */
  sensitivityPeakFrequency: number | null
  /** π/T, rad/s. */
  nyquistFrequency: number
}

export interface LoopViewOptions {
  discretization?: Discretization
  /** Points on the frequency axis; default 200. */
  points?: number
}

export function loopView(rig: Rig, gains: Gains, options: LoopViewOptions = {}): LoopView {
  const plant = plantOf(rig)
  const p = loopParamsOf(plant, gains)
  const f = analyzeFrequency(p)
  const nyquist = Math.PI / plant.period
  const n = options.points ?? 200
  const lo = nyquist / 1e4
  const out: LoopView = {
    w: [],
    magnitudeDb: [],
    phaseDeg: [],
    gainCrossover: f.gainCrossover,
    phaseCrossover: f.phaseCrossover,
    sensitivityPeak: null,
    sensitivityPeakFrequency: null,
    nyquistFrequency: nyquist,
  }
  for (let i = 0; i < n; i++) {
    const w = lo * (nyquist / lo) ** (i / (n - 1))
    out.w.push(w)
    out.magnitudeDb.push(10 * Math.log10(loopMagnitude2(p, w)))
    out.phaseDeg.push((loopPhase(p, w) * 180) / Math.PI)
  }
  return out
}
