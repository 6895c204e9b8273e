import { describe, expect, it } from 'vitest'
import {
  firmwareConstants,
  fitCalibration,
  parseTypedNumber,
  planInputsFromFit,
  readCalibrationRows,
  rulerMm,
} from '../../../shared/utils/planner'
import { REFERENCE_RIG } from './fixtures'

// A 10-bit rail over 0.4 m: 2560 counts/m, 30 mm of dead rail before count 0.
const line = (reading: number) => 0.03 + reading / 2560

describe('fitCalibration', () => {
  it('recovers slope and offset of a clean line by least squares', () => {
    const pairs = [100, 300, 500, 700, 900].map(reading => ({ reading, position: line(reading) }))
    const fit = fitCalibration(pairs, 10)
    expect(fit.ok).toBe(true)
    expect(fit.slope).toBeCloseTo(1 / 2560, 12)
    expect(fit.slopeMmPerCount).toBeCloseTo(1000 / 2560, 9)
    expect(fit.offset).toBeCloseTo(0.03, 12)
    expect(fit.countsPerMeter).toBeCloseTo(2560, 6)
    expect(fit.r2).toBeCloseTo(1, 12)
    expect(fit.issues).toEqual([])
    for (const r of fit.residuals) expect(Math.abs(r!)).toBeLessThan(1e-12)
  })

  it('matches the normal equations on noisy data, with residuals and the worst one', () => {
    const noise = [0.0004, -0.0002, 0.0001, -0.0005, 0.0003]
    const pairs = [120, 310, 480, 700, 880].map((reading, i) => ({
      reading,
      position: line(reading) + noise[i]!,
    }))
    const fit = fitCalibration(pairs, 10)
    const n = pairs.length
    const sx = pairs.reduce((a, p) => a + p.reading, 0)
    const sy = pairs.reduce((a, p) => a + p.position, 0)
    const sxx = pairs.reduce((a, p) => a + p.reading * p.reading, 0)
    const sxy = pairs.reduce((a, p) => a + p.reading * p.position, 0)
    const slope = (n * sxy - sx * sy) / (n * sxx - sx * sx)
    expect(fit.slope).toBeCloseTo(slope, 12)
    expect(fit.offset).toBeCloseTo((sy - slope * sx) / n, 12)
    const res = pairs.map(p => p.position - (fit.slope! * p.reading + fit.offset!))
    fit.residuals.forEach((r, i) => expect(r).toBeCloseTo(res[i]!, 14))
    const worst = res.reduce((w, r, i) => (Math.abs(r) > Math.abs(res[w]!) ? i : w), 0)
    expect(fit.worstResidual!.index).toBe(worst)
    expect(fit.r2!).toBeGreaterThan(0.99)
    expect(fit.r2!).toBeLessThan(1)
  })

  it(
    'flags readings at 0 and at full scale (no ball, or a ball that does not conduct) '
    + 'and leaves them out', () => {
      const pairs = [
        { reading: 0, position: 0.01 },
        { reading: 200, position: line(200) },
        { reading: 600, position: line(600) },
        { reading: 1023, position: 0.42 },
        { reading: 800, position: line(800) },
      ]
      const fit = fitCalibration(pairs, 10)
      expect(fit.used).toBe(3)
      expect(fit.slope).toBeCloseTo(1 / 2560, 12)
      expect(fit.residuals[0]).toBeNull()
      expect(fit.residuals[3]).toBeNull()
      const codes = fit.issues.map(i => [i.code, i.index])
      expect(codes).toContainEqual(['reading-at-zero', 0])
      expect(codes).toContainEqual(['reading-at-full-scale', 3])
      expect(fit.issues.find(i => i.code === 'reading-at-zero')!.message).toMatch(
        /does not conduct|glass|plastic/,
      )
    })

  it('flags a reading a 10-bit ADC cannot give', () => {
    const fit = fitCalibration(
      [
        { reading: 1500, position: 0.2 },
        { reading: 100, position: line(100) },
        { reading: 900, position: line(900) },
      ],
      10,
    )
    expect(fit.issues.map(i => i.code)).toContain('reading-outside-adc-range')
    expect(fit.used).toBe(2)
  })

  it('points at an outlier and a poor fit', () => {
    const pairs = [100, 250, 400, 550, 700, 850].map(reading => ({
      reading,
      position: line(reading),
    }))
    pairs[2] = { reading: 400, position: line(400) + 0.02 }
    const fit = fitCalibration(pairs, 10)
    expect(fit.worstResidual!.index).toBe(2)
    expect(fit.issues.find(i => i.code === 'outlier')?.index).toBe(2)
    expect(fit.issues.map(i => i.code)).toContain('poor-fit')
  })

  it('refuses to fit without two distinct good readings', () => {
    expect(
      fitCalibration(
        [
          { reading: 0, position: 0 },
          { reading: 500, position: 0.2 },
        ],
        10,
      ).ok,
    ).toBe(false)
    const same = fitCalibration(
      [
        { reading: 500, position: 0.2 },
        { reading: 500, position: 0.21 },
      ],
      10,
    )
    expect(same.ok).toBe(false)
    expect(same.issues.map(i => i.code)).toContain('readings-identical')
  })
})

