import { describe, expect, it } from 'vitest'
import { REFERENCE_RIG } from './fixtures'
import {
  beamAngleRange,
  derivativeCoefficients,
  firmwareConstants,
  type Gains,
} from '../../../shared/utils/planner'

const rig = REFERENCE_RIG // 50 Hz, 2560 counts/m
const DEG = 180 / Math.PI

describe('firmwareConstants', () => {
  const gains: Gains = { kp: 7.2, kd: 3.8, ki: 1.5, n: 10, derivativeOn: 'measurement' }

  it('uses backward Euler by default and converts every gain to servo degrees per count', () => {
    const fw = firmwareConstants(rig, gains)
    const tf = 3.8 / (10 * 7.2)
    expect(fw.discretization).toBe('backward-euler')
    expect(fw.tf).toBeCloseTo(tf, 14)
    expect(fw.a).toBeCloseTo(tf / (tf + 0.02), 14)
    expect(fw.b).toBeCloseTo(3.8 / (tf + 0.02), 12)
    expect(fw.kiT).toBeCloseTo(1.5 * 0.02, 14)
    expect(fw.kpDegPerMm).toBeCloseTo((7.2 * DEG) / 1000, 12)
    expect(fw.kpDegPerCount).toBeCloseTo((7.2 * DEG) / 2560, 12)
    expect(fw.bDegPerCount).toBeCloseTo((fw.b * DEG) / 2560, 12)
    expect(fw.kiTDegPerCount).toBeCloseTo((0.03 * DEG) / 2560, 12)
    // The lever folds back at about 79°, before the servo's 90°: the clamp sits at the fold.
    expect(fw.servoLimitDeg).toBeCloseTo(beamAngleRange(rig).maxAtServoAngle * DEG, 12)
    expect(fw.servoLimitDeg).toBeLessThan(90)
    expect(
      firmwareConstants({ ...rig, drive: 'direct', gearRatio: 20 }, gains).servoLimitDeg,
    ).toBeCloseTo(90, 12)
    expect(fw.warnings).toEqual([])
  })

  it('writes a C block and a JSON object that state the loop rate and units', () => {
    const fw = firmwareConstants(rig, gains)
    expect(fw.cSource).toContain('#define TW_LOOP_RATE_HZ     50.0f')
    expect(fw.cSource).toContain(
      `#define TW_KP               ${Number(fw.kpDegPerCount.toPrecision(7))}f`,
    )
    expect(fw.cSource).toContain(`#define TW_D_A              ${Number(fw.a.toPrecision(7))}f`)
    expect(fw.cSource).toMatch(/derivative on measurement, backward Euler/)
    expect(fw.cSource).toMatch(/s = -reading/)
    expect(fw.json.loopRateHz).toBe(50)
    expect(fw.json.kpDegPerCount).toBe(fw.kpDegPerCount)
    expect(fw.json.units.kpDegPerCount).toMatch(/degrees per ADC count/)
    expect(fw.json.units.loopRateHz).toBe('Hz')
    expect(JSON.parse(JSON.stringify(fw.json))).toEqual(fw.json)
  })

  it('gives Tustin constants when the filter is long enough (T_f ≥ T/2)', () => {
    const slow: Gains = { ...gains, n: 2 } // T_f = 0.264 s ≥ 0.01 s
    const fw = firmwareConstants(rig, slow, { discretization: 'tustin' })
    const tf = 3.8 / (2 * 7.2)
    expect(fw.discretization).toBe('tustin')
    expect(fw.a).toBeCloseTo((2 * tf - 0.02) / (2 * tf + 0.02), 14)
    expect(fw.b).toBeCloseTo((2 * 3.8) / (2 * tf + 0.02), 12)
    expect(fw.warnings).toEqual([])
  })

  it('refuses Tustin when T_f < T/2, warns, and falls back to backward Euler', () => {
    const sharp: Gains = { ...gains, kd: 0.05, n: 20 } // T_f = 0.35 ms < 10 ms
    const fw = firmwareConstants(rig, sharp, { discretization: 'tustin' })
    expect(derivativeCoefficients(0.05, 0.05 / (20 * 7.2), 0.02, 'tustin').ok).toBe(false)
    expect(fw.discretization).toBe('backward-euler')
    expect(fw.warnings.map(w => w.code)).toEqual(['tustin-refused'])
    expect(fw.a).toBeGreaterThanOrEqual(0)
    expect(fw.cSource).toMatch(/backward Euler/)
  })

  it('says so when the derivative acts on the error', () => {
    const fw = firmwareConstants(rig, { ...gains, derivativeOn: 'error' })
    expect(fw.cSource).toMatch(/s = error/)
    expect(fw.json.derivativeOn).toBe('error')
  })
})
