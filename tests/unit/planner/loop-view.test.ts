// The loop view draws the sampled loop whose margins the planner shows (docs/planner-model.md §4).
import { describe, expect, it } from 'vitest'
import { REFERENCE_RIG, REFERENCE_TARGETS } from './fixtures'
import {
  analyzeLoop,
  bringUpSteps,
  BRING_UP_P_FRACTION,
  fmt,
  loopView,
  planGains,
  sampledLoopAt,
  sampledLoopOf,
  sampledResponseOf,
  plantOf,
} from '../../../shared/utils/planner'

describe('loopView', () => {
  for (const form of ['PD', 'PID'] as const) {
    it(`${form}: crossovers and Ms agree with the analysis; the curve is the sampled loop`, () => {
      const plan = planGains(REFERENCE_RIG, { ...REFERENCE_TARGETS, form })
      const a = plan.analysis!
      const v = loopView(REFERENCE_RIG, plan.gains!, { points: 300 })
      expect(v.stable).toBe(true)
      expect(v.gainCrossover).toBe(a.gainCrossover)
      expect(v.phaseCrossover).toBe(a.phaseCrossover)
      expect(v.sensitivityPeak).toBe(a.sensitivityPeak)
      expect(v.w).toHaveLength(300)
      expect(v.w.at(-1)).toBe(Math.PI * REFERENCE_RIG.loopRate)
      expect(v.nyquistFrequency).toBe(Math.PI * REFERENCE_RIG.loopRate)
      // Ms is the largest 1/|1 + L| anywhere on the drawn curve, and is reached near its frequency
      let drawnMax = 0
      v.w.forEach((w, i) => {
        const mag = 10 ** (v.magnitudeDb[i]! / 20)
        const ph = (v.phaseDeg[i]! * Math.PI) / 180
        const s = 1 / Math.hypot(1 + mag * Math.cos(ph), mag * Math.sin(ph))
        drawnMax = Math.max(drawnMax, s)
      })
      expect(drawnMax).toBeLessThanOrEqual(v.sensitivityPeak! * (1 + 1e-12))
      expect(drawnMax).toBeGreaterThan(v.sensitivityPeak! * 0.97)
      // the phase is unwrapped (no jumps) and starts in the integrators' quadrant
      for (let i = 1; i < v.phaseDeg.length; i++) {
        expect(Math.abs(v.phaseDeg[i]! - v.phaseDeg[i - 1]!)).toBeLessThan(90)
      }
      expect(v.phaseDeg[0]!).toBeLessThan(form === 'PD' ? -90 : -180)
      // 180° + the phase where |L| = 1 is the phase margin shown
      const s = sampledResponseOf(sampledLoopOf(plantOf(REFERENCE_RIG), plan.gains!))
      const [re, im] = sampledLoopAt(s, v.gainCrossover!)
      expect(Math.hypot(re, im)).toBeCloseTo(1, 9)
      expect(180 + (Math.atan2(im, re) * 180) / Math.PI).toBeCloseTo(a.phaseMarginDeg!, 9)
      expect(JSON.parse(JSON.stringify(v))).toEqual(v)
    })
  }

  it('an unstable loop has no sensitivity peak', () => {
    const g = planGains(REFERENCE_RIG, REFERENCE_TARGETS).gains!
    const bad = { ...g, kp: 20 * g.kp, kd: 20 * g.kd }
    expect(analyzeLoop(REFERENCE_RIG, bad).stable).toBe(false)
    const v = loopView(REFERENCE_RIG, bad)
    expect(v.stable).toBe(false)
    expect(v.sensitivityPeak).toBeNull()
    expect(v.sensitivityPeakFrequency).toBeNull()
  })
})

describe('bringUpSteps (docs/planner-model.md §12)', () => {
  const plan = planGains(REFERENCE_RIG, { ...REFERENCE_TARGETS, form: 'PID' })
  const f = plan.firmware!
  const steps = bringUpSteps(REFERENCE_RIG, plan.gains!, f)

  it('are in order, each with a caution', () => {
    expect(steps.map(s => s.id)).toEqual(['neutral', 'direction', 'p-only', 'suggested'])
    for (const s of steps) {
      expect(s.title.length).toBeGreaterThan(5)
      expect(s.caution).toMatch(/./)
    }
  })

  it('the neutral step: pushrod off with the power off, centre pulse and trim', () => {
    const s = steps[0]!
    expect(s.detail).toMatch(/power off and unhook the pushrod/)
    expect(s.detail).toContain(`${fmt(f.servoCenterUs)} µs`)
    expect(s.detail).toContain('TW_SERVO_TRIM_US')
    expect(s.caution).toMatch(/fingers clear of the horn/)
    expect(s.caution).toMatch(/school's own safety rules/)
  })

  it('the direction step names TW_READING_SIGN and the clamp', () => {
    const s = steps[1]!
    expect(s.detail).toContain('TW_READING_SIGN (now 1')
    expect(s.detail).toContain(`±${fmt(f.servoLimitDeg)}°`)
    expect(s.detail).toContain(`±${fmt(f.servoLimitUs)} µs`)
    const reversed = { ...REFERENCE_RIG, sensorReversed: true }
    const rf = planGains(reversed, REFERENCE_TARGETS).firmware!
    expect(rf.readingSign).toBe(-1)
    expect(bringUpSteps(reversed, plan.gains!, rf)[1]!.detail).toContain('TW_READING_SIGN (now −1')
  })

  it('P only at a third of Kp in the firmware\'s units, then the suggested gains', () => {
    expect(BRING_UP_P_FRACTION).toBeCloseTo(1 / 3, 15)
    expect(steps[2]!.detail).toContain(`TW_KP = ${fmt(f.kpDegPerCount / 3, 3)} °/count`)
    expect(steps[2]!.detail).toContain('TW_D_B = 0 and TW_KI_T = 0')
    expect(steps[2]!.caution).toMatch(/stalled servo gets hot and draws a large current/)
    expect(steps[2]!.caution).toMatch(/thrown/)
    expect(steps[3]!.detail).toContain(`TW_KP = ${fmt(f.kpDegPerCount, 3)} °/count`)
    expect(steps[3]!.detail).toContain(`TW_D_B = ${fmt(f.bDegPerCount, 3)} °/count`)
    expect(steps[3]!.detail).toContain(`TW_KI_T = ${fmt(f.kiTDegPerCount, 3)} °/count`)
  })
})
