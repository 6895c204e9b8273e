// What the planner says must agree with the numbers it shows (docs/planner-model.md §3–4).
import { describe, expect, it } from 'vitest'
import { REFERENCE_RIG, REFERENCE_TARGETS } from './fixtures'
import {
  DEFAULT_TARGETS,
  KIT_PRESETS,
  planGains,
  plantOf,
  sampledLoopOf,
  sampledStepResponse,
  TARGET_TOLERANCE,
  type Targets,
} from '../../../shared/utils/planner'

describe('the kit presets are not flagged as marginal', () => {
  for (const preset of KIT_PRESETS) {
    for (const form of ['PD'] as const) {
      it(`${preset.id}, ${form}: no servo or loop-rate warning, margins shown, stable`, () => {
        const p = planGains(preset.rig, { ...DEFAULT_TARGETS, form })
        expect(p.feasible).toBe(true)
        const codes = p.warnings.map(w => w.code)
        expect(codes).not.toContain('servo-too-slow')
        expect(codes).not.toContain('loop-rate-low')
        expect(p.warnings.filter(w => w.severity === 'error')).toEqual([])
        // the servo really is at least 5 × faster than the ball loop
        expect(1 / p.plant.servoLag / p.analysis!.closedLoopBandwidth!).toBeGreaterThan(5)
      })
    }
  }
})

describe('PID meets its own targets or says why (docs/planner-model.md §3)', () => {
  const cases: [string, Targets][] = [
    ...KIT_PRESETS.map((k): [string, Targets] => [k.id, { ...DEFAULT_TARGETS, form: 'PID' }]),
    ['reference rig, 20 s, 5 %', { ...REFERENCE_TARGETS, form: 'PID', settlingTime: 20,
      overshootPct: 5 }],
    ['reference rig, 8 s, 20 %', { ...REFERENCE_TARGETS, form: 'PID', settlingTime: 8,
      overshootPct: 20 }],
  ]
  for (const [name, targets] of cases) {
    it(name, () => {
      const rig = KIT_PRESETS.find(k => k.id === name)?.rig ?? REFERENCE_RIG
      const p = planGains(rig, targets)
      expect(p.feasible).toBe(true)
      const { overshootPct: os, settlingTime: ts } = p.analysis!.step
      const met = os! <= targets.overshootPct + TARGET_TOLERANCE.overshootPct
        && ts! <= targets.settlingTime * (1 + TARGET_TOLERANCE.settling)
      const missed = p.warnings.find(w => w.code === 'targets-missed')
      if (met) expect(missed).toBeUndefined()
      else expect(missed!.message).toContain('did not meet both targets')
    })
  }
  it('the refinement meets targets the placement alone misses', () => {
    const t: Targets = { ...REFERENCE_TARGETS, form: 'PID', settlingTime: 20, overshootPct: 5 }
    const p = planGains(REFERENCE_RIG, t)
    expect(p.refined).toBe(true)
    expect(p.analysis!.step.overshootPct!).toBeLessThanOrEqual(5.5)
    expect(p.analysis!.step.settlingTime!).toBeLessThanOrEqual(20 * 1.02)
  })
})

describe('the advice', () => {
  it('a slow servo is told that 10 × or more is comfortable', () => {
    const p = planGains({ ...REFERENCE_RIG, servoSecondsPer60: 0.3 }, REFERENCE_TARGETS)
    const w = p.warnings.find(x => x.code === 'servo-too-slow')!
    expect(w.severity).toBe('warning')
    expect(w.message).toContain('10 × or more is comfortable')
    expect(w.message).not.toMatch(/5–10/)
  })

  it('targets faster than the lag allows: the reason asks for a settling time that works', () => {
    const p = planGains(REFERENCE_RIG, { ...REFERENCE_TARGETS, settlingTime: 0.5 })
    expect(p.feasible).toBe(false)
    expect(p.reason).toContain('No gains can make this rig settle in 0.5 s')
    const x = p.recommendedSettlingTime!
    expect(p.reason).toContain(`Ask for ${x.toFixed(2)} s or more`)
    const again = planGains(REFERENCE_RIG, { ...REFERENCE_TARGETS, settlingTime: x })
    expect(again.feasible).toBe(true)
  })

  it('gains the check refuses: the reason says the check failed, never "ask for X s"', () => {
    // the ideal method ignores the 70 ms of lag; with a heavy filter (N = 1) its gains fail
    const p = planGains(REFERENCE_RIG, {
      ...REFERENCE_TARGETS,
      method: 'ideal',
      derivativeFilterN: 1,
      settlingTime: 2.5,
      overshootPct: 30,
    })
    expect(p.feasible).toBe(false)
    expect(p.rejectedGains).not.toBeNull()
    expect(p.reason).toContain('finds them unstable')
    expect(p.reason).not.toMatch(/Ask for [0-9]/)
    expect(p.reason).not.toContain('cannot make this rig settle')
  })

  it('a linkage that cannot be built is an error, with or without gains', () => {
    for (const form of ['PD', 'P'] as const) {
      const p = planGains({ ...REFERENCE_RIG, pushrodLength: 0.02 }, { ...REFERENCE_TARGETS, form })
      const w = p.warnings.find(x => x.code === 'linkage-unreachable')!
      expect(w.severity).toBe('error')
    }
  })
})

describe('P only (docs/planner-model.md §3)', () => {
  it('gives the method\'s P gains to draw and says why they are not suggested', () => {
    const p = planGains(REFERENCE_RIG, { ...REFERENCE_TARGETS, form: 'P' })
    expect(p.feasible).toBe(false)
    expect(p.gains).toBeNull()
    const { kb } = plantOf(REFERENCE_RIG)
    expect(p.proportional!.kp).toBeCloseTo((p.wn * p.wn) / kb, 12)
    expect(p.proportional!.kd).toBe(0)
    expect(p.proportional!.ki).toBe(0)
    expect(p.reason).toContain('P-only controller cannot settle')
    expect(planGains(REFERENCE_RIG, REFERENCE_TARGETS).proportional).toBeNull()
  })

  it('those gains, simulated, swing without decaying', () => {
    const p = planGains(REFERENCE_RIG, { ...REFERENCE_TARGETS, form: 'P' })
    const plant = plantOf(REFERENCE_RIG)
    const r = sampledStepResponse(sampledLoopOf(plant, p.proportional!), 30, 1)
    // the swing's peaks about the setpoint (1): each at least as large as the one before
    const peaks: number[] = []
    for (let i = 1; i < r.x.length - 1; i++) {
      const d = Math.abs(r.x[i]! - 1)
      if (d > Math.abs(r.x[i - 1]! - 1) && d >= Math.abs(r.x[i + 1]! - 1)) peaks.push(d)
    }
    expect(peaks.length).toBeGreaterThan(4)
    for (let i = 1; i < peaks.length; i++) expect(peaks[i]!).toBeGreaterThanOrEqual(peaks[i - 1]!)
    expect(peaks.at(-1)!).toBeGreaterThan(1)
  })
})
