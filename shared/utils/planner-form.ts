// The Gain Planner form in the builder's units (mm, degrees, Hz) and its conversion to the
// model's SI inputs. Blank optional fields mean "use the model's default".
import type { z } from 'zod'
import { fieldErrorsOf, type FieldErrors } from './field-errors'
import { rigSchema, targetsSchema, type Gains, type Rig, type Targets } from './planner/schema'

const DEG = Math.PI / 180
const MM = 0.001

export interface PlannerForm {
  beamLengthMm: number
  pivotToLinkMm: number
  leverArmMm: number
  pushrodLengthMm: number | null
  drive: Rig['drive']
  gearRatio: number | null
  ballDiameterMm: number
  ballShell: Rig['ballShell']
  ballMaterial: NonNullable<Rig['ballMaterial']>
  railGapMm: number
  servoSecondsPer60: number
  servoTravelDeg: number
  servoType: NonNullable<Rig['servoType']>
  loopRateHz: number
  adcBits: number
  sensorSpanRatio: number | null
  sensorLengthMm: number | null
  /** The track reads backwards (set from a calibration whose counts fall along the beam). */
  sensorReversed: boolean
  /** Actuator and sensor details; blank = the model's default (see the schema). */
  servoCenterUs: number | null
  servoUsPerDeg: number | null
  servoResolution: NonNullable<Rig['servoResolution']>
  servoDeadbandUs: number | null
  servoFrameHz: number | null
  adcNoiseCounts: number | null
  overshootPct: number
  settlingTime: number
  form: Targets['form']
  derivativeFilterN: number
  method: Targets['method']
  derivativeOn: Targets['derivativeOn']
  stepSizeMm: number | null
  /** PID only; blank = a quarter of the natural frequency. */
  integralPole: number | null
  discretization: NonNullable<Targets['discretization']>
}

/** Which form field shows a model field's error. */
export const FORM_FIELD_OF: Record<string, keyof PlannerForm> = {
  beamLength: 'beamLengthMm',
  pivotToLink: 'pivotToLinkMm',
  leverArm: 'leverArmMm',
  pushrodLength: 'pushrodLengthMm',
  drive: 'drive',
  gearRatio: 'gearRatio',
  ballDiameter: 'ballDiameterMm',
  ballShell: 'ballShell',
  ballMaterial: 'ballMaterial',
  railGap: 'railGapMm',
  servoSecondsPer60: 'servoSecondsPer60',
  servoTravel: 'servoTravelDeg',
  servoType: 'servoType',
  loopRate: 'loopRateHz',
  adcBits: 'adcBits',
  sensorSpanRatio: 'sensorSpanRatio',
  sensorLength: 'sensorLengthMm',
  sensorReversed: 'sensorReversed',
  servoCenterUs: 'servoCenterUs',
  servoUsPerDeg: 'servoUsPerDeg',
  servoResolution: 'servoResolution',
  servoDeadbandUs: 'servoDeadbandUs',
  servoFrameHz: 'servoFrameHz',
  adcNoiseCounts: 'adcNoiseCounts',
  overshootPct: 'overshootPct',
  settlingTime: 'settlingTime',
  form: 'form',
  derivativeFilterN: 'derivativeFilterN',
  method: 'method',
  derivativeOn: 'derivativeOn',
  stepSize: 'stepSizeMm',
  integralPole: 'integralPole',
  discretization: 'discretization',
}

const num = (v: unknown) => (v === '' || v === null || v === undefined ? Number.NaN : Number(v))
const opt = (v: number | null | undefined, scale = 1) =>
  v === null || v === undefined || (v as unknown) === '' ? undefined : num(v) * scale

export function rigFromForm(f: PlannerForm): Rig {
  return {
    beamLength: num(f.beamLengthMm) * MM,
    pivotToLink: num(f.pivotToLinkMm) * MM,
    leverArm: num(f.leverArmMm) * MM,
    pushrodLength: opt(f.pushrodLengthMm, MM),
    drive: f.drive,
    // A motor on the pivot turns the beam one for one unless a reduction is entered.
    gearRatio: f.drive === 'direct' ? (opt(f.gearRatio) ?? 1) : undefined,
    ballDiameter: num(f.ballDiameterMm) * MM,
    ballShell: f.ballShell,
    ballMaterial: f.ballMaterial,
    railGap: num(f.railGapMm) * MM,
    servoSecondsPer60: num(f.servoSecondsPer60),
    servoTravel: num(f.servoTravelDeg) * DEG,
    servoType: f.servoType,
    loopRate: num(f.loopRateHz),
    adcBits: num(f.adcBits),
    sensorSpanRatio: opt(f.sensorSpanRatio),
    sensorLength: opt(f.sensorLengthMm, MM),
    sensorReversed: f.sensorReversed ? true : undefined,
    servoCenterUs: opt(f.servoCenterUs),
    servoUsPerDeg: opt(f.servoUsPerDeg),
    servoResolution: f.servoResolution,
    servoDeadbandUs: opt(f.servoDeadbandUs),
    servoFrameHz: opt(f.servoFrameHz),
    adcNoiseCounts: opt(f.adcNoiseCounts),
  }
}

