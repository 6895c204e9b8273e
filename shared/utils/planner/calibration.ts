// Rail sensor calibration (docs/planner-model.md §6): a least-squares line
// position = slope·reading + offset through (ADC reading, measured position) pairs. Readings
// pinned at 0 or at full scale carry no position (no ball bridging the rails, or a ball that does
// not conduct) and are left out. The rows as typed (readCalibrationRows), the residuals as a ruler
// reads them (rulerMm) and what the fit changes in the plan (planInputsFromFit) are here too, so
// the panel only shows them.
import { fmt } from './format'

export interface CalibrationPair {
  /** ADC reading, counts (an average of several readings may be fractional). */
  reading: number
  /** Measured ball position, m. */
  position: number
}

export type CalibrationIssueCode
  = | 'reading-at-zero'
    | 'reading-at-full-scale'
    | 'reading-outside-adc-range'
    | 'too-few-readings'
    | 'readings-identical'
    | 'poor-fit'
    | 'outlier'
    | 'reads-backwards'

export interface CalibrationIssue {
  code: CalibrationIssueCode
  /** Index into the pairs given, when the issue is about one reading. */
  index: number | null
  message: string
}

export interface CalibrationFit {
  /** A line was fitted from at least two distinct in-range readings. */
  ok: boolean
  /** m per count. */
  slope: number | null
  slopeMmPerCount: number | null
  /** Position at reading 0, m. */
  offset: number | null
  offsetMm: number | null
  /** 1/|slope|: the k_s to give the planner, counts per metre. */
  countsPerMeter: number | null
  /** +1 when the reading rises as the ball moves toward larger positions, −1 when it falls (the
   *  track reads backwards: the firmware must flip the reading, or the loop pushes the ball away);
   *  null without a fit. */
  direction: 1 | -1 | null
  /** Coefficient of determination over the readings used. */
  r2: number | null
  /** position − fitted position per pair, m; null for a reading left out. */
  residuals: (number | null)[]
  /** Largest |residual| among the readings used. */
  worstResidual: { index: number, residual: number } | null
  /** Readings used in the fit. */
  used: number
  issues: CalibrationIssue[]
}

const R2_MIN = 0.995

