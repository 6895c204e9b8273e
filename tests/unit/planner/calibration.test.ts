import { describe, expect, it } from 'vitest'
import { fitCalibration } from '../../../shared/utils/planner'

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
