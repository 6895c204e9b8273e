// Firmware constants (docs/planner-model.md §5). The firmware works in ADC counts in and servo
// degrees
// out, so every gain is also given in those units: Kp°/count = Kp·(180/π)/k_s, b°/count likewise.
import { actuatorOf } from './actuator'
import { filterTimeConstant } from './design'
import { fmt } from './format'
import { beamAngleRange } from './geometry'
import { plantOf } from './plant'
import { derivativeCoefficients } from './sampled'
import type { Discretization, Gains, Rig } from './schema'
import type { PlannerWarning } from './warnings'

const DEG = 180 / Math.PI

/** The soft start: for this long after power-up the command is scaled from 0 up to 1, so the
 *  servo eases the beam into the loop instead of jumping to wherever the first error sends it. */
export const SOFT_START_SECONDS = 0.5

export interface FirmwareConstants {
  /** What the constants were computed for (Tustin falls back to backward Euler when refused). */
  discretization: Discretization
  loopRateHz: number
  /** T, s. */
  period: number
  derivativeOn: Gains['derivativeOn']
  /** T_f = Kd/(N·Kp), s. */
  tf: number
  /** Derivative filter pole a (dimensionless). */
  a: number
  /** Derivative step gain b, rad per m of change in s. */
  b: number
  /** Ki·T, rad per m of error per sample. */
  kiT: number
  countsPerMeter: number
  kpDegPerMm: number
  kpDegPerCount: number
  bDegPerCount: number
  kiTDegPerCount: number
  /** Kd in servo degrees per mm/s of ball speed, for people rather than firmware. */
  kdDegPerMmPerS: number
  /** Samples of the soft start (SOFT_START_SECONDS at the loop rate, at least 1). */
  softStartSamples: number
  /**
   * Clamp the command to ±this, degrees: half the servo travel, or less where a lever linkage folds
   * back.
   */
  servoLimitDeg: number
  /** −1 when the track reads backwards: the firmware negates the reading (TW_READING_SIGN). */
  readingSign: 1 | -1
  /** Pulse that holds the beam level, µs. */
  servoCenterUs: number
  /** Pulse width per servo degree, µs. */
  usPerDeg: number
  /** The command clamp in µs either side of the centre pulse. */
  servoLimitUs: number
  /** A C block to paste into the sketch. */
  cSource: string
  /** The same constants as plain JSON with their units spelled out. */
  json: FirmwareJson
  warnings: PlannerWarning[]
}

export interface FirmwareJson {
  loopRateHz: number
  discretization: Discretization
  derivativeOn: Gains['derivativeOn']
  kpDegPerCount: number
  dA: number
  dBDegPerCount: number
  kiTDegPerCount: number
  servoLimitDeg: number
  countsPerMeter: number
  softStartSamples: number
  units: Record<
    | 'kpDegPerCount'
    | 'dA'
    | 'dBDegPerCount'
    | 'kiTDegPerCount'
    | 'servoLimitDeg'
    | 'countsPerMeter'
    | 'softStartSamples'
    | 'loopRateHz',
    string
  >
}

export interface FirmwareOptions {
  discretization?: Discretization
}

/** A C float literal with 7 significant figures. */
function c(value: number): string {
  let s = String(Number(value.toPrecision(7)))
  if (!/[.eE]/.test(s)) s += '.0'
  return `${s}f`
}

