// The exported C recipe run the way the microcontroller runs it: the constants are read back from
// the #defines of firmwareConstants().cSource, and each sample does the block's arithmetic in its
// order (reading, error, derivative, integral, clamp, soft start, pulse).
import type { FirmwareConstants } from '../../../shared/utils/planner'

export type Defines = Record<string, number>

export function definesOf(fw: FirmwareConstants): Defines {
  return Object.fromEntries(
    [...fw.cSource.matchAll(/#define (TW_\w+)\s+(-?[\d.]+(?:e[-+]?\d+)?)f?/gi)].map(m => [
      m[1]!,
      Number(m[2]),
    ]),
  )
}

export interface Recipe {
  /** One sample: the raw ADC value in, the servo command out (degrees from level). */
  step: (raw: number, setpointCounts: number) => number
  /** The pulse the recipe writes for a command, µs (whole microseconds). */
  pulse: (servoDeg: number) => number
}

export function recipeOf(
  d: Defines,
  derivativeOn: 'measurement' | 'error',
  overrides: Partial<Defines> = {},
): Recipe {
  const k = { ...d, ...overrides } as Defines
  let dTerm = 0
  let i = 0
  let n = 0
  let sPrev = 0
  let first = true
  return {
    step(raw, setpoint) {
      const reading = k.TW_READING_SIGN! > 0 ? raw : k.TW_ADC_FULL_SCALE! - raw
      const error = setpoint - reading
      const s = derivativeOn === 'measurement' ? -reading : error
      if (first) {
        sPrev = s
        first = false
      }
      dTerm = k.TW_D_A! * dTerm + k.TW_D_B! * (s - sPrev)
      sPrev = s
      const iNext = i + k.TW_KI_T! * error
      const limit = k.TW_SERVO_LIMIT_DEG!
      let servo = k.TW_KP! * error + iNext + dTerm
      if (Math.abs(servo) > limit) {
        servo = Math.max(-limit, Math.min(limit, k.TW_KP! * error + i + dTerm))
      } else {
        i = iNext
      }
      if (n < k.TW_SOFT_START!) {
        n = n + 1
        servo = (servo * n) / k.TW_SOFT_START!
      }
      return servo
    },
    pulse: servoDeg =>
      Math.round(k.TW_SERVO_CENTER_US! + k.TW_SERVO_TRIM_US! + servoDeg * k.TW_US_PER_DEG!),
  }
}
