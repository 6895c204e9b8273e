// A stability map over the Kp–Kd plane: per cell the same verdict analyzeLoop gives (Nyquist
// with the delay, GM > 0 dB, PM > 0°, sampled loop stable), plus the margins for contours.
// Work shared by every cell is done once: the plant's phase and magnitude on the frequency grid
// and the plant's sampled transfer function.
import { quickVerdict } from './analyze'
import { filterTimeConstant } from './design'
import { plantTable, type LoopParams } from './frequency'
import { discretizePlantW, plantOf } from './plant'
import type { SampledLoop } from './sampled'
import type { DerivativeSignal, Discretization, Rig } from './schema'

export interface StabilityMapOptions {
  /** [min, max] rad/m. */
  kpRange: [number, number]
  /** [min, max] rad·s/m. */
  kdRange: [number, number]
  /** Derivative filter N for every cell. */
  n: number
  derivativeOn: DerivativeSignal
  /** A fixed Ki for a PID map, rad/(m·s); default 0. */
  ki?: number
  /** Axis spacing; default 'linear'. 'log' needs positive ranges. */
  scale?: 'linear' | 'log'
  discretization?: Discretization
}

export interface StabilityMap {
  /** Column values, rad/m. */
  kp: number[]
  /** Row values, rad·s/m. */
  kd: number[]
  /** stable[row][column] = stable[kd index][kp index]. */
  stable: boolean[][]
  /** Degrees, null where there is no gain crossover; same layout. */
  phaseMarginDeg: (number | null)[][]
  /** dB, null where there is no phase crossover (unbounded); same layout. */
  gainMarginDb: (number | null)[][]
  /** Share of cells that are stable, 0…1. */
  stableFraction: number
}

function axis(range: [number, number], count: number, scale: 'linear' | 'log'): number[] {
  const [lo, hi] = range
  if (count === 1) return [lo]
  const out: number[] = []
  for (let i = 0; i < count; i++) {
    const f = i / (count - 1)
    out.push(scale === 'log' ? lo * (hi / lo) ** f : lo + (hi - lo) * f)
  }
  return out
}

export function stabilityMap(
  rig: Rig,
  options: StabilityMapOptions,
  resolution: number | { kp: number, kd: number } = 60,
): StabilityMap {
  const plant = plantOf(rig)
  const nKp = Math.max(1, Math.round(typeof resolution === 'number' ? resolution : resolution.kp))
  const nKd = Math.max(1, Math.round(typeof resolution === 'number' ? resolution : resolution.kd))
  const scale = options.scale ?? 'linear'
  const kps = axis(options.kpRange, nKp, scale)
  const kds = axis(options.kdRange, nKd, scale)
  const ki = options.ki ?? 0
  const table = plantTable(plant.kb, plant.servoLag, plant.delay)
  const zoh = discretizePlantW(plant.kb, plant.servoLag, plant.period)
  const loop: LoopParams = {
    kb: plant.kb,
    servoLag: plant.servoLag,
    delay: plant.delay,
    kp: 0,
    ki,
    kd: 0,
    tf: 0,
  }
  const sampled: SampledLoop = {
    kb: plant.kb,
    servoLag: plant.servoLag,
    period: plant.period,
    kp: 0,
    ki,
    kd: 0,
    tf: 0,
    derivativeOn: options.derivativeOn,
    discretization: options.discretization ?? 'backward-euler',
  }
  const stable: boolean[][] = []
  const pm: (number | null)[][] = []
  const gm: (number | null)[][] = []
  let count = 0
  for (const kd of kds) {
    const sRow: boolean[] = []
    const pRow: (number | null)[] = []
    const gRow: (number | null)[] = []
    for (const kp of kps) {
      const tf = filterTimeConstant(kp, kd, options.n)
      loop.kp = kp
      loop.kd = kd
      loop.tf = tf
      sampled.kp = kp
      sampled.kd = kd
      sampled.tf = tf
      const v = quickVerdict(loop, sampled, table, zoh)
      sRow.push(v.stable)
      pRow.push(v.f.phaseMarginDeg)
      gRow.push(v.f.gainMarginDb)
      if (v.stable) count++
    }
    stable.push(sRow)
    pm.push(pRow)
    gm.push(gRow)
  }
  return {
    kp: kps,
    kd: kds,
    stable,
    phaseMarginDeg: pm,
    gainMarginDb: gm,
    stableFraction: count / (nKp * nKd),
  }
}