export function targetsFromForm(f: PlannerForm): Targets {
  return {
    overshootPct: num(f.overshootPct),
    settlingTime: num(f.settlingTime),
    form: f.form,
    derivativeFilterN: num(f.derivativeFilterN),
    method: f.method,
    derivativeOn: f.derivativeOn,
    stepSize: opt(f.stepSizeMm, MM),
    discretization: f.discretization,
    integralPole: f.form === 'PID' ? opt(f.integralPole) : undefined,
  }
}

const round = (v: number, digits = 6) => Number(v.toPrecision(digits))

export function formFrom(rig: Rig, targets: Targets): PlannerForm {
  return {
    beamLengthMm: round(rig.beamLength / MM),
    pivotToLinkMm: round(rig.pivotToLink / MM),
    leverArmMm: round(rig.leverArm / MM),
    pushrodLengthMm: rig.pushrodLength === undefined ? null : round(rig.pushrodLength / MM),
    drive: rig.drive,
    gearRatio: rig.gearRatio ?? 1,
    ballDiameterMm: round(rig.ballDiameter / MM),
    ballShell: rig.ballShell,
    ballMaterial: rig.ballMaterial ?? 'steel',
    railGapMm: round(rig.railGap / MM),
    servoSecondsPer60: rig.servoSecondsPer60,
    servoTravelDeg: round(rig.servoTravel / DEG),
    servoType: rig.servoType ?? 'analog',
    loopRateHz: rig.loopRate,
    adcBits: rig.adcBits,
    sensorSpanRatio: rig.sensorSpanRatio ?? null,
    sensorLengthMm: rig.sensorLength === undefined ? null : round(rig.sensorLength / MM),
    sensorReversed: rig.sensorReversed ?? false,
    servoCenterUs: rig.servoCenterUs ?? null,
    servoUsPerDeg: rig.servoUsPerDeg ?? null,
    servoResolution: rig.servoResolution ?? 'microsecond',
    servoDeadbandUs: rig.servoDeadbandUs ?? null,
    servoFrameHz: rig.servoFrameHz ?? null,
    adcNoiseCounts: rig.adcNoiseCounts ?? null,
    overshootPct: targets.overshootPct,
    settlingTime: targets.settlingTime,
    form: targets.form,
    derivativeFilterN: targets.derivativeFilterN,
    method: targets.method,
    derivativeOn: targets.derivativeOn,
    stepSizeMm: targets.stepSize === undefined ? null : round(targets.stepSize / MM),
    integralPole: targets.integralPole ?? null,
    discretization: targets.discretization ?? 'backward-euler',
  }
}

/**
 * The model's message in the form's words: without the "(key)" (the form shows it beside the
 * field) and, for a field the form asks in mm, with metres given in mm.
 */
export function plainMessage(m: string, formField?: string) {
  let out = m.replace(/ \(\w+\)/g, '')
  if (formField?.endsWith('Mm'))
    out = out.replace(
      /(\d+(?:\.\d+)?) m(?![\w/²])/g,
      (_, v: string) => `${Number((Number(v) * 1000).toPrecision(6))} mm`,
    )
  return out
}

export type PlannerCheck
  = | { ok: true, rig: Rig, targets: Targets, errors: FieldErrors }
    | { ok: false, errors: FieldErrors }

/** Validate the form with the model's own schemas; errors keyed by form field. */
export function checkPlannerForm(f: PlannerForm): PlannerCheck {
  const rig = rigSchema.safeParse(rigFromForm(f))
  const targets = targetsSchema.safeParse(targetsFromForm(f))
  const errors: FieldErrors = {}
  for (const r of [rig, targets]) {
    if (r.success) continue
    for (const [k, m] of Object.entries(fieldErrorsOf(r.error as z.ZodError))) {
      const field = FORM_FIELD_OF[k] ?? k
      errors[field] ??= plainMessage(m, field)
    }
  }
  if (rig.success && targets.success)
    return { ok: true, rig: rig.data, targets: targets.data, errors }
  return { ok: false, errors }
}

/** Gains in the units a builder reads: degrees of servo per mm of error (and per mm/s). */
export function gainsInDegrees(g: Gains) {
  return {
    kpDegPerMm: (g.kp * (180 / Math.PI)) / 1000,
    kdDegPerMmPerS: (g.kd * (180 / Math.PI)) / 1000,
    kiDegPerMmS: (g.ki * (180 / Math.PI)) / 1000,
  }
}
