// The bring-up (docs/planner-model.md §12): the ordered first power-up of a rig with the planned
// constants, shown in the firmware panel and on the printed sheet. Each step names the constant
// it touches (TW_SERVO_TRIM_US, TW_READING_SIGN, TW_KP, TW_D_B, TW_KI_T) with the numbers of this
// plan, and says where hands or the ball can get hurt.
import type { FirmwareConstants } from './firmware'
import { fmt } from './format'
import type { Gains, Rig } from './schema'

export interface BringUpStep {
  id: 'neutral' | 'direction' | 'p-only' | 'suggested'
  title: string
  /** What to do and what to look for, in plain words. */
  detail: string
  /** Where hands or the ball can get hurt; null when none. */
  caution: string | null
}

/** The P-only trial runs at this fraction of the suggested Kp (common practice: start low). */
export const BRING_UP_P_FRACTION = 1 / 3

const SCHOOL_RULES = 'Follow your school\'s own safety rules for tools and electrical equipment.'

export function bringUpSteps(rig: Rig, gains: Gains, firmware: FirmwareConstants): BringUpStep[] {
  const f = firmware
  const usPerDeg = fmt(f.usPerDeg, 3)
  const limit = `±${fmt(f.servoLimitDeg)}° (±${fmt(f.servoLimitUs)} µs)`
  const lowKp = f.kpDegPerCount * BRING_UP_P_FRACTION
  const softMs = fmt((f.softStartSamples / rig.loopRate) * 1000)
  const signNow = f.readingSign === -1 ? '−1' : '1'
  return [
    {
      id: 'neutral',
      title: 'Check the servo neutral with the pushrod off',
      detail:
        'Switch the power off and unhook the pushrod from the servo horn. Load the sketch with '
        + 'the planned constants and switch on with the ball off the beam: the servo goes to '
        + `its centre pulse, TW_SERVO_CENTER_US + TW_SERVO_TRIM_US = ${fmt(f.servoCenterUs)} µs `
        + '+ 0 µs, which must hold the beam level. Hold the beam level (a spirit level helps) and '
        + 'see whether the pushrod would hook on without pulling the horn round. If not, switch '
        + `off, change TW_SERVO_TRIM_US (about ${usPerDeg} µs moves the horn 1°; a few tens of `
        + 'µs at most, or move the horn one spline tooth and start again), upload and check '
        + 'again. Hook the pushrod back on with the power off.',
      caution:
        'A powered servo can turn suddenly, at switch-on too: keep fingers clear of the horn '
        + 'and the pushrod whenever the power is on, and unhook or hook the pushrod only with '
        + `the power off. ${SCHOOL_RULES}`,
    },
    {
      id: 'direction',
      title: 'Check the loop direction',
      detail:
        'With the pushrod still off and the power on, watch the reading on the serial monitor '
        + 'and roll the ball by hand towards the end where the counts go up. The horn must turn '
        + 'the way that, with the pushrod on, would lift that end, so the ball would roll back '
        + 'towards the setpoint. If it turns the other way the loop would push the ball away: '
        + `switch off and flip TW_READING_SIGN (now ${signNow}; with −1 the sketch uses `
        + 'TW_ADC_FULL_SCALE − raw), upload and check again. The horn may swing as far as '
        + `the command clamp, ${limit}.`,
      caution:
        'The horn moves as you move the ball: move the ball with the hand away from the '
        + 'servo, and keep the other hand off the horn.',
    },
    {
      id: 'p-only',
      title: 'Try P only at a low gain',
      detail:
        `Switch off, hook the pushrod on, and set TW_KP = ${fmt(lowKp, 3)} °/count (a third of `
        + `the suggested ${fmt(f.kpDegPerCount, 3)}), TW_D_B = 0 and TW_KI_T = 0. Switch on `
        + 'with the ball near the middle. The soft start eases the servo in over '
        + `${softMs} ms; then the ball should swing slowly to and fro about the setpoint, `
        + 'never running off to one end. P alone cannot settle it, so the swing is expected. '
        + 'If the ball runs to an end and stays there, the direction is wrong: back to the '
        + 'previous step.',
      caution:
        'The ball can be thrown off the end of the beam: stand to the side and keep faces away '
        + 'from its path. If the servo buzzes against an end stop or a jammed linkage, switch '
        + 'off at once: a stalled servo gets hot and draws a large current.',
    },
    {
      id: 'suggested',
      title: 'Load the suggested gains',
      detail:
        `Switch off and set TW_KP = ${fmt(f.kpDegPerCount, 3)} °/count, `
        + `TW_D_A = ${fmt(f.a, 4)}, TW_D_B = ${fmt(f.bDegPerCount, 3)} °/count`
        + (gains.ki > 0 ? ` and TW_KI_T = ${fmt(f.kiTDegPerCount, 3)} °/count` : '')
        + '. Switch on with the ball resting near the middle: after the soft start the ball '
        + 'should move to the setpoint and stop there. Try small setpoint changes first. If '
        + 'the servo buzzes or the ball keeps swinging, switch off and go back to the planner '
        + 'with what you saw (or upload a logged run to compare).',
      caution:
        'Keep hands clear of the horn, the pushrod and the beam while the loop runs, and '
        + 'switch off before changing anything on the rig. The ball can still be thrown if a '
        + `gain is wrong: stand to the side. ${SCHOOL_RULES}`,
    },
  ]
}
