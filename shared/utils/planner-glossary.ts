// What every result of the Gain Planner means, in plain words, for the page's glossary (each
// entry has an id the results can link to: `#glossary-<id>`). The method behind each is in
// docs/planner-model.md; numbers come from the model's constants, never typed in the words.
import { SOFT_START_SECONDS } from './planner/firmware'
import { LOOP_RATE_RANGE, SETTLING_TIME_MAX } from './planner/schema'
import { THRESHOLDS } from './planner/warnings'
import { RULER_MM } from './planner/calibration'

export interface GlossaryEntry {
  term: string
  /** Anchor, unique, lower-case words joined by hyphens. */
  id: string
  meaning: string
}

const GM = THRESHOLDS.gainMarginDb
const PM = THRESHOLDS.phaseMarginDeg

export const PLANNER_GLOSSARY: GlossaryEntry[] = [
  {
    term: 'Gain margin',
    id: 'gain-margin',
    meaning:
      'How many times stronger the whole controller could push (every gain multiplied by the '
      + 'same number) before the ball starts to swing for ever, given in decibels: 6 dB is about '
      + `twice as strong, 20 dB ten times. Below ${GM} dB a slightly heavier ball or a stiffer `
      + 'linkage can tip the rig into swinging. An unstable loop has no margin to show: the '
      + 'planner says why it is unstable instead.',
  },
  {
    term: 'Phase margin',
    id: 'phase-margin',
    meaning:
      'How much extra lateness the loop could take, in degrees, at the speed where the servo\'s '
      + `push just matches the ball's motion. Below ${PM}° the ball overshoots and rings before it `
      + 'settles; around 45° to 60° it settles calmly.',
  },
  {
    term: 'Margins of the loop the firmware runs',
    id: 'sampled-margins',
    meaning:
      'The margins shown first are worked out for the loop as the microcontroller really runs '
      + 'it: it reads the ball once per sample, computes, and the servo gets the new command one '
      + 'sample later. These are the numbers the warnings use.',
  },
  {
    term: 'Continuous stand-in',
    id: 'continuous-stand-in',
    meaning:
      'A smooth, never-sampled copy of the loop with the same delay, shown as a second line. It '
      + 'is easier to reason about but a little too hopeful: its margins can be a few degrees or '
      + 'decibels better than the real, sampled loop\'s.',
  },
  {
    term: 'Extra delay tolerated',
    id: 'extra-delay',
    meaning:
      'How much longer, in milliseconds, the loop could wait between reading the ball and moving '
      + 'the servo before it would swing for ever. A slow calculation, a print statement in the '
      + 'loop or a servo that takes new pulses late all eat into it.',
  },
  {
    term: 'Designed for ζ·ωn',
    id: 'designed-for',
    meaning:
      'The damping ζ and the natural frequency ωn the gains were worked out for, from the '
      + 'overshoot and the settling time you asked for. ζ·ωn sets how fast the swing dies away: '
      + 'the settling time is about 4 ÷ (ζ·ωn).',
  },
  {
    term: 'Natural frequency ωn',
    id: 'natural-frequency',
    meaning:
      'How fast the ball would swing back and forth, in radians per second, if nothing damped '
      + 'it. Divide by 2π (about 6.28) for swings per second. Higher means a quicker, livelier '
      + 'rig that needs a faster servo and loop.',
  },
  {
    term: 'Damping ζ',
    id: 'damping',
    meaning:
      'How strongly the swing is calmed, from 0 (swings for ever) to 1 (creeps in with no '
      + 'overshoot). Around 0.6 to 0.7 overshoots a little and settles quickly.',
  },
  {
    term: 'Overshoot',
    id: 'overshoot',
    meaning:
      'How far the ball runs past the new setpoint before coming back, as a percentage of the '
      + 'step: 10 % on a 100 mm step means 10 mm past it.',
  },
  {
    term: 'Settling time',
    id: 'settling-time',
    meaning:
      'How long after a setpoint change the ball stays within 2 % of the step of where it should '
      + `be. The planner accepts up to ${SETTLING_TIME_MAX} s: slower than that, friction and `
      + 'a slightly tilted table decide where the ball stops, not the controller.',
  },
  {
    term: 'Bandwidth',
    id: 'bandwidth',
    meaning:
      'The fastest back-and-forth setpoint the ball can still follow well. The servo should be '
      + `${THRESHOLDS.servoBandwidthRatioComfortable} times faster than this or more to be `
      + 'comfortable, and the loop should sample at least '
      + `${THRESHOLDS.samplesPerBandwidth} times faster.`,
  },
  {
    term: 'Sensitivity peak Ms',
    id: 'sensitivity-peak',
    meaning:
      'How much the loop can magnify a bump or a wobble at its worst speed. 1 means never; '
      + 'below about 1.5 is calm, about 2 is lively, and much above 2 the ball will ring after '
      + 'every knock. It is one number that sums up both margins.',
  },
  {
    term: 'Gain crossover',
    id: 'gain-crossover',
    meaning:
      'In the loop view, the speed (frequency) where the loop\'s push has fallen to exactly the '
      + 'size of the ball\'s motion. The phase margin is read there. Roughly, the rig cannot '
      + 'react to anything much faster than this.',
  },
  {
    term: 'Phase crossover',
    id: 'phase-crossover',
    meaning:
      'In the loop view, the speed where the loop is exactly half a swing late (−180°). The gain '
      + 'margin is read there: if the push were that much stronger at that speed, the ball would '
      + 'swing for ever.',
  },
  {
    term: 'Soft start',
    id: 'soft-start',
    meaning:
      `For the first ${SOFT_START_SECONDS} s after power-up the firmware eases the servo command `
      + 'in from almost nothing to full, and it starts the derivative from the first reading, so '
      + 'the beam does not jerk and throw the ball. The drawn response starts the same way.',
  },
  {
    term: 'Derivative filter N',
    id: 'derivative-filter',
    meaning:
      'The derivative reacts to how fast the ball moves, which also makes it react to sensor '
      + 'noise. N smooths it: a small N means a calmer servo but a later reaction (less phase '
      + 'margin); a large N reacts sooner but passes more noise to the servo as jitter.',
  },
  {
    term: 'Backward Euler and Tustin',
    id: 'discretization',
    meaning:
      'Two recipes for turning the smooth derivative into arithmetic the microcontroller does '
      + 'once per sample. Backward Euler always works. Tustin is a little closer to the smooth '
      + 'version but only works when the derivative filter is at least half a sample long; '
      + 'otherwise the planner uses backward Euler and says so. The margins and the drawn '
      + 'response use the recipe in the exported constants.',
  },
  {
    term: 'Servo deadband',
    id: 'servo-deadband',
    meaning:
      'The smallest change of pulse, in microseconds, the servo ignores. Inside it the servo does '
      + 'not move, so the ball drifts a little, then the servo jumps: the ball hunts slowly back '
      + 'and forth around the setpoint instead of stopping.',
  },
  {
    term: 'Servo output steps',
    id: 'servo-steps',
    meaning:
      'The firmware can only send whole steps of pulse: whole degrees, or whole microseconds. '
      + 'Whole degrees are coarse and can make the ball hunt around the setpoint; microseconds '
      + 'are about ten times finer. The constants are given in both.',
  },
  {
    term: 'Servo jitter',
    id: 'jitter',
    meaning:
      'How much the servo twitches while the ball sits still, caused by the sensor\'s noise '
      + 'going through the controller (mostly the derivative). Measure the noise in counts with '
      + 'the ball still; a jitter of a degree or more makes the servo buzz and wear.',
  },
  {
    term: 'What-if band',
    id: 'what-if-band',
    meaning:
      'The shaded band around the predicted response: where the ball would go if the servo were '
      + '30 % slower, the rig 30 % livelier or lazier than measured, or the loop one sample later. '
      + 'A narrow band means the gains forgive measuring errors; the worst margins are listed.',
  },
  {
    term: 'Measured-run fit',
    id: 'run-fit',
    meaning:
      'The planner lays your rig\'s logged run over the prediction and adjusts the two numbers '
      + 'hardest to measure, how strongly the beam accelerates the ball (plant gain) and how '
      + 'slow the servo is (servo lag), until the model\'s response matches the run as closely '
      + 'as it can. It then offers them as corrected inputs.',
  },
  {
    term: 'Loop rate',
    id: 'loop-rate',
    meaning:
      `How many times a second the firmware reads the ball and updates the servo, from `
      + `${LOOP_RATE_RANGE[0]} to ${LOOP_RATE_RANGE[1]} Hz here. A hobby servo takes a new `
      + 'pulse only 50 to 330 times a second, so a faster loop changes nothing it can follow; a '
      + 'slower one cannot catch a ball on a beam.',
  },
  {
    term: 'Calibration residual',
    id: 'calibration-residual',
    meaning:
      'How far each measured position is from the fitted straight line, rounded to '
      + `${RULER_MM} mm, what a ruler reads. A row much further off than the others was `
      + 'probably misread: measure it again.',
  },
]
