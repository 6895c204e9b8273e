// The loop's frequency response for the page's loop view (docs/planner-model.md §4): magnitude
// and phase of the sampled loop the firmware runs, L(e^(jωT)) up to the Nyquist frequency π/T,
// its crossovers and the sensitivity peak Ms. The same evaluation as the margins analyzeLoop
// shows (sampledMargins), so the view and the numbers cannot disagree.
import { sampledLoopOf } from './analyze'
import { plantOf } from './plant'
import {
  diskStable,
  sampledCharacteristicW,
  sampledLoopAt,
  sampledMargins,
  sampledResponseOf,
} from './sampled'
import type { Discretization, Gains, Rig } from './schema'

export interface LoopView {
  /** rad/s, ascending, up to the Nyquist frequency π/T. */
  w: number[]
  magnitudeDb: number[]
  /** Unwrapped phase, degrees (−180° − k·360° are the crossings of the negative real axis). */
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
  /** The sampled loop passes the exact root test. */
  stable: boolean
  /** Every gain crossover (|L| = 1), rad/s. */
  gainCrossovers: number[]
  /** Every crossing of the negative real axis, rad/s, with |L| there. */
  phaseCrossovers: { frequency: number, magnitude: number }[]
}

export interface LoopViewOptions {
  discretization?: Discretization
  /** Points on the frequency axis; default 200. */
  points?: number
}

/** Lowest frequency drawn, as a fraction of π/T. */
const VIEW_DECADES = 4

export function loopView(rig: Rig, gains: Gains, options: LoopViewOptions = {}): LoopView {
  const plant = plantOf(rig)
  const loop = sampledLoopOf(plant, gains, options.discretization)
  const s = sampledResponseOf(loop)
  const m = sampledMargins(s)
  const stable = diskStable(sampledCharacteristicW(loop))
  const nyquist = Math.PI / plant.period
  const n = Math.max(2, Math.round(options.points ?? 200))
  const lo = nyquist / 10 ** VIEW_DECADES
  const out: LoopView = {
    w: [],
    magnitudeDb: [],
    phaseDeg: [],
    gainCrossover: m.gainCrossover,
    phaseCrossover: m.phaseCrossover,
    sensitivityPeak: stable ? m.sensitivityPeak : null,
    sensitivityPeakFrequency: stable ? m.sensitivityPeakFrequency : null,
    nyquistFrequency: nyquist,
    stable,
    gainCrossovers: m.gainCrossovers,
    phaseCrossovers: m.phaseCrossovers,
  }
  let prev = 0
  for (let i = 0; i < n; i++) {
    const w = i === n - 1 ? nyquist : lo * (nyquist / lo) ** (i / (n - 1))
    const [re, im] = sampledLoopAt(s, w)
    let ph = Math.atan2(im, re)
    if (i === 0) {
      // The double integrator (and Ki's third) put the low-frequency phase at or below −180°.
      if (ph > 0) ph -= 2 * Math.PI
    } else {
      // unwrap: the step from the previous point is under π on this grid
      ph += 2 * Math.PI * Math.round((prev - ph) / (2 * Math.PI))
    }
    prev = ph
    out.w.push(w)
    out.magnitudeDb.push(10 * Math.log10(re * re + im * im))
    out.phaseDeg.push((ph * 180) / Math.PI)
  }
  return out
}
