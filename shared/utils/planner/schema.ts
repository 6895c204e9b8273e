// The Gain Planner's inputs, shared by the planner form and the API routes.
// SI units throughout (m, s, rad, Hz). Every message names its field twice — in words a
// student understands and by its key — so a form can show it beside the right input and a
// route can return it as is. The schemas add no defaults and no transforms, so the parsed
// value has exactly the shape the model functions take.
import { z } from 'zod'

function finite(field: string, label: string) {
  return z.number({ error: `${label} (${field}) must be a number` })
}

/** A strictly positive, finite quantity with a sanity ceiling. */
function positive(field: string, label: string, unit: string, max: number) {
  return finite(field, label)
    .positive({ error: `${label} (${field}) must be greater than 0 ${unit}` })
    .max(max, { error: `${label} (${field}) must be at most ${max} ${unit}` })
}

function oneOf<const T extends readonly [string, ...string[]]>(
  field: string,
  label: string,
  values: T,
) {
  const list = values.map(v => `"${v}"`).join(' or ')
  return z.enum(values, { error: `${label} (${field}) must be ${list}` })
}

export const DRIVES = ['lever', 'direct'] as const
export const BALL_SHELLS = ['solid', 'thin-shell'] as const
export const BALL_MATERIALS = ['steel', 'glass', 'plastic'] as const
export const SERVO_TYPES = ['analog', 'digital'] as const
export const CONTROLLER_FORMS = ['P', 'PD', 'PID'] as const
export const TUNING_METHODS = ['lag-aware', 'ideal'] as const
export const DERIVATIVE_SIGNALS = ['measurement', 'error'] as const
export const DISCRETIZATIONS = ['backward-euler', 'tustin'] as const
export const SERVO_RESOLUTIONS = ['degree', 'microsecond'] as const

/**
 * What the trade builds (docs/planner-model.md, "Input bounds"): a hobby servo takes a new pulse
 * 50 to 330 times a second, so a loop faster than 1000 Hz changes nothing it can follow, and
 * slower than 10 Hz no ball on a beam can be caught. A balancing rig settles in seconds; a
 * minute is far past any target a class sets.
 */
export const LOOP_RATE_RANGE = [10, 1000] as const
export const SETTLING_TIME_MAX = 60