export function fitCalibration(pairs: readonly CalibrationPair[], adcBits: number): CalibrationFit {
  const fullScale = 2 ** adcBits - 1
  const issues: CalibrationIssue[] = []
  const use: number[] = []
  pairs.forEach((p, i) => {
    const where = `${fmt(p.position * 1000)} mm`
    if (p.reading < 0 || p.reading > fullScale) {
      issues.push({
        code: 'reading-outside-adc-range',
        index: i,
        message:
          `Reading ${fmt(p.reading)} at ${where} is outside what a ${adcBits}-bit ADC can `
          + `give (0 to ${fullScale}); check it was typed right.`,
      })
    } else if (p.reading <= 0) {
      issues.push({
        code: 'reading-at-zero',
        index: i,
        message:
          `Reading 0 at ${where}: the sensor sees no ball there. The ball is off the rails or `
          + `not touching both, `
          + 'or it does not conduct (glass and plastic balls cannot be sensed). Left out of the '
          + 'fit.',
      })
    } else if (p.reading >= fullScale) {
      issues.push({
        code: 'reading-at-full-scale',
        index: i,
        message:
          `Reading ${fullScale} (full scale) at ${where}: the sensor sees no ball there, or `
          + `the rail is wired `
          + 'with the wrong reference. A ball that does not conduct reads like this too. Left '
          + 'out of the fit.',
      })
    } else {
      use.push(i)
    }
  })
  const residuals: (number | null)[] = pairs.map(() => null)
  const empty: CalibrationFit = {
    ok: false,
    slope: null,
    slopeMmPerCount: null,
    offset: null,
    offsetMm: null,
    countsPerMeter: null,
    direction: null,
    r2: null,
    residuals,
    worstResidual: null,
    used: use.length,
    issues,
  }
  if (use.length < 2) {
    issues.push({
      code: 'too-few-readings',
      index: null,
      message:
        'At least two good readings at different positions are needed for a calibration line.',
    })
    return empty
  }
  let mx = 0
  let my = 0
  for (const i of use) {
    mx += pairs[i]!.reading
    my += pairs[i]!.position
  }
  mx /= use.length
  my /= use.length
  let sxx = 0
  let sxy = 0
  let syy = 0
  for (const i of use) {
    const dx = pairs[i]!.reading - mx
    const dy = pairs[i]!.position - my
    sxx += dx * dx
    sxy += dx * dy
    syy += dy * dy
  }
  if (!(sxx > 0)) {
    issues.push({
      code: 'readings-identical',
      index: null,
      message:
        'Every good reading is the same, so no line can be fitted: move the ball further '
        + 'between readings.',
    })
    return empty
  }
  const slope = sxy / sxx
  const offset = my - slope * mx
  let sse = 0
  let worst: { index: number, residual: number } | null = null
  for (const i of use) {
    const res = pairs[i]!.position - (slope * pairs[i]!.reading + offset)
    residuals[i] = res
    sse += res * res
    if (worst === null || Math.abs(res) > Math.abs(worst.residual))
      worst = { index: i, residual: res }
  }
  const r2 = syy > 0 ? 1 - sse / syy : 1
  if (r2 < R2_MIN) {
    issues.push({
      code: 'poor-fit',
      index: null,
      message:
        `The readings do not lie on a straight line (R² = ${fmt(r2, 4)}): a rail may be dirty `
        + `or loose, or a position was misread.`,
    })
  }
  if (use.length >= 4 && worst !== null) {
    // Compare the worst point with the scatter of the others, so it cannot hide its own size.
    let others = 0
    for (const i of use) if (i !== worst.index) others += residuals[i]! ** 2
    const rmsOthers = Math.sqrt(others / (use.length - 1))
    if (Math.abs(worst.residual) > 4 * rmsOthers && Math.abs(worst.residual) > 1e-4) {
      issues.push({
        code: 'outlier',
        index: worst.index,
        message:
          `The reading at ${fmt(pairs[worst.index]!.position * 1000)} mm is about `
          + `${fmt(Math.abs(rulerMm(worst.residual)))} mm off the line, far more than the `
          + `others: measure it again.`,
      })
    }
  }
  if (slope < 0) {
    issues.push({
      code: 'reads-backwards',
      index: null,
      message:
        'The track reads backwards: the readings fall as the ball moves toward the far end. '
        + 'As it is, the loop would push the ball away from the setpoint and run it to the end '
        + 'stop. Unplug the rig, then swap the two wires at the ends of the rail, or flip the '
        + `reading in the firmware (reading = ${2 ** adcBits - 1} − raw reading), and take the `
        + 'readings again.',
    })
  }
  return {
    ok: true,
    slope,
    slopeMmPerCount: slope * 1000,
    offset,
    offsetMm: offset * 1000,
    countsPerMeter: slope !== 0 ? 1 / Math.abs(slope) : null,
    direction: slope < 0 ? -1 : 1,
    r2,
    residuals,
    worstResidual: worst,
    used: use.length,
    issues,
  }
}

/** A ruler's resolution, mm: residuals are shown to the nearest half millimetre. */
export const RULER_MM = 0.5

/** A length in metres as a ruler reads it: mm to the nearest RULER_MM, never "−0". */
export function rulerMm(meters: number): number {
  const mm = Math.round((meters * 1000) / RULER_MM) * RULER_MM
  return mm === 0 ? 0 : mm
}

/** One row of the panel as typed: the ADC reading and the position in mm, as text. */
export interface CalibrationRowText {
  reading: string
  positionMm: string
}

export interface CalibrationRows {
  /** The pairs to fit, in row order (rows with an error or left blank are not among them). */
  pairs: CalibrationPair[]
  /** The row each pair came from. */
  rowOfPair: number[]
  /** Per row: what is wrong with it, or null. A blank row has no error and no pair. */
  rowErrors: (string | null)[]
}

/** A number as typed: digits with an optional point (or a decimal comma) and sign; else null. */
export function parseTypedNumber(text: string): number | null {
  let t = text.trim()
  if (!t.includes('.') && /^[-+]?\d*,\d+$/.test(t)) t = t.replace(',', '.')
  t = t.replace(/^−/, '-')
  if (!/^[-+]?(\d+\.?\d*|\.\d+)(e[-+]?\d+)?$/i.test(t)) return null
  const v = Number(t)
  return Number.isFinite(v) ? v : null
}