describe('a track that reads backwards', () => {
  // Readings that fall as the ball moves toward +x: the same line as a forward track, mirrored.
  const positions = [0.05, 0.15, 0.25, 0.35]
  const forward = positions.map(p => ({ reading: 100 + p * 2000, position: p }))
  const backward = positions.map(p => ({ reading: 923 - p * 2000, position: p }))

  it('keeps the direction and says what to do, with the same counts per metre', () => {
    const fwd = fitCalibration(forward, 10)
    const back = fitCalibration(backward, 10)
    expect(fwd.direction).toBe(1)
    expect(fwd.issues.map(i => i.code)).not.toContain('reads-backwards')
    expect(back.ok).toBe(true)
    expect(back.direction).toBe(-1)
    expect(back.slope!).toBeLessThan(0)
    expect(back.countsPerMeter).toBeCloseTo(fwd.countsPerMeter!, 9)
    const issue = back.issues.find(i => i.code === 'reads-backwards')
    expect(issue?.message).toMatch(/reads backwards/)
    // What to do: swap the end wires, or flip the reading against the ADC's full scale.
    expect(issue?.message).toMatch(/swap the two wires/)
    expect(issue?.message).toContain('reading = 1023 − raw reading')
  })

  it('has no direction without a fit', () => {
    expect(fitCalibration([{ reading: 300, position: 0.1 }], 10).direction).toBeNull()
  })
})

describe('the rows as typed (docs/planner-model.md §6)', () => {
  const row = (reading: string, positionMm: string) => ({ reading, positionMm })

  it('reads numbers strictly: a decimal comma or a typographic minus, but never "12abc"', () => {
    expect(parseTypedNumber(' 512 ')).toBe(512)
    expect(parseTypedNumber('120.5')).toBe(120.5)
    expect(parseTypedNumber('120,5')).toBe(120.5)
    expect(parseTypedNumber('−3')).toBe(-3)
    expect(parseTypedNumber('.5')).toBe(0.5)
    for (const bad of ['12abc', 'abc', '', '1.2.3', '1,000.5', 'NaN', 'Infinity', '0x10'])
      expect(parseTypedNumber(bad), bad).toBeNull()
  })

  it('a non-numeric value is an error on its row, never a silently dropped row', () => {
    const r = readCalibrationRows([
      row('102', '40'),
      row('31O', '120'), // a letter O typed for a zero
      row('512', ''),
      row('', ''),
      row('716', '280'),
    ])
    expect(r.pairs).toEqual([
      { reading: 102, position: 0.04 },
      { reading: 716, position: 0.28 },
    ])
    expect(r.rowOfPair).toEqual([0, 4])
    expect(r.rowErrors[0]).toBeNull()
    expect(r.rowErrors[1]).toBe(
      'Row 2: the ADC reading “31O” is not a number. Type it as digits (like 512 or 120.5), or '
      + 'remove the row.',
    )
    expect(r.rowErrors[2]).toMatch(/^Row 3: the position is missing/)
    expect(r.rowErrors[3]).toBeNull() // blank: unused, nothing to report
    expect(r.rowErrors[4]).toBeNull()
  })

  it('names both problems of a row', () => {
    expect(readCalibrationRows([row('x', 'y')]).rowErrors[0]).toMatch(
      /“x” is not a number and the position “y” is not a number/,
    )
  })
})

