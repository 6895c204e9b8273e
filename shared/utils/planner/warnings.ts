// The planner's warnings (docs/planner-model.md §3–4). Codes are stable (pages and tests key on
// them);
// messages are for a student at the bench, in plain words with the numbers that matter.
import type { LoopAnalysis } from './analyze'
import type { GainDesign } from './design'
import { fmt } from './format'
import { beamAngleRange } from './geometry'
import type { PlannerLimits } from './limits'
import type { Plant } from './plant'
import type { Gains, Rig, Targets } from './schema'

export const WARNING_CODES = [
  'targets-infeasible',
  'p-only-cannot-settle',
  'real-pole-close',
  'suggestion-unstable',
  'low-gain-margin',
  'low-phase-margin',
  'targets-missed',
  'step-exceeds-travel',
  'step-exceeds-slew',
  'servo-jump-per-count',
  'loop-rate-low',
  'servo-too-slow',
  'analog-servo-frame',
  'analog-servo-delay',
  'ball-not-sensed',
  'linkage-unreachable',
  'ideal-ignores-lag',
  'derivative-on-error',
  'integral-windup',
  'tustin-refused',
] as const

export type WarningCode = (typeof WARNING_CODES)[number]

export interface PlannerWarning {
  code: WarningCode
  /**
   * info: worth knowing; warning: the rig will behave worse than planned; danger: no gains to
   * load; error: an input makes the plan unusable on a real rig (a linkage that cannot be built,
   * a ball the sensor cannot see). The page never shows a green verdict beside an error.
   */
  severity: 'info' | 'warning' | 'danger' | 'error'
  message: string
}

/** Thresholds of the rules of thumb (common practice; Franklin, Powell & Workman for sampling). */
export const THRESHOLDS = {
  gainMarginDb: 6,
  phaseMarginDeg: 30,
  /** p3 must be at least this many times ζω_n to be ignored. */
  realPoleRatio: 5,
  /** Sample rate at least this many times the closed-loop bandwidth (20–30×). */
  samplesPerBandwidth: 20,
  samplesPerBandwidthComfortable: 30,
  /**
   * Servo bandwidth this many times the ball loop's: below 5× the lag shapes the response (a
   * warning); 10× or more is comfortable (common practice).
   */
  servoBandwidthRatio: 5,
  servoBandwidthRatioComfortable: 10,
  /** Servo degrees per count of sensor noise above which the servo visibly chatters. */
  servoJumpDeg: 2,
  /** An analog servo takes a new pulse about every 20 ms. */
  analogServoFrame: 0.02,
  /** Predicted settling this much slower than the target counts as missed. */
  settlingSlack: 1.2,
  /** Predicted overshoot this many percentage points over the target counts as missed. */
  overshootSlackPct: 5,
} as const

const DEG = 180 / Math.PI
const ms = (s: number) => `${fmt(s * 1000)} ms`
const mm = (m: number) => `${fmt(m * 1000)} mm`
const hz = (w: number) => w / (2 * Math.PI)

export interface WarningContext {
  rig: Rig
  targets: Targets
  plant: Plant
  design: GainDesign
  gains: Gains | null
  /** Gains the formulas gave but the check found unstable. */
  rejectedGains?: Gains | null
  /** The check of rejectedGains (its explanation says what failed). */
  rejectedAnalysis?: LoopAnalysis | null
  analysis: LoopAnalysis | null
  limits: PlannerLimits | null
  /** The setpoint step the builder plans, m. */
  stepSize: number
}