const rigShape = z.object({
  beamLength: positive('beamLength', 'Beam length', 'm', 5),
  /** L_a: beam pivot to the pushrod joint. */
  pivotToLink: positive('pivotToLink', 'Pivot-to-link distance', 'm', 5),
  /** d: servo horn radius (lever drive). */
  leverArm: positive('leverArm', 'Lever arm (servo horn radius)', 'm', 5),
  drive: oneOf('drive', 'Drive', DRIVES),
  /** N_g: gear reduction for a direct-drive beam (alpha = theta / N_g). */
  gearRatio: positive('gearRatio', 'Gear ratio', '', 10000).optional(),
  ballDiameter: positive('ballDiameter', 'Ball diameter', 'm', 0.5),
  ballShell: oneOf('ballShell', 'Ball shell', BALL_SHELLS),
  ballMaterial: oneOf('ballMaterial', 'Ball material', BALL_MATERIALS).optional(),
  /** w: spacing of the two rail contact points; 0 is a flat track. */
  railGap: finite('railGap', 'Rail gap')
    .min(0, { error: 'Rail gap (railGap) must be 0 m or more' })
    .max(0.5, { error: 'Rail gap (railGap) must be at most 0.5 m' }),
  /** Servo speed rating: seconds per 60 degrees. */
  servoSecondsPer60: positive('servoSecondsPer60', 'Servo speed', 's per 60°', 10),
  /** Total servo travel, rad (180° = pi). */
  servoTravel: positive('servoTravel', 'Servo travel', 'rad', 2 * Math.PI),
  servoType: oneOf('servoType', 'Servo type', SERVO_TYPES).optional(),
  loopRate: finite('loopRate', 'Loop rate')
    .min(LOOP_RATE_RANGE[0], {
      error: `Loop rate (loopRate) must be at least ${LOOP_RATE_RANGE[0]} Hz: slower than that `
        + 'the ball rolls away between two readings',
    })
    .max(LOOP_RATE_RANGE[1], {
      error: `Loop rate (loopRate) must be at most ${LOOP_RATE_RANGE[1]} Hz: a hobby servo takes `
        + 'a new position at most a few hundred times a second, so a faster loop gains nothing',
    }),
  adcBits: finite('adcBits', 'ADC resolution')
    .int({ error: 'ADC resolution (adcBits) must be a whole number of bits' })
    .min(6, { error: 'ADC resolution (adcBits) must be at least 6 bits' })
    .max(24, { error: 'ADC resolution (adcBits) must be at most 24 bits' }),
  /** V_span / V_ref: the share of the ADC's range the rail's voltage actually spans. */
  sensorSpanRatio: finite('sensorSpanRatio', 'Sensor span ratio')
    .positive({ error: 'Sensor span ratio (sensorSpanRatio) must be greater than 0' })
    .max(1, {
      error: 'Sensor span ratio (sensorSpanRatio) must be at most 1 (V_span cannot exceed V_ref)',
    })
    .optional(),
  sensorLength: positive('sensorLength', 'Sensor length', 'm', 5).optional(),
  gravity: positive('gravity', 'Gravity', 'm/s²', 30).optional(),
  /** l: pushrod length for the exact lever geometry; 0.1 m when absent. */
  pushrodLength: positive('pushrodLength', 'Pushrod length', 'm', 5).optional(),
  /**
   * The track reads backwards: counts fall as the ball moves towards +x. The firmware negates
   * the reading (TW_READING_SIGN −1); false when absent.
   */
  sensorReversed: z
    .boolean({ error: 'Track reads backwards (sensorReversed) must be true or false' })
    .optional(),
  /** Servo pulse that holds the beam level, µs; 1500 when absent. */
  servoCenterUs: finite('servoCenterUs', 'Servo centre pulse')
    .min(500, { error: 'Servo centre pulse (servoCenterUs) must be at least 500 µs' })
    .max(2500, { error: 'Servo centre pulse (servoCenterUs) must be at most 2500 µs' })
    .optional(),
  /** Pulse width per degree of horn, µs/°; 1000/90 when absent. */
  servoUsPerDeg: finite('servoUsPerDeg', 'Pulse per degree')
    .min(2, { error: 'Pulse per degree (servoUsPerDeg) must be at least 2 µs per degree' })
    .max(40, { error: 'Pulse per degree (servoUsPerDeg) must be at most 40 µs per degree' })
    .optional(),
  /** What the firmware can write to the servo; 'microsecond' when absent. */
  servoResolution: oneOf('servoResolution', 'Servo output steps', SERVO_RESOLUTIONS).optional(),
  /** Pulse change the servo ignores, µs; 0 when absent. */
  servoDeadbandUs: finite('servoDeadbandUs', 'Servo deadband')
    .min(0, { error: 'Servo deadband (servoDeadbandUs) must be 0 µs or more' })
    .max(50, { error: 'Servo deadband (servoDeadbandUs) must be at most 50 µs' })
    .optional(),
  /** Servo PWM frame rate, Hz; 50 when absent. */
  servoFrameHz: finite('servoFrameHz', 'Servo frame rate')
    .min(20, { error: 'Servo frame rate (servoFrameHz) must be at least 20 Hz' })
    .max(400, { error: 'Servo frame rate (servoFrameHz) must be at most 400 Hz' })
    .optional(),
  /** ADC noise with the ball held still, counts RMS; none when absent. */
  adcNoiseCounts: finite('adcNoiseCounts', 'Sensor noise')
    .min(0, { error: 'Sensor noise (adcNoiseCounts) must be 0 counts or more' })
    .max(200, { error: 'Sensor noise (adcNoiseCounts) must be at most 200 counts' })
    .optional(),
})

/** A field that passed its own check; relations between fields are only judged between these. */
const valid = (v: unknown): v is number => typeof v === 'number' && Number.isFinite(v) && v >= 0

