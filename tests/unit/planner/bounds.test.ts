// Bounded inputs and exact step metrics (docs/planner-model.md §4): the metrics stop stepping once
// a Lyapunov bound proves nothing later can change them, and agree with stepping every sample to
// the horizon; inputs outside what the kits build are refused with the field's reason.
import { describe, expect, it } from 'vitest'
import { REFERENCE_RIG, REFERENCE_TARGETS } from './fixtures'
import {
  LOOP_RATE_RANGE,
  planGains,
  plantOf,
  rigSchema,
  sampledLoopOf,
  sampledStepMetrics,
  SETTLING_TIME_MAX,
  targetsSchema,
  type Rig,
  type Targets,
} from '../../../shared/utils/planner'

const CASES: [string, Rig, Targets][] = [
  ['50 Hz PD', REFERENCE_RIG, REFERENCE_TARGETS],
  ['50 Hz PID', REFERENCE_RIG, { ...REFERENCE_TARGETS, form: 'PID' }],
  ['50 Hz PD, error derivative, 60 s', REFERENCE_RIG,
    { ...REFERENCE_TARGETS, settlingTime: 60, derivativeOn: 'error' }],
  ['1000 Hz PD, 2 s', { ...REFERENCE_RIG, loopRate: 1000 },
    { ...REFERENCE_TARGETS, settlingTime: 2 }],
  ['1000 Hz PID, 60 s (the slowest in range)', { ...REFERENCE_RIG, loopRate: 1000 },
    { ...REFERENCE_TARGETS, form: 'PID', settlingTime: SETTLING_TIME_MAX }],
]

describe('sampledStepMetrics stops once settled, with the metrics of stepping every sample', () => {
  for (const [name, rig, targets] of CASES) {
    it(name, () => {
      const p = planGains(rig, targets)
      const loop = sampledLoopOf(plantOf(rig), p.gains!, p.discretization)
      const opts = {
        horizon: 10 * targets.settlingTime,
        scaleFrequency: p.analysis!.gainCrossover!,
      }
      const fast = sampledStepMetrics(loop, opts)
      const brute = sampledStepMetrics(loop, { ...opts, prove: false })
      const close = (a: number | null, b: number | null) => {
        expect(a).not.toBeNull()
        expect(Math.abs(a! - b!)).toBeLessThanOrEqual(1e-9 * Math.max(1, Math.abs(b!)))
      }
      close(fast.overshootPct, brute.overshootPct)
      close(fast.settlingTime, brute.settlingTime)
      close(fast.peakCommand, brute.peakCommand)
      close(fast.peakServoRate, brute.peakServoRate)
      if (fast.overshootPct! > 0) close(fast.peakTime, brute.peakTime)
      // the cost: a count of samples, never a time
      const T = 1 / rig.loopRate
      expect(fast.samples).toBeLessThan(brute.samples / 2)
      expect(fast.samples).toBeLessThan(3 * fast.settlingTime! / T + 200)
    })
  }
})

describe('input bounds', () => {
  it('the loop rate is held to what the kits build, with the reason in the message', () => {
    const [lo, hi] = LOOP_RATE_RANGE
    expect(rigSchema.safeParse({ ...REFERENCE_RIG, loopRate: hi }).success).toBe(true)
    expect(rigSchema.safeParse({ ...REFERENCE_RIG, loopRate: lo }).success).toBe(true)
    for (const bad of [20_000, 100_000, hi + 1, lo - 1]) {
      const r = rigSchema.safeParse({ ...REFERENCE_RIG, loopRate: bad })
      expect(r.success).toBe(false)
      const issue = r.error!.issues.find(i => i.path[0] === 'loopRate')!
      expect(issue.message).toMatch(/Loop rate/)
    }
  })

  it('the settling time is at most SETTLING_TIME_MAX', () => {
    expect(targetsSchema.safeParse({ ...REFERENCE_TARGETS, settlingTime: 60 }).success).toBe(true)
    const r = targetsSchema.safeParse({ ...REFERENCE_TARGETS, settlingTime: 600 })
    expect(r.success).toBe(false)
    expect(r.error!.issues[0]!.message).toMatch(/Settling time/)
  })
})