export function collectWarnings(ctx: WarningContext): PlannerWarning[] {
  const { rig, targets, plant, design, gains, analysis, limits } = ctx
  const out: PlannerWarning[] = []
  const add = (code: WarningCode, severity: PlannerWarning['severity'], message: string) =>
    out.push({ code, severity, message })

  if (rig.ballMaterial === 'glass' || rig.ballMaterial === 'plastic') {
    add(
      'ball-not-sensed',
      'error',
      `A ${rig.ballMaterial} ball does not conduct, so the resistive two-rail sensor cannot `
      + `see it: the reading `
      + 'stays at 0 or at full scale wherever the ball is. Use a steel ball.',
    )
  }

  if (targets.form === 'P') {
    const kp = (design.wn * design.wn) / plant.kb
    const w = Math.sqrt(plant.kb * kp)
    add(
      'p-only-cannot-settle',
      'danger',
      `A P-only controller cannot settle a ball on a beam. With no lag at all it swings for ever `
      + `(Kp = ${fmt(kp)} rad/m would swing at ${fmt(w)} rad/s, one swing every `
      + `${fmt((2 * Math.PI) / w)} s); `
      + `the servo's lag and the loop's delay (${ms(plant.effectiveLag)} together) make every `
      + `swing bigger. `
      + 'The drawn response shows that swing. Add a derivative term: choose PD.',
    )
  } else if (!design.feasible) {
    const fastest = design.fastestSettlingTime
    const rec = design.recommendedSettlingTime
    add(
      'targets-infeasible',
      'danger',
      `No gains can make this rig settle in ${fmt(targets.settlingTime)} s. The servo and the `
      + `loop add about `
      + `${ms(plant.effectiveLag)} of lag`
      + (fastest !== null
        ? `, and nothing settles faster than about ${fmt(fastest)} s with that lag`
        : '')
      + '. '
      + (rec !== null
        ? `Ask for ${fmt(rec)} s or more, or use a faster servo or a higher loop rate.`
        : 'The integral pole asked for is too fast for this lag; use a smaller one.'),
    )
  }

  if (design.feasible && design.p3 !== null) {
    const sigma = design.zeta * design.wn
    if (design.p3 < THRESHOLDS.realPoleRatio * sigma) {
      add(
        'real-pole-close',
        'warning',
        `This settling time is close to what the servo and loop rate can do. The planner's `
        + `third pole `
        + `(${fmt(design.p3)} rad/s) is less than ${THRESHOLDS.realPoleRatio} × ζω_n `
        + `(${fmt(THRESHOLDS.realPoleRatio * sigma)} rad/s), `
        + 'so the real ball will move more slowly and wobble more than the targets say.'
        + (design.recommendedSettlingTime !== null
          ? ` ${fmt(design.recommendedSettlingTime)} s or more gives a cleaner result.`
          : ''),
      )
    }
  }

  if (ctx.rejectedGains) {
    add(
      'suggestion-unstable',
      'danger',
      `The formulas give gains for ${fmt(targets.settlingTime)} s, but the check of the loop `
      + 'the firmware runs (with the real delays, the derivative filter and the sampling) finds '
      + 'them unstable. '
      + (ctx.rejectedAnalysis?.explanation ?? 'The ball would swing further every time.')
      + ' No gains are suggested. '
      + (targets.method === 'ideal' ? 'Use the lag-aware method, ask' : 'Ask')
      + ' for a longer settling time or less overshoot, '
      + `or raise the derivative filter N (now ${fmt(targets.derivativeFilterN)}).`,
    )
  }

  if (gains !== null && targets.method === 'ideal') {
    add(
      'ideal-ignores-lag',
      'info',
      `The ideal method ignores the servo's lag and the loop's delay `
      + `(${ms(plant.effectiveLag)} together). `
      + 'The lag-aware method accounts for them and is the safer starting point.',
    )
  }

  if (gains !== null && analysis !== null) {
    if (analysis.stable) {
      const gm = analysis.gainMarginDb
      if (gm !== null && gm < THRESHOLDS.gainMarginDb) {
        add(
          'low-gain-margin',
          'warning',
          `The gain margin is only ${fmt(gm, 2)} dB (aim for ${THRESHOLDS.gainMarginDb} dB or `
          + `more): if the rig is just `
          + `${fmt(10 ** (gm / 20), 2)} × livelier than measured — a longer horn, a different `
          + `ball — it starts to oscillate.`,
        )
      }
      const pm = analysis.phaseMarginDeg
      if (pm !== null && pm < THRESHOLDS.phaseMarginDeg) {
        add(
          'low-phase-margin',
          'warning',
          `The phase margin is only ${fmt(pm, 2)}° (aim for ${THRESHOLDS.phaseMarginDeg}° or `
          + `more): the ball will ring `
          + 'after every move'
          + (analysis.delayMargin !== null
            ? `, and ${ms(analysis.delayMargin)} more delay would make it unstable.`
            : '.'),
        )
      }
      const os = analysis.step.overshootPct
      const ts = analysis.step.settlingTime
      const slowMiss = ts === null || ts > THRESHOLDS.settlingSlack * targets.settlingTime
      const osMiss = os !== null && os > targets.overshootPct + THRESHOLDS.overshootSlackPct
      if (slowMiss || osMiss) {
        add(
          'targets-missed',
          'warning',
          `The predicted response misses the targets: ${os === null ? '?' : fmt(os, 2)} % `
          + `overshoot and `
          + (ts === null ? 'no settling' : `settling in ${fmt(ts)} s`)
          + `, against ${fmt(targets.overshootPct)} % and ${fmt(targets.settlingTime)} s asked for.`
          + (targets.form === 'PID' && osMiss
            ? ' The integral term adds a zero to the response that the placement cannot '
            + 'cancel, and moving ζ, ω_n and the integral pole on the exact model did not meet '
            + 'both targets. Allow more overshoot or a longer settling time, or use PD and '
            + 'add a small Ki by hand.'
            : ''),
        )
      }

      const bw = analysis.closedLoopBandwidth
      if (bw !== null) {
        const fBw = hz(bw)
        if (rig.loopRate < THRESHOLDS.samplesPerBandwidth * fBw) {
          add(
            'loop-rate-low',
            'warning',
            `The loop runs at ${fmt(rig.loopRate)} Hz, only ${fmt(rig.loopRate / fBw, 2)} × the `
            + `ball loop's bandwidth (${fmt(fBw)} Hz). Sample at least `
            + `${THRESHOLDS.samplesPerBandwidth} × faster than that `
            + `(${fmt(THRESHOLDS.samplesPerBandwidth * fBw)} Hz or more; `
            + `${THRESHOLDS.samplesPerBandwidthComfortable} × is comfortable), or ask for a slower `
            + `response.`,
          )
        }
        const servoBw = 1 / plant.servoLag
        const ratio = servoBw / bw
        if (ratio < THRESHOLDS.servoBandwidthRatio) {
          add(
            'servo-too-slow',
            'warning',
            `The servo (about ${fmt(hz(servoBw))} Hz) is only ${fmt(ratio, 2)} × faster than `
            + `the ball loop (${fmt(fBw)} Hz); `
            + `${THRESHOLDS.servoBandwidthRatioComfortable} × or more is comfortable. `
            + 'Expect a slower, wobblier response than planned; a faster servo or a longer '
            + 'settling time helps.',
          )
        }
      }

      if (
        (rig.servoType ?? 'analog') === 'analog'
        && analysis.delayMargin !== null
        && analysis.delayMargin < THRESHOLDS.analogServoFrame
      ) {
        add(
          'analog-servo-delay',
          'warning',
          `This loop tolerates only ${ms(analysis.delayMargin)} of extra delay, and an analog `
          + `servo's 20 ms update `
          + 'can add that much. Use a digital servo or ask for a longer settling time.',
        )
      }
    }

    if (targets.derivativeOn === 'error' && gains.kd > 0) {
      add(
        'derivative-on-error',
        'info',
        'The derivative acts on the error, so every setpoint step kicks the servo and the '
        + 'extra zero raises the overshoot'
        + (analysis.step.overshootPct !== null
          ? ` (${fmt(analysis.step.overshootPct, 2)} % predicted)`
          : '')
        + '. Derivative on measurement avoids both.',
      )
    }
    if (gains.ki > 0) {
      add(
        'integral-windup',
        'info',
        'With an integral term, stop integrating while the servo sits at its limit '
        + '(anti-windup), or the ball '
        + 'overshoots badly after a big move.',
      )
    }
  }

  if ((rig.servoType ?? 'analog') === 'analog' && rig.loopRate > 1 / THRESHOLDS.analogServoFrame) {
    add(
      'analog-servo-frame',
      'info',
      `Analog hobby servos only take a new position about every 20 ms (50 Hz), so running the `
      + `loop at `
      + `${fmt(rig.loopRate)} Hz does not make them faster, and they add up to 20 ms more delay `
      + `than planned.`,
    )
  }

  if (limits !== null && gains !== null) {
    if (limits.maxStepTravel !== null && ctx.stepSize > limits.maxStepTravel) {
      add(
        'step-exceeds-travel',
        'warning',
        `A ${mm(ctx.stepSize)} setpoint step asks the servo for more than the `
        + `±${fmt(limits.usableServoTravel * DEG)}° it can usefully turn; `
        + `the largest step that stays inside is about ${mm(limits.maxStepTravel)}. Bigger steps `
        + `hit the end stop and `
        + 'overshoot more than predicted.',
      )
    }
    if (limits.maxStepSlew !== null && ctx.stepSize > limits.maxStepSlew) {
      add(
        'step-exceeds-slew',
        ctx.stepSize > 2 * limits.maxStepSlew ? 'warning' : 'info',
        `A ${mm(ctx.stepSize)} step needs the servo to turn faster than its `
        + `${fmt(limits.servoSlewLimit * DEG)} °/s; `
        + `the largest step it can follow is about ${mm(limits.maxStepSlew)}. Bigger steps are `
        + `slower and overshoot more.`,
      )
    }
    if (limits.servoJumpPerCountDeg > THRESHOLDS.servoJumpDeg) {
      add(
        'servo-jump-per-count',
        'warning',
        `Each count of sensor noise jolts the servo by about `
        + `${fmt(limits.servoJumpPerCountDeg, 2)}°, so it will twitch `
        + 'and buzz. Lower the derivative filter N, average several ADC readings, or use a '
        + 'finer ADC.',
      )
    }
  }
  if (!beamAngleRange(rig).reachable) {
    add(
      'linkage-unreachable',
      'error',
      'This linkage cannot be built as drawn: with this pushrod length the rod would have to '
      + 'stretch to follow the servo near the ends of its travel, so the servo would stall '
      + 'against it. Change the pushrod length or the lever hole.',
    )
  }
  return out
}