describe('residuals as a ruler reads them', () => {
  it('rounds to the nearest half millimetre', () => {
    const metres = [0.0002, -0.00024, 0.00026, 0.0007, -0.00096, 0.0013, -0.0001]
    expect(metres.map(rulerMm)).toEqual([0, 0, 0.5, 0.5, -1, 1.5, 0])
  })

  it('the outlier message gives its distance as a ruler reads it', () => {
    const pairs = [100, 250, 400, 550, 700, 850].map(reading => ({
      reading,
      position: line(reading),
    }))
    pairs[2] = { reading: 400, position: line(400) + 0.02 }
    const issue = fitCalibration(pairs, 10).issues.find(i => i.code === 'outlier')!
    expect(issue.message).toMatch(/is about \d+(\.5)? mm off the line/)
  })
})

describe('using the fit in the plan', () => {
  // The 10-bit line above: 2560 counts per metre.
  const pairs = [100, 300, 500, 700, 900].map(reading => ({ reading, position: line(reading) }))
  const fit = fitCalibration(pairs, 10)

  it('gives the share of the ADC range the rail spans: 2560 counts/m over 0.3 m of 1024', () => {
    const p = planInputsFromFit(fit, 10, 0.3)
    expect(p.ok).toBe(true)
    if (!p.ok) return
    expect(p.sensorSpanRatio).toBeCloseTo(0.75, 4)
    expect(p.sensorReversed).toBe(false)
  })

  it('never caps a share over 1: it says what that means and what to fix', () => {
    // 2560 counts/m over 0.5 m would be 1.25 of a 10-bit range.
    const p = planInputsFromFit(fit, 10, 0.5)
    expect(p.ok).toBe(false)
    if (p.ok) return
    expect(p.spanRatio).toBeCloseTo(1.25, 9)
    expect(p.message).toMatch(/1\.25 times the ADC's whole range/)
    expect(p.message).toMatch(/sensor length/)
    expect(p.message).toMatch(/400 mm would fit these readings/) // 1024/2560 m
    expect(p.message).toMatch(/bits \(10\)/)
  })

  it('a share just over 1 is measuring error: it uses 1 and says so', () => {
    const p = planInputsFromFit(fit, 10, 0.404) // 1.01
    expect(p.ok).toBe(true)
    if (!p.ok) return
    expect(p.sensorSpanRatio).toBe(1)
    expect(p.notes[0]).toMatch(/1\.01 .* within measuring error, so the plan uses 1/)
  })

  it('carries a backwards track into the plan and the exported reading sign', () => {
    const back = fitCalibration(
      [100, 300, 500, 700, 900].map(r => ({ reading: 1023 - r, position: line(r) })),
      10,
    )
    const p = planInputsFromFit(back, 10, 0.4)
    expect(p.ok).toBe(true)
    if (!p.ok) return
    expect(p.sensorReversed).toBe(true)
    expect(p.notes.join(' ')).toMatch(/reads backwards.*TW_READING_SIGN −1/)
    const rig = { ...REFERENCE_RIG, sensorReversed: p.sensorReversed }
    const gains = { kp: 15, kd: 4, ki: 0, n: 10, derivativeOn: 'measurement' as const }
    expect(firmwareConstants(rig, gains).readingSign).toBe(-1)
    expect(firmwareConstants(REFERENCE_RIG, gains).readingSign).toBe(1)
  })

  it('refuses without a line', () => {
    const p = planInputsFromFit(fitCalibration([{ reading: 300, position: 0.1 }], 10), 10, 0.4)
    expect(p.ok).toBe(false)
  })
})