/**
 * The panel's rows to pairs. A value that is not a number, or a row with only one of its two
 * values, is an error on that row (never silently dropped); a row with both blank is unused.
 */
export function readCalibrationRows(rows: readonly CalibrationRowText[]): CalibrationRows {
  const out: CalibrationRows = { pairs: [], rowOfPair: [], rowErrors: [] }
  rows.forEach((row, i) => {
    const readingText = row.reading.trim()
    const positionText = row.positionMm.trim()
    if (readingText === '' && positionText === '') {
      out.rowErrors.push(null)
      return
    }
    const reading = parseTypedNumber(readingText)
    const positionMm = parseTypedNumber(positionText)
    const problems: string[] = []
    if (readingText === '') problems.push('the ADC reading is missing')
    else if (reading === null) problems.push(`the ADC reading “${readingText}” is not a number`)
    if (positionText === '') problems.push('the position is missing')
    else if (positionMm === null) problems.push(`the position “${positionText}” is not a number`)
    if (problems.length > 0) {
      const words = problems.join(' and ')
      out.rowErrors.push(
        `Row ${i + 1}: ${words}. Type it as digits (like 512 or 120.5), or remove the row.`,
      )
      return
    }
    out.rowErrors.push(null)
    out.pairs.push({ reading: reading!, position: positionMm! / 1000 })
    out.rowOfPair.push(i)
  })
  return out
}

/** A share of the ADC range this far over 1 is measuring error, and the plan uses 1. */
const SPAN_TOLERANCE = 0.02

export type PlanFromFit
  = | {
    ok: true
    /** V_span/V_ref for the plan, ≤ 1. */
    sensorSpanRatio: number
    /** The track reads backwards (the firmware flips the reading). */
    sensorReversed: boolean
    /** What using the fit changes, in plain words. */
    notes: string[]
  }
  | {
    ok: false
    /** The fitted share of the ADC range, > 1. */
    spanRatio: number | null
    /** Why it cannot be used and what to fix. */
    message: string
  }

/**
 * What a fit changes in the plan: the share of the ADC range the rail spans (k_s = 2^bits·share /
 * sensed length, docs/planner-model.md §1) and the track's direction. A share over 1 is never
 * capped: it means the ball covers more counts per millimetre than the whole ADC range could over
 * the sensed length, so the length, a reading or the ADC's bits are wrong.
 */
export function planInputsFromFit(
  fit: CalibrationFit,
  adcBits: number,
  sensorLength: number,
): PlanFromFit {
  if (!fit.ok || fit.countsPerMeter === null || fit.direction === null) {
    return {
      ok: false,
      spanRatio: null,
      message: 'There is no calibration line to use yet: check the readings first.',
    }
  }
  const span = (fit.countsPerMeter * sensorLength) / 2 ** adcBits
  const lengthMm = fmt(sensorLength * 1000, 4)
  if (span > 1 + SPAN_TOLERANCE) {
    return {
      ok: false,
      spanRatio: span,
      message:
        `The readings change by ${fmt(fit.countsPerMeter / 1000, 3)} counts per mm, so ${lengthMm} `
        + `mm of rail would need ${fmt(span, 3)} times the ADC's whole range, and no rail can `
        + `span more than all of it. The plan is left as it was. Check the sensor length in the `
        + `rig (the length of rail on which the ball is read, from one end of the track to the `
        + `other: ${fmt(sensorLength * 1000 / span, 3)} mm would fit these readings), the ADC's `
        + `bits (${adcBits}), and that each position was measured from the same end.`,
    }
  }
  const notes: string[] = []
  const ratio = Number(Math.min(1, span).toPrecision(4))
  if (span > 1) {
    notes.push(
      `The fit gives a share of ${fmt(span, 3)} of the ADC range, just over all of it: that is `
      + 'within measuring error, so the plan uses 1.',
    )
  }
  const reversed = fit.direction === -1
  notes.push(
    reversed
      ? 'The track reads backwards, so the plan now flips the reading: the firmware constants '
      + 'carry TW_READING_SIGN −1. If you swap the rail\'s end wires instead, take the readings '
      + 'again and use the new line.'
      : 'The track reads the right way round (TW_READING_SIGN 1).',
  )
  return { ok: true, sensorSpanRatio: ratio, sensorReversed: reversed, notes }
}
