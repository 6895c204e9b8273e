import { describe, expect, it } from 'vitest'
import { REFERENCE_RIG, REFERENCE_TARGETS } from './fixtures'
import {
  compareProportionalAndPd,
  planGains,
  plantOf,
  WARNING_CODES,
  type GainPlan,
  type Rig,
  type Targets,
  type WarningCode,
} from '../../../shared/utils/planner'

const rig: Rig = REFERENCE_RIG // τ_eff = 40 ms + 30 ms = 70 ms
const codes = (p: GainPlan) => p.warnings.map(w => w.code)
const seen = new Set<WarningCode>()
function plan(r: Rig, t: Partial<Targets> = {}) {
  const p = planGains(r, { ...REFERENCE_TARGETS, ...t })
  for (const c of codes(p)) seen.add(c)
  return p
}

describe('planGains', () => {
  it('suggests lag-aware PD gains by the §3 placement and checks them', () => {
    const p = plan(rig)
    const { kb, effectiveLag: tau } = plantOf(rig)
    const zeta = p.zeta
    const wn = p.wn
    expect(wn).toBeCloseTo(4 / (zeta * 3.5), 12)
    const p3 = 1 / tau - 2 * zeta * wn
    expect(p.p3).toBeCloseTo(p3, 12)
    expect(p.gains!.kp).toBeCloseTo((tau * wn * wn * p3) / kb, 10)
    expect(p.gains!.kd).toBeCloseTo((tau * (wn * wn + 2 * zeta * wn * p3)) / kb, 10)
    expect(p.gains!.ki).toBe(0)
    expect(p.feasible).toBe(true)
    expect(p.analysis!.stable).toBe(true)
    expect(p.analysis!.phaseMarginDeg!).toBeGreaterThan(30)
    expect(p.analysis!.gainMarginDb!).toBeGreaterThan(6)
    expect(p.firmware!.kpDegPerCount).toBeCloseTo(
      (p.gains!.kp * 180) / Math.PI / plantOf(rig).countsPerMeter,
      12,
    )
    expect(p.limits!.maxStep!).toBeGreaterThan(0)
    expect(p.warnings.filter(w => w.severity !== 'info')).toEqual([])
  })

  it('the plant block carries the contract fields', () => {
    const p = plan(rig)
    for (const k of [
      'eta',
      'rollingRadius',
      'kb',
      'servoLag',
      'effectiveLag',
      'countsPerMeter',
    ] as const) {
      expect(Number.isFinite(p.plant[k])).toBe(true)
    }
    expect(p.plant.effectiveLag).toBeCloseTo(0.04 + 0.03, 12)
  })

  it(
    'says so when the targets are infeasible: no gains, the fastest T_s and the '
    + 'recommended one', () => {
      const p = plan(rig, { settlingTime: 0.5 }) // 8·τ_eff = 0.56 s
      expect(p.feasible).toBe(false)
      expect(p.gains).toBeNull()
      expect(p.analysis).toBeNull()
      expect(p.firmware).toBeNull()
      expect(p.p3!).toBeLessThanOrEqual(0)
      expect(p.fastestSettlingTime).toBeCloseTo(8 * 0.07, 12)
      expect(p.recommendedSettlingTime).toBeCloseTo(28 * 0.07, 12)
      const w = p.warnings.find(x => x.code === 'targets-infeasible')!
      expect(w.severity).toBe('danger')
      expect(w.message).toContain('0.56 s')
      expect(w.message).toContain('1.96 s')
    })

  it('warns that the real pole is close between 8·τ_eff and 28·τ_eff', () => {
    expect(codes(plan(rig, { settlingTime: 1.5 }))).toContain('real-pole-close')
    expect(codes(plan(rig, { settlingTime: 2.0 }))).not.toContain('real-pole-close')
  })

  it('refuses gains the formulas give but the exact check finds unstable', () => {
    const p = plan(rig, { settlingTime: 0.6, derivativeFilterN: 2, overshootPct: 30 })
    expect(p.p3!).toBeGreaterThan(0)
    expect(p.feasible).toBe(false)
    expect(p.gains).toBeNull()
    expect(p.rejectedGains).not.toBeNull()
    expect(codes(p)).toContain('suggestion-unstable')
  })

  it('P only: not feasible, no gains, and why', () => {
    const p = plan(rig, { form: 'P' })
    expect(p.feasible).toBe(false)
    expect(p.gains).toBeNull()
    expect(p.warnings.find(w => w.code === 'p-only-cannot-settle')!.message).toMatch(
      /swings for ever/,
    )
  })

  it(
    'PID: the lag-aware placement with p_i = 0.25·ω_n, integral anti-windup advice, '
    + 'overshoot noted', () => {
      const p = plan(rig, { form: 'PID' })
      const { kb, effectiveLag: tau } = plantOf(rig)
      const sw = 2 * p.zeta * p.wn
      const pi = 0.25 * p.wn
      const p3 = 1 / tau - sw - pi
      expect(p.integralPole).toBeCloseTo(pi, 12)
      expect(p.p3).toBeCloseTo(p3, 12)
      expect(p.gains!.ki).toBeCloseTo((tau * p.wn ** 2 * p3 * pi) / kb, 10)
      expect(p.gains!.kp).toBeCloseTo((tau * (sw * p3 * pi + p.wn ** 2 * (p3 + pi))) / kb, 10)
      expect(p.gains!.kd).toBeCloseTo((tau * (p3 * pi + sw * (p3 + pi) + p.wn ** 2)) / kb, 10)
      expect(codes(p)).toContain('integral-windup')
      expect(p.analysis!.gainReductionMarginDb!).toBeLessThan(0)
    })

  it('ideal method: Kp = ω_n²/K_b, Kd = 2ζω_n/K_b, and it flags what the lag does to it', () => {
    const p = plan(rig, { method: 'ideal', settlingTime: 1 })
    const { kb } = plantOf(rig)
    expect(p.gains!.kp).toBeCloseTo(p.wn ** 2 / kb, 10)
    expect(p.gains!.kd).toBeCloseTo((2 * p.zeta * p.wn) / kb, 10)
    expect(codes(p)).toEqual(
      expect.arrayContaining([
        'ideal-ignores-lag',
        'low-gain-margin',
        'low-phase-margin',
        'targets-missed',
      ]),
    )
  })

  it('derivative on error overshoots more than on measurement and says why', () => {
    const onMeasurement = plan(rig)
    const onError = plan(rig, { derivativeOn: 'error' })
    expect(onError.analysis!.step.overshootPct!).toBeGreaterThan(
      onMeasurement.analysis!.step.overshootPct! + 10,
    )
    expect(onError.analysis!.step.peakCommandPerMeter!).toBeGreaterThan(
      onMeasurement.analysis!.step.peakCommandPerMeter!,
    )
    expect(codes(onError)).toContain('derivative-on-error')
  })

  it('limits: a step too big for the servo’s travel and speed', () => {
    const p = plan(rig, { stepSize: 0.39 })
    expect(p.limits!.maxStepTravel!).toBeLessThan(0.39)
    expect(p.limits!.maxStepSlew!).toBeLessThan(0.39)
    expect(p.limits!.maxStep).toBe(Math.min(p.limits!.maxStepTravel!, p.limits!.maxStepSlew!))
    expect(codes(p)).toEqual(expect.arrayContaining(['step-exceeds-travel', 'step-exceeds-slew']))
    // the travel limit is the usable travel over the peak command per metre
    expect(p.limits!.maxStepTravel! * p.analysis!.step.peakCommandPerMeter!).toBeCloseTo(
      p.limits!.usableServoTravel,
      12,
    )
    // servo jump per ADC count ≈ Kp(1 + N)/k_s
    expect(p.limits!.servoJumpPerCount).toBeCloseTo((p.gains!.kp * 11) / 2560, 12)
  })

  it('servo jump per ADC count: a coarse ADC and a sharp derivative', () => {
    const p = plan({ ...rig, adcBits: 8 }, { derivativeFilterN: 20 })
    expect(p.limits!.servoJumpPerCountDeg).toBeGreaterThan(2)
    expect(codes(p)).toContain('servo-jump-per-count')
  })

  it('rules of thumb: loop rate, servo bandwidth, analog servo update', () => {
    const slowLoop = plan({ ...rig, loopRate: 20 }, { settlingTime: 2.5 })
    expect(codes(slowLoop)).toContain('loop-rate-low')
    const slowServo = plan({ ...rig, servoSecondsPer60: 0.3 }, { settlingTime: 4 })
    const w = slowServo.warnings.find(x => x.code === 'servo-too-slow')!
    expect(w.severity).toBe('warning')
    expect(codes(plan({ ...rig, loopRate: 100, servoType: 'analog' }))).toContain(
      'analog-servo-frame',
    )
    expect(codes(plan({ ...rig, loopRate: 100, servoType: 'digital' }))).not.toContain(
      'analog-servo-frame',
    )
    const twitchy = plan(rig, { settlingTime: 1.2, overshootPct: 35 })
    expect(twitchy.analysis!.delayMargin!).toBeLessThan(0.02)
    expect(codes(twitchy)).toContain('analog-servo-delay')
    expect(
      codes(plan({ ...rig, servoType: 'digital' }, { settlingTime: 1.2, overshootPct: 35 })),
    ).not.toContain('analog-servo-delay')
  })

  it('a glass ball cannot be sensed; a short pushrod cannot follow the servo', () => {
    expect(
      plan({ ...rig, ballMaterial: 'glass' }).warnings.find(w => w.code === 'ball-not-sensed')!
        .severity,
    ).toBe('error')
    expect(codes(plan({ ...rig, pushrodLength: 0.02 }))).toContain('linkage-unreachable')
  })

  it('Tustin on request, refused with a warning when T_f < T/2', () => {
    expect(
      plan(rig, { discretization: 'tustin', derivativeFilterN: 2 }).firmware!.discretization,
    ).toBe('tustin')
    const refused = plan(rig, { discretization: 'tustin', derivativeFilterN: 100 })
    expect(refused.firmware!.discretization).toBe('backward-euler')
    expect(codes(refused)).toContain('tustin-refused')
  })

  it('every warning code is reachable (the tests above raise each one)', () => {
    expect([...seen].sort()).toEqual([...WARNING_CODES].sort())
  })
})