export const rigSchema = rigShape.superRefine((rig, ctx) => {
  const beamOk = valid(rig.beamLength) && rig.beamLength > 0
  if (beamOk && valid(rig.pivotToLink) && rig.pivotToLink > rig.beamLength) {
    ctx.addIssue({
      code: 'custom',
      path: ['pivotToLink'],
      message: 'Pivot-to-link distance (pivotToLink) cannot be longer than the beam (beamLength)',
    })
  }
  if (beamOk && valid(rig.leverArm) && rig.leverArm > rig.beamLength) {
    ctx.addIssue({
      code: 'custom',
      path: ['leverArm'],
      message: 'Lever arm (leverArm) cannot be longer than the beam (beamLength)',
    })
  }
  if (
    valid(rig.railGap)
    && valid(rig.ballDiameter)
    && rig.ballDiameter > 0
    && rig.railGap >= rig.ballDiameter
  ) {
    ctx.addIssue({
      code: 'custom',
      path: ['railGap'],
      message:
        'Rail gap (railGap) must be smaller than the ball diameter (ballDiameter), or the '
        + 'ball falls through',
    })
  }
  if (beamOk && valid(rig.sensorLength) && rig.sensorLength > rig.beamLength) {
    ctx.addIssue({
      code: 'custom',
      path: ['sensorLength'],
      message: 'Sensor length (sensorLength) cannot be longer than the beam (beamLength)',
    })
  }
  if (rig.drive === 'direct' && rig.gearRatio === undefined) {
    ctx.addIssue({
      code: 'custom',
      path: ['gearRatio'],
      message: 'Gear ratio (gearRatio) is needed for a direct-drive beam',
    })
  }
})

export const targetsSchema = z.object({
  overshootPct: finite('overshootPct', 'Overshoot')
    .min(0, { error: 'Overshoot (overshootPct) must be 0 % or more' })
    .lt(100, { error: 'Overshoot (overshootPct) must be less than 100 %' }),
  settlingTime: positive('settlingTime', 'Settling time', 's', SETTLING_TIME_MAX),
  form: oneOf('form', 'Controller form', CONTROLLER_FORMS),
  derivativeFilterN: positive('derivativeFilterN', 'Derivative filter N', '', 1000),
  method: oneOf('method', 'Method', TUNING_METHODS),
  derivativeOn: oneOf('derivativeOn', 'Derivative on', DERIVATIVE_SIGNALS),
  /** p_i, rad/s; 0.25·omega_n when absent. */
  integralPole: positive('integralPole', 'Integral pole', 'rad/s', 10000).optional(),
  /** The setpoint step the builder plans to make, m; a quarter of the sensor length when absent. */
  stepSize: positive('stepSize', 'Step size', 'm', 5).optional(),
  discretization: oneOf('discretization', 'Discretization', DISCRETIZATIONS).optional(),
})

export const gainsSchema = z.object({
  kp: positive('kp', 'Kp', 'rad/m', 1e6),
  kd: finite('kd', 'Kd')
    .min(0, { error: 'Kd (kd) must be 0 or more' })
    .max(1e6, { error: 'Kd (kd) must be at most 1000000 rad·s/m' }),
  ki: finite('ki', 'Ki')
    .min(0, { error: 'Ki (ki) must be 0 or more' })
    .max(1e6, { error: 'Ki (ki) must be at most 1000000 rad/(m·s)' }),
  n: positive('n', 'Derivative filter N', '', 1000),
  derivativeOn: oneOf('derivativeOn', 'Derivative on', DERIVATIVE_SIGNALS),
})

export const calibrationSchema = z.object({
  adcBits: rigShape.shape.adcBits,
  pairs: z
    .array(
      z.object({
        reading: finite('reading', 'ADC reading'),
        position: finite('position', 'Position'),
      }),
      { error: 'Calibration pairs (pairs) must be a list of { reading, position }' },
    )
    .min(2, { error: 'Calibration pairs (pairs) need at least 2 readings' })
    .max(1000, { error: 'Calibration pairs (pairs) can hold at most 1000 readings' }),
})

export type Rig = z.infer<typeof rigSchema>
export type Targets = z.infer<typeof targetsSchema>
export type Gains = z.infer<typeof gainsSchema>
export type CalibrationInput = z.infer<typeof calibrationSchema>
export type Drive = (typeof DRIVES)[number]
export type BallShell = (typeof BALL_SHELLS)[number]
export type ControllerForm = (typeof CONTROLLER_FORMS)[number]
export type TuningMethod = (typeof TUNING_METHODS)[number]
export type DerivativeSignal = (typeof DERIVATIVE_SIGNALS)[number]
export type Discretization = (typeof DISCRETIZATIONS)[number]
export type ServoResolution = (typeof SERVO_RESOLUTIONS)[number]
