// Checking a set of gains (docs/planner-model.md §4): margins on the continuous loop with its 1.5·T
// delay, exact stability of the sampled loop, and step metrics of the sampled loop.
import { filterTimeConstant } from './design'
import {
  analyzeFrequency,
  closedLoopBandwidth,
  type LoopParams,
  type PlantTable,
} from './frequency'
import { plantOf, type Plant } from './plant'
import { diskStable, sampledCharacteristicW, sampledStepMetrics, type SampledLoop } from './sampled'
import type { Discretization, Gains, Rig } from './schema'

/**
 * The verdict on one set of gains. JSON-safe: every "none" or "unbounded" is null, never
 * Infinity or NaN (gainMarginDb null = no phase crossover, i.e. unbounded gain margin).
 */
export interface LoopAnalysis {
  /** Nyquist-stable with the delay, GM > 0 dB, PM > 0°, and the sampled loop does not diverge. */
  stable: boolean
  nyquistStable: boolean
  /** Every root of the sampled loop's characteristic polynomial inside the unit circle. */
  sampledStable: boolean
  /**
   * dB; null = no phase crossover (unbounded). See FrequencyAnalysis for conditionally stable
   * loops.
   */
  gainMarginDb: number | null
  /**
   * dB (≤ 0) a gain reduction tolerated, for loops with a low-frequency phase crossover (PID); else
   * null.
   */
  gainReductionMarginDb: number | null
  /** Degrees; null = no gain crossover. */
  phaseMarginDeg: number | null
  /** rad/s; null = none. */
  gainCrossover: number | null
  /** rad/s; null = none. */
  phaseCrossover: number | null
  /** Extra delay tolerated, s; 0 when unstable; null = no gain crossover. */
  delayMargin: number | null
  /** Closed-loop −3 dB bandwidth, rad/s; null when unstable. */
  closedLoopBandwidth: number | null
  /**
   * The continuous stand-in's margins (the loop with its 1.5·T delay), kept as a secondary line;
   * the top-level margins are those of the sampled loop the firmware runs.
   */
  continuous: {
    gainMarginDb: number | null
    phaseMarginDeg: number | null
    delayMargin: number | null
  }
  /** Sensitivity peak Ms = max |1/(1 + L)|; null when unstable. */
  sensitivityPeak: number | null
  /** Why the loop is unstable, in plain words; null when stable. */
  explanation: string | null
  step: {
    /** % of the step; null when unstable. */
    overshootPct: number | null
    /** 2 % settling time, s; null when unstable or it never settles. */
    settlingTime: number | null
    peakTime: number | null
    /** Largest servo command per metre of setpoint step, rad/m; null when unstable. */
    peakCommandPerMeter: number | null
    /** Largest servo speed per metre of step, rad/(s·m); null when unstable. */
    peakServoRatePerMeter: number | null
  }
}

export interface AnalyzeOptions {
  /** How the firmware discretises the derivative; backward Euler by default. */
  discretization?: Discretization
  /** Step simulation horizon, s (see StepOptions.horizon). */
  horizon?: number
}

export function loopParamsOf(plant: Plant, gains: Gains): LoopParams {
  return {
    kb: plant.kb,
    servoLag: plant.servoLag,
    delay: plant.delay,
    kp: gains.kp,
    ki: gains.ki,
    kd: gains.kd,
    tf: filterTimeConstant(gains.kp, gains.kd, gains.n),
  }
}

export function sampledLoopOf(
  plant: Plant,
  gains: Gains,
  discretization: Discretization = 'backward-euler',
): SampledLoop {
  return {
    kb: plant.kb,
    servoLag: plant.servoLag,
    period: plant.period,
    kp: gains.kp,
    ki: gains.ki,
    kd: gains.kd,
    tf: filterTimeConstant(gains.kp, gains.kd, gains.n),
    derivativeOn: gains.derivativeOn,
    discretization,
  }
}

export function analyzeLoop(rig: Rig, gains: Gains, options: AnalyzeOptions = {}): LoopAnalysis {
  return analyzePlantLoop(plantOf(rig), gains, options)
}

const UNSTABLE_STEP: LoopAnalysis['step'] = {
  overshootPct: null,
  settlingTime: null,
  peakTime: null,
  peakCommandPerMeter: null,
  peakServoRatePerMeter: null,
}

/** Frequency-domain verdict only (no step simulation): what a stability map needs per cell. */
export function quickVerdict(
  loop: LoopParams,
  sampled: SampledLoop,
  table?: PlantTable,
  plantW?: { num: number[], den: number[] },
) {
  const f = analyzeFrequency(loop, table)
  const sampledOk = diskStable(sampledCharacteristicW(sampled, plantW))
  const stable
    = f.nyquistStable
      && sampledOk
      && (f.gainMarginDb === null || f.gainMarginDb > 0)
      && f.phaseMarginDeg !== null
      && f.phaseMarginDeg > 0
  return { f, sampledOk, stable }
}

export function analyzePlantLoop(
  plant: Plant,
  gains: Gains,
  options: AnalyzeOptions = {},
): LoopAnalysis {
  const loop = loopParamsOf(plant, gains)
  const sampled = sampledLoopOf(plant, gains, options.discretization)
  const { f, sampledOk, stable: marginsOk } = quickVerdict(loop, sampled)
  let stable = marginsOk
  let step = UNSTABLE_STEP
  let bandwidth: number | null = null
  if (marginsOk) {
    const m = sampledStepMetrics(sampled, {
      horizon: options.horizon,
      scaleFrequency: f.gainCrossover ?? undefined,
    })
    if (m.diverged) stable = false
    else {
      step = {
        overshootPct: m.overshootPct,
        settlingTime: m.settlingTime,
        peakTime: m.peakTime,
        peakCommandPerMeter: m.peakCommand,
        peakServoRatePerMeter: m.peakServoRate,
      }
      bandwidth = closedLoopBandwidth(loop, f.gainCrossovers[0])
    }
  }
  return {
    stable,
    nyquistStable: f.nyquistStable,
    sampledStable: sampledOk,
    gainMarginDb: f.gainMarginDb,
    gainReductionMarginDb: f.gainReductionMarginDb,
    phaseMarginDeg: f.phaseMarginDeg,
    gainCrossover: f.gainCrossover,
    phaseCrossover: f.phaseCrossover,
    delayMargin: f.delayMargin,
    closedLoopBandwidth: bandwidth,
    continuous: {
      gainMarginDb: f.gainMarginDb,
      phaseMarginDeg: f.phaseMarginDeg,
      delayMargin: f.delayMargin,
    },
    sensitivityPeak: null,
    explanation: null,
    step,
  }
}