describe('compareProportionalAndPd', () => {
  it('shows P only swinging and growing next to a settling PD with the same Kp', () => {
    const c = compareProportionalAndPd(rig, REFERENCE_TARGETS)
    expect(c.pOnly.gains!.kp).toBe(c.pd.gains!.kp)
    expect(c.pOnly.gains!.kd).toBe(0)
    expect(c.pOnly.analysis!.stable).toBe(false)
    expect(c.pd.analysis!.stable).toBe(true)
    const o = c.pOnly.oscillation
    expect(o.idealFrequency).toBeCloseTo(Math.sqrt(plantOf(rig).kb * c.pOnly.gains!.kp), 12)
    expect(o.growthRate).toBeGreaterThan(0)
    expect(o.frequency).toBeGreaterThan(0.8 * o.idealFrequency)
    expect(o.frequency).toBeLessThan(1.2 * o.idealFrequency)
    // the drawn P-only response swings wider late than early, at the predicted rate
    const x = c.pOnly.response!.x
    const t = c.pOnly.response!.t
    const swing = (from: number, to: number) =>
      Math.max(...x.filter((_, i) => t[i]! >= from && t[i]! < to).map(v => Math.abs(v - 1)))
    const early = swing(o.idealPeriod, 2 * o.idealPeriod)
    const late = swing(c.duration - o.idealPeriod, c.duration)
    const grown = Math.exp(o.growthRate * (c.duration - 2 * o.idealPeriod))
    expect(late / early).toBeGreaterThan(0.7 * grown)
    expect(late / early).toBeLessThan(1.4 * grown)
    // PD settles
    expect(Math.abs(c.pd.response!.x.at(-1)! - 1)).toBeLessThan(0.02)
  })
})
