// Firmware constants (docs/planner-model.md §5). The firmware works in ADC counts in and servo
// degrees out, so every gain is also given in those units: Kp°/count = Kp·(180/π)/k_s, b°/count
// likewise. The reading's sign (a track that reads backwards) and the servo pulse in µs travel
// with them, so the recipe is the loop the planner analysed.
import { actuatorOf } from './actuator'
import { filterTimeConstant } from './design'
import { fmt } from './format'
import { beamAngleRange } from './geometry'
import { plantOf } from './plant'
import { derivativeCoefficients } from './sampled'
import type { Discretization, Gains, Rig, ServoResolution } from './schema'
import type { PlannerWarning } from './warnings'

const DEG = 180 / Math.PI

/** The soft start: for this long after power-up the command is scaled from 0 up to 1, so the
 *  servo eases the beam into the loop instead of jumping to wherever the first error sends it. */
export const SOFT_START_SECONDS = 0.5

/** TW_SOFT_START: the soft start's length in samples at a loop rate (at least 1). */
export function softStartSamplesOf(loopRateHz: number): number {
  return Math.max(1, Math.round(SOFT_START_SECONDS * loopRateHz))
}

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
  readingSign: 1 | -1
  adcFullScale: number
  kpDegPerCount: number
  dA: number
  dBDegPerCount: number
  kiTDegPerCount: number
  servoLimitDeg: number
  countsPerMeter: number
  softStartSamples: number
  servoCenterUs: number
  servoTrimUs: number
  usPerDeg: number
  servoLimitUs: number
  servoResolution: ServoResolution
  units: Record<
    | 'readingSign'
    | 'adcFullScale'
    | 'servoCenterUs'
    | 'servoTrimUs'
    | 'usPerDeg'
    | 'servoLimitUs'
    | 'servoResolution'
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
  const softStartSamples = softStartSamplesOf(loopRateHz)
  const readingSign: 1 | -1 = rig.sensorReversed ? -1 : 1
  const adcFullScale = 2 ** rig.adcBits - 1
  const usPerDeg = actuator.usPerRad / DEG
  const servoLimitUs = servoLimitDeg * usPerDeg
  const pulseLine = actuator.resolution === 'degree'
    ? ' *   servo.write(90 + round(servo));        whole degrees, 90 = level'
    : ' *   servo.writeMicroseconds(round(TW_SERVO_CENTER_US + TW_SERVO_TRIM_US'
      + '\n *                           + servo * TW_US_PER_DEG));'
  const cSource = [
    '/* Tiltwright Gain Planner: firmware constants.',
    ` * Loop rate ${fmt(loopRateHz)} Hz (T = ${fmt(T * 1000)} ms), derivative on `
    + `${gains.derivativeOn}, ${method}.`,
    ' * Units: ADC counts in, servo degrees out (0 = beam level).',
    ' * First sample only: d = 0; i = 0; n = 0; and s_prev = s of that sample,',
    ' *   so the derivative sees no jump from 0 to the first reading.',
    ' * Every sample:',
    ' *   raw = analogRead(pin);',
    ' *   reading = TW_READING_SIGN > 0 ? raw : TW_ADC_FULL_SCALE - raw;',
    ' *   error = setpoint - reading;                       counts',
    ` *   s = ${sSignal};`,
    ' *   d = TW_D_A * d + TW_D_B * (s - s_prev); s_prev = s;',
    ' *   i = i + TW_KI_T * error;   (hold i while the servo sits at its limit)',
    ' *   servo = TW_KP * error + i + d, clamped to +/- TW_SERVO_LIMIT_DEG',
    ' *   if (n < TW_SOFT_START) { n = n + 1; servo = servo * n / TW_SOFT_START; }',
    ' *   on the next tick (the delay the planner assumed), write the pulse:',
    pulseLine,
    ' * Adjust TW_SERVO_TRIM_US (pushrod off) until the horn sits level at 0. */',
    `#define TW_LOOP_RATE_HZ     ${c(loopRateHz)}  /* Hz */`,
    `#define TW_READING_SIGN     ${readingSign}  /* -1: reading = full scale - raw */`,
    `#define TW_ADC_FULL_SCALE   ${adcFullScale}  /* largest ADC reading, counts */`,
    `#define TW_KP               ${c(kpDegPerCount)}  /* deg per count of error */`,
    `#define TW_D_A              ${c(coef.a)}  /* derivative filter pole, no unit */`,
    `#define TW_D_B              ${c(bDegPerCount)}  /* deg per count of change in s */`,
    `#define TW_KI_T             ${c(kiTDegPerCount)}  /* deg per count of error, per sample */`,
    `#define TW_SERVO_LIMIT_DEG  ${c(servoLimitDeg)}  /* deg either side of level */`,
    `#define TW_COUNTS_PER_M     ${c(ks)}  /* sensor counts per metre */`,
    `#define TW_SOFT_START       ${softStartSamples}  /* samples to ease the command in `
    + `(${fmt(SOFT_START_SECONDS)} s) */`,
    `#define TW_SERVO_CENTER_US  ${c(actuator.centerUs)}  /* pulse for a level beam, us */`,
    '#define TW_SERVO_TRIM_US    0.0f  /* bring-up: until the beam is level, us */',
    `#define TW_US_PER_DEG       ${c(usPerDeg)}  /* pulse per servo degree, us */`,
    `#define TW_SERVO_LIMIT_US   ${c(servoLimitUs)}  /* us either side of the centre */`,
    '',
  ].join('\n')
  const json: FirmwareJson = {
    loopRateHz,
    discretization,
    derivativeOn: gains.derivativeOn,
    readingSign,
    adcFullScale,
    kpDegPerCount,
    dA: coef.a,
    dBDegPerCount: bDegPerCount,
    kiTDegPerCount,
    servoLimitDeg,
    countsPerMeter: ks,
    softStartSamples,
    servoCenterUs: actuator.centerUs,
    servoTrimUs: 0,
    usPerDeg,
    servoLimitUs,
    servoResolution: actuator.resolution,
    units: {
      loopRateHz: 'Hz',
      readingSign: '1, or -1 when the track reads backwards: reading = adcFullScale - raw',
      adcFullScale: 'largest ADC reading, counts',
      kpDegPerCount: 'servo degrees per ADC count of error',
      dA: 'dimensionless (derivative filter pole)',
      dBDegPerCount: 'servo degrees per ADC count of change in the derivative signal',
      kiTDegPerCount: 'servo degrees per ADC count of error per sample',
      servoLimitDeg: 'servo degrees either side of level',
      countsPerMeter: 'ADC counts per metre of ball travel',
      softStartSamples: 'samples over which the command is eased in after power-up',
      servoCenterUs: 'servo pulse for a level beam, microseconds',
      servoTrimUs: 'pulse added at bring-up until the beam is level, microseconds',
      usPerDeg: 'servo pulse per degree, microseconds',
      servoLimitUs: 'servo pulse either side of the centre, microseconds',
      servoResolution: 'what the firmware writes: whole degrees or whole microseconds',
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
    readingSign,
    servoCenterUs: actuator.centerUs,
    usPerDeg,
    servoLimitUs,
    cSource,
    json,
    warnings,
  }
}
