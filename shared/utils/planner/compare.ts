// P only next to PD (docs/planner-model.md §3): on K_b/s² a P controller swings for ever at
// √(K_b·Kp);
// with the servo's lag and the loop's delay every swing grows. The growth rate is read from
// the dominant pole of the sampled loop.
import { analyzePlantLoop, sampledLoopOf, type LoopAnalysis } from './analyze'
import { designGains } from './design'
import { plantOf } from './plant'
import { polynomialRoots } from './roots'
import {
  sampledCharacteristicW,
  sampledStepResponse,
  type SampledLoop,
  type StepResponse,
} from './sampled'
import type { Gains, Rig, Targets } from './schema'

export interface ProportionalOscillation {
  /** √(K_b·Kp): the undamped swing without any lag, rad/s. */
  idealFrequency: number
  /** 2π/idealFrequency, s. */
  idealPeriod: number
  /** Growth rate of the swing with lag and sampling, 1/s (> 0: it grows). */
  growthRate: number
  /** Swing frequency with lag and sampling, rad/s. */
  frequency: number
  /** Time for the swing to double, s; null if it does not grow. */
  doublingTime: number | null
}

/**
 * The dominant closed-loop pole of P control. With a loop period T > 0 it is the pole of the
 * sampled loop itself (its characteristic polynomial, roots by Aberth's method, s = ln z / T);
 * with T = 0 the continuous loop K_b·Kp/(s²(τ_s s + 1)), roots of τ_s s³ + s² + K_b·Kp.
 */
export function proportionalOscillation(
  kb: number,
  kp: number,
  servoLag: number,
  period: number,
): ProportionalOscillation {
  const w0 = Math.sqrt(kb * kp)
  let growthRate = 0
  let frequency = w0
  if (period > 0) {
    const loop: SampledLoop = {
      kb,
      servoLag,
      period,
      kp,
      ki: 0,
      kd: 0,
      tf: 0,
      derivativeOn: 'measurement',
      discretization: 'backward-euler',
    }
    let best = -Infinity
    for (const w of polynomialRoots(sampledCharacteristicW(loop))) {
      const zr = 1 + w.re
      const rate = Math.log(Math.hypot(zr, w.im)) / period
      const freq = Math.abs(Math.atan2(w.im, zr)) / period
      if (rate > best || (rate === best && freq > frequency)) {
        best = rate
        growthRate = rate
        frequency = freq
      }
    }
  } else if (servoLag > 0) {
    let best = -Infinity
    for (const s of polynomialRoots([servoLag, 1, 0, kb * kp])) {
      if (s.re > best) {
        best = s.re
        growthRate = s.re
        frequency = Math.abs(s.im)
      }
    }
  }
  return {
    idealFrequency: w0,
    idealPeriod: (2 * Math.PI) / w0,
    growthRate,
    frequency,
    doublingTime: growthRate > 0 ? Math.LN2 / growthRate : null,
  }
}

export interface ControllerShowing {
  gains: Gains | null
  analysis: LoopAnalysis | null
  /** Linear sampled response to a 1 m step (scale by the real step), for plotting. */
  response: StepResponse | null
}

export interface ProportionalVsPd {
  pOnly: ControllerShowing & { oscillation: ProportionalOscillation }
  pd: ControllerShowing
  /** Length of the plotted responses, s. */
  duration: number
}

/**
 * The suggested PD next to P only with the same Kp (or Kp = ω_n²/K_b when no PD suggestion
 * exists), both as the sampled loop responds to a unit step.
 */
export function compareProportionalAndPd(
  rig: Rig,
  targets: Targets,
  duration?: number,
): ProportionalVsPd {
  const plant = plantOf(rig)
  const pdTargets: Targets = { ...targets, form: 'PD' }
  const design = designGains(plant, pdTargets)
  const kp = design.kp ?? (design.wn * design.wn) / plant.kb
  const oscillation = proportionalOscillation(plant.kb, kp, plant.servoLag, plant.period)
  const length = duration ?? Math.max(3 * targets.settlingTime, 2 * oscillation.idealPeriod)
  const pGains: Gains = {
    kp,
    kd: 0,
    ki: 0,
    n: targets.derivativeFilterN,
    derivativeOn: targets.derivativeOn,
  }
  const pOnly = {
    gains: pGains,
    analysis: analyzePlantLoop(plant, pGains),
    response: sampledStepResponse(sampledLoopOf(plant, pGains), length),
    oscillation,
  }
  let pd: ControllerShowing = { gains: null, analysis: null, response: null }
  if (design.feasible && design.kp !== null && design.kd !== null) {
    const g: Gains = {
      kp: design.kp,
      kd: design.kd,
      ki: 0,
      n: targets.derivativeFilterN,
      derivativeOn: targets.derivativeOn,
    }
    pd = {
      gains: g,
      analysis: analyzePlantLoop(plant, g),
      response: sampledStepResponse(sampledLoopOf(plant, g), length),
    }
  }
  return { pOnly, pd, duration: length }
}