export function firmwareConstants(
  rig: Rig,
  gains: Gains,
  options: FirmwareOptions = {},
): FirmwareConstants {
  const plant = plantOf(rig)
  const actuator = actuatorOf(rig)
  const T = plant.period
  const ks = plant.countsPerMeter
  const tf = filterTimeConstant(gains.kp, gains.kd, gains.n)
  const warnings: PlannerWarning[] = []
  let discretization: Discretization = options.discretization ?? 'backward-euler'
  let coef = derivativeCoefficients(gains.kd, tf, T, discretization)
  if (discretization === 'tustin' && !coef.ok) {
    warnings.push({
      code: 'tustin-refused',
      severity: 'warning',
      message:
        `The Tustin form needs the derivative filter to be at least half a sample long (T_f ≥ `
        + `${fmt((T / 2) * 1000)} ms), `
        + `but it is ${fmt(tf * 1000)} ms: the derivative would flip sign every sample and make `
        + `the servo buzz. `
        + 'These constants use backward Euler instead, which is always stable.',
    })
    discretization = 'backward-euler'
    coef = derivativeCoefficients(gains.kd, tf, T, discretization)
  }
  const kiT = gains.ki * T
  const kpDegPerCount = (gains.kp * DEG) / ks
  const bDegPerCount = (coef.b * DEG) / ks
  const kiTDegPerCount = (kiT * DEG) / ks
  // Clamp where the servo stops or, for a lever, where the linkage would start to fold back.
  const range = beamAngleRange(rig)
  const servoLimitDeg
    = Math.min(Math.abs(range.maxAtServoAngle), Math.abs(range.minAtServoAngle)) * DEG
  const loopRateHz = rig.loopRate
  const sSignal = gains.derivativeOn === 'measurement' ? '-reading' : 'error'
  const method = discretization === 'tustin' ? 'Tustin' : 'backward Euler'
  const softStartSamples = Math.max(1, Math.round(SOFT_START_SECONDS * loopRateHz))
  const cSource = [
    '/* Tiltwright Gain Planner: firmware constants.',
    ` * Loop rate ${fmt(loopRateHz)} Hz (T = ${fmt(T * 1000)} ms), derivative on `
    + `${gains.derivativeOn}, ${method}.`,
    ' * Units: ADC counts in, servo degrees out (0 = beam level).',
    ' * First sample only: d = 0; i = 0; n = 0; and s_prev = s of that sample, so the',
    ' *   derivative sees no jump from 0 to the first reading (no kick at power-up).',
    ' * Every sample:',
    ' *   error = setpoint - reading;                       counts',
    ` *   s = ${sSignal};`,
    ' *   d = TW_D_A * d + TW_D_B * (s - s_prev); s_prev = s;',
    ' *   i = i + TW_KI_T * error;   (hold i while the servo sits at its limit)',
    ' *   servo = TW_KP * error + i + d, clamped to +/- TW_SERVO_LIMIT_DEG',
    ' *   if (n < TW_SOFT_START) { n = n + 1; servo = servo * n / TW_SOFT_START; }',
    ' *   write servo on the next tick, so the delay is the one the planner assumed. */',
    `#define TW_LOOP_RATE_HZ     ${c(loopRateHz)}  /* Hz */`,
    `#define TW_KP               ${c(kpDegPerCount)}  /* servo deg per count of error */`,
    `#define TW_D_A              ${c(coef.a)}  /* derivative filter pole, no unit */`,
    `#define TW_D_B              ${c(bDegPerCount)}  /* servo deg per count of change in s */`,
    `#define TW_KI_T             ${c(kiTDegPerCount)}  /* servo deg per count of error per `
    + `sample */`,
    `#define TW_SERVO_LIMIT_DEG  ${c(servoLimitDeg)}  /* deg either side of level */`,
    `#define TW_COUNTS_PER_M     ${c(ks)}  /* sensor counts per metre */`,
    `#define TW_SOFT_START       ${softStartSamples}  /* samples to ease the command in `
    + `(${fmt(SOFT_START_SECONDS)} s) */`,
    '',
  ].join('\n')
  const json: FirmwareJson = {
    loopRateHz,
    discretization,
    derivativeOn: gains.derivativeOn,
    kpDegPerCount,
    dA: coef.a,
    dBDegPerCount: bDegPerCount,
    kiTDegPerCount,
    servoLimitDeg,
    countsPerMeter: ks,
    softStartSamples,
    units: {
      loopRateHz: 'Hz',
      kpDegPerCount: 'servo degrees per ADC count of error',
      dA: 'dimensionless (derivative filter pole)',
      dBDegPerCount: 'servo degrees per ADC count of change in the derivative signal',
      kiTDegPerCount: 'servo degrees per ADC count of error per sample',
      servoLimitDeg: 'servo degrees either side of level',
      countsPerMeter: 'ADC counts per metre of ball travel',
      softStartSamples: 'samples over which the command is eased in after power-up',
    },
  }
  return {
    discretization,
    loopRateHz,
    period: T,
    derivativeOn: gains.derivativeOn,
    tf,
    a: coef.a,
    b: coef.b,
    kiT,
    countsPerMeter: ks,
    kpDegPerMm: (gains.kp * DEG) / 1000,
    kpDegPerCount,
    bDegPerCount,
    kiTDegPerCount,
    kdDegPerMmPerS: (gains.kd * DEG) / 1000,
    softStartSamples,
    servoLimitDeg,
    readingSign: rig.sensorReversed ? -1 : 1,
    servoCenterUs: actuator.centerUs,
    usPerDeg: actuator.usPerRad / DEG,
    servoLimitUs: servoLimitDeg * (actuator.usPerRad / DEG),
    cSource,
    json,
    warnings,
  }
}
