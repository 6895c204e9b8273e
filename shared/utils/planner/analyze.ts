// Checking a set of gains (docs/planner-model.md §4): exact stability, margins and step metrics of
// the sampled loop the firmware runs; the continuous stand-in (the loop with its 1.5·T delay) is
// kept as a secondary line.
import { filterTimeConstant } from './design'
import { analyzeFrequency, closedLoopBandwidth, type LoopParams } from './frequency'
import { fmt } from './format'
import { plantOf, type Plant } from './plant'
import {
  diskStable,
  sampledCharacteristicW,
  sampledMargins,
  sampledResponseOf,
  sampledStepMetrics,
  type SampledLoop,
  type SampledMargins,
} from './sampled'
import type { Discretization, Gains, Rig } from './schema'

/**
 * The verdict on one set of gains. JSON-safe: every "none" or "unbounded" is null, never
 * Infinity or NaN (gainMarginDb null = no phase crossover, i.e. unbounded gain margin).
 */
export interface LoopAnalysis {
  /**
   * Every root of the sampled loop inside the unit circle, its margins positive, and its step
   * response does not diverge.
   */
  stable: boolean
  /** The continuous stand-in passes the Nyquist test (secondary). */
  nyquistStable: boolean
  /** Every root of the sampled loop's characteristic polynomial inside the unit circle. */
  sampledStable: boolean
  /**
   * The sampled loop's margins (below). All null when the loop is unstable: an unstable loop has
   * no margin, `explanation` says why.
   * dB a common rise of Kp, Kd and Ki tolerates; null = unbounded or unstable.
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
  /** Extra delay tolerated, s; null = no gain crossover or unstable. */
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
  /**
   * Whole extra samples of delay in the sampled loop (stability, margins, step); default 0. Meant
   * for a few samples (the what-if envelope uses one): the root test expands (w + 1)^m, which
   * loses precision past a few tens.
   */
  extraDelaySamples?: number
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
  extraDelaySamples = 0,
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
    extraDelaySamples,
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

export function analyzePlantLoop(
  plant: Plant,
  gains: Gains,
  options: AnalyzeOptions = {},
): LoopAnalysis {
  const loop = loopParamsOf(plant, gains)
  const sampled = sampledLoopOf(plant, gains, options.discretization, options.extraDelaySamples)
  const f = analyzeFrequency(loop)
  const sampledOk = diskStable(sampledCharacteristicW(sampled))
  const m = sampledMargins(sampledResponseOf(sampled))
  let stable
    = sampledOk
      && (m.gainMarginDb === null || m.gainMarginDb > 0)
      && (m.phaseMarginDeg === null || m.phaseMarginDeg > 0)
  let step = UNSTABLE_STEP
  let bandwidth: number | null = null
  if (stable) {
    const sm = sampledStepMetrics(sampled, {
      horizon: options.horizon,
      scaleFrequency: m.gainCrossover ?? f.gainCrossover ?? undefined,
    })
    if (sm.diverged) stable = false
    else {
      step = {
        overshootPct: sm.overshootPct,
        settlingTime: sm.settlingTime,
        peakTime: sm.peakTime,
        peakCommandPerMeter: sm.peakCommand,
        peakServoRatePerMeter: sm.peakServoRate,
      }
      bandwidth = f.gainCrossovers.length > 0
        ? closedLoopBandwidth(loop, f.gainCrossovers[0])
        : null
    }
  }
  return {
    stable,
    nyquistStable: f.nyquistStable,
    sampledStable: sampledOk,
    gainMarginDb: stable ? m.gainMarginDb : null,
    gainReductionMarginDb: stable ? m.gainReductionMarginDb : null,
    phaseMarginDeg: stable ? m.phaseMarginDeg : null,
    gainCrossover: stable ? m.gainCrossover : null,
    phaseCrossover: stable ? m.phaseCrossover : null,
    delayMargin: stable ? m.delayMargin : null,
    closedLoopBandwidth: bandwidth,
    continuous: {
      gainMarginDb: f.nyquistStable ? f.gainMarginDb : null,
      phaseMarginDeg: f.nyquistStable ? f.phaseMarginDeg : null,
      delayMargin: f.nyquistStable ? f.delayMargin : null,
    },
    sensitivityPeak: stable ? m.sensitivityPeak : null,
    explanation: stable ? null : explainUnstable(plant, gains, m, sampledOk),
    step,
  }
}

/** Why a loop is unstable, in plain words: which check failed and what the rig would do. */
export function explainUnstable(
  plant: Plant,
  gains: Gains,
  m: SampledMargins,
  rootsInside: boolean,
): string {
  if (!(gains.kp > 0)) {
    return 'Kp must be above 0: with no pull back towards the setpoint (or a push away from it) '
      + 'the ball rolls to the end of the beam and stays there.'
  }
  if (!(gains.kd > 0)) {
    return 'With no derivative term nothing slows the ball as it nears the setpoint: it swings '
      + 'through and back for ever, and the servo\'s lag and the loop\'s delay make each swing '
      + 'bigger. Add Kd (choose PD).'
  }
  // The crossing of the negative real axis outside −1 nearest it tells the way to go: below
  // the gain crossover the loop lacks lead (too little damping), above it the gains are too high.
  let above: { frequency: number, magnitude: number } | null = null
  for (const c of m.phaseCrossovers) {
    if (c.magnitude > 1 && (above === null || c.magnitude < above.magnitude)) above = c
  }
  const head = rootsInside
    ? 'The check finds no safety margin at all: '
    : 'The loop the firmware runs is unstable: '
  const swing = (w: number) => {
    const f = w / (2 * Math.PI)
    return f >= 1
      ? `about ${fmt(f)} times a second`
      : `about once every ${fmt(1 / f)} s`
  }
  const highest = m.gainCrossovers.length > 0 ? Math.max(...m.gainCrossovers) : null
  const lowSide = above !== null && (highest === null || above.frequency < highest)
  if (above !== null && lowSide) {
    if (gains.ki > 0 && above.frequency < 0.5 * (m.gainCrossovers[0] ?? Infinity)) {
      return head + `the integral term is too strong for Kp and Kd, so the ball sways slowly `
        + `(${swing(above.frequency)}), further each time. Lower Ki or raise Kp and Kd.`
    }
    return head + `the ball swings back and forth (${swing(above.frequency)}), further each `
      + 'time: at that pace the servo\'s lag, the derivative filter and the loop\'s delay '
      + `(${fmt(plant.effectiveLag * 1000)} ms without the filter) turn the correction around, `
      + 'so it pushes the swing instead of damping it. Start again from the suggested gains; '
      + 'the stability map shows which Kp and Kd keep the loop stable.'
  }
  if (above !== null) {
    return head + `the gains are too high for the servo's lag and the loop's delay `
      + `(${fmt(plant.effectiveLag * 1000)} ms together): the servo overcorrects and the ball `
      + `shakes back and forth (${swing(above.frequency)}), further each time. Lower Kp and Kd, `
      + 'or use a faster servo or loop rate.'
  }
  if (m.phaseMarginDeg !== null && m.phaseMarginDeg <= 0) {
    return head + 'where the loop\'s gain falls to 1 the servo\'s lag and the loop\'s delay '
      + 'have used up all the lead the derivative gives, so the ball swings further each time. '
      + 'Start again from the suggested gains; the stability map shows which Kp and Kd keep the '
      + 'loop stable.'
  }
  return head + 'the ball would swing further each time, or run off to one end. Check the gains.'
}
