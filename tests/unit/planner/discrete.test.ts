// The margins shown are those of the sampled loop the firmware runs (docs/planner-model.md §4),
// checked against computations written independently here: the common gain factor at which the
// exact root test flips (bisection), and a brute-force evaluation of L(e^(jωT)) built from the
// state-space model with its own matrix exponential.
import { describe, expect, it } from 'vitest'
import { REFERENCE_RIG, REFERENCE_TARGETS } from './fixtures'
import {
  analyzeLoop,
  filterTimeConstant,
  planGains,
  plantOf,
  sampledStable,
  sampledLoopOf,
  type Gains,
  type Rig,
  type Targets,
} from '../../../shared/utils/planner'

/** The classroom kit's numbers (inlined so the kit presets can change) at a 20 Hz loop. */
const SLOW_RIG: Rig = {
  ...REFERENCE_RIG,
  leverArm: 0.02,
  servoSecondsPer60: 0.16,
  pushrodLength: 0.09,
  sensorLength: 0.36,
  loopRate: 20,
}
const SLOW_TARGETS: Targets = { ...REFERENCE_TARGETS, settlingTime: 1.5, derivativeFilterN: 20 }

const scaled = (g: Gains, k: number): Gains => ({ ...g, kp: g.kp * k, kd: g.kd * k, ki: g.ki * k })

/** The factor in (lo, hi) where the sampled loop's stability flips, by bisection. */
function flip(rig: Rig, g: Gains, lo: number, hi: number): number {
  const plant = plantOf(rig)
  const ok = (k: number) => sampledStable(sampledLoopOf(plant, scaled(g, k)))
  const okLo = ok(lo)
  expect(ok(hi)).toBe(!okLo)
  for (let i = 0; i < 80; i++) {
    const mid = Math.sqrt(lo * hi)
    if (ok(mid) === okLo) lo = mid
    else hi = mid
  }
  return Math.sqrt(lo * hi)
}

type C = [number, number]
const cmul = (a: C, b: C): C => [a[0] * b[0] - a[1] * b[1], a[0] * b[1] + a[1] * b[0]]
const cdiv = (a: C, b: C): C => {
  const d = b[0] * b[0] + b[1] * b[1]
  return [(a[0] * b[0] + a[1] * b[1]) / d, (a[1] * b[0] - a[0] * b[1]) / d]
}

/** exp of a 4×4 matrix by scaling and squaring of its Taylor series. */
function expm(m: number[][]): number[][] {
  const n = m.length
  const mul = (a: number[][], b: number[][]) =>
    a.map((row, i) => row.map((_, j) => row.reduce((s, _v, k) => s + a[i]![k]! * b[k]![j]!, 0)))
  let s = 0
  const norm = Math.max(...m.map(r => r.reduce((a, v) => a + Math.abs(v), 0)))
  while (norm / 2 ** s > 0.1) s++
  const a = m.map(r => r.map(v => v / 2 ** s))
  let term: number[][] = a.map((r, i) => r.map((_, j) => (i === j ? 1 : 0)))
  let sum: number[][] = term.map(r => r.slice())
  for (let k = 1; k < 30; k++) {
    term = mul(term, a).map(r => r.map(v => v / k))
    sum = sum.map((r, i) => r.map((v, j) => v + term[i]![j]!))
  }
  for (let i = 0; i < s; i++) sum = mul(sum, sum)
  void n
  return sum
}

/**
 * L(e^(jωT)) from first principles: θ' = (u − θ)/τ, v' = K_b θ, x' = v held over T (Φ, Γ from
 * the augmented matrix exponential), the firmware's controller with backward-Euler derivative
 * (a = T_f/(T_f + T)), one sample of delay.
 */
function bruteLoop(rig: Rig, g: Gains) {
  const { kb, servoLag: tau, period: T } = plantOf(rig)
  const m = [
    [0, 1, 0, 0],
    [0, 0, kb, 0],
    [0, 0, -1 / tau, 1 / tau],
    [0, 0, 0, 0],
  ].map(r => r.map(v => v * T))
  const e = expm(m)
  const phi = [0, 1, 2].map(i => [0, 1, 2].map(j => e[i]![j]!))
  const gam = [0, 1, 2].map(i => e[i]![3]!)
  const tf = filterTimeConstant(g.kp, g.kd, g.n)
  const a = tf / (tf + T)
  const b = g.kd / (tf + T)
  return (w: number): C => {
    const z: C = [Math.cos(w * T), Math.sin(w * T)]
    // solve (zI − Φ) y = Γ (complex 3×3, Gaussian elimination), P = y[0]
    const A: C[][] = phi.map((r, i) =>
      r.map((v, j): C => [(i === j ? z[0] : 0) - v, i === j ? z[1] : 0]),
    )
    const y: C[] = gam.map((v): C => [v, 0])
    for (let c = 0; c < 3; c++) {
      for (let r = c + 1; r < 3; r++) {
        const f = cdiv(A[r]![c]!, A[c]![c]!)
        for (let k = c; k < 3; k++) {
          const t = cmul(f, A[c]![k]!)
          A[r]![k] = [A[r]![k]![0] - t[0], A[r]![k]![1] - t[1]]
        }
        const t = cmul(f, y[c]!)
        y[r] = [y[r]![0] - t[0], y[r]![1] - t[1]]
      }
    }
    const sol: C[] = [[0, 0], [0, 0], [0, 0]]
    for (let r = 2; r >= 0; r--) {
      let acc = y[r]!
      for (let k = r + 1; k < 3; k++) {
        const t = cmul(A[r]![k]!, sol[k]!)
        acc = [acc[0] - t[0], acc[1] - t[1]]
      }
      sol[r] = cdiv(acc, A[r]![r]!)
    }
    const p = sol[0]!
    const zm1: C = [z[0] - 1, z[1]]
    let c: C = [g.kp, 0]
    const d = cdiv(cmul([b, 0], zm1), [z[0] - a, z[1]])
    c = [c[0] + d[0], c[1] + d[1]]
    if (g.ki > 0) {
      const i = cdiv(cmul([g.ki * T, 0], z), zm1)
      c = [c[0] + i[0], c[1] + i[1]]
    }
    return cdiv(cmul(c, p), z)
  }
}

/** Phase margin by brute force: every gain crossover located on a dense linear grid. */
function brutePhaseMargin(rig: Rig, g: Gains): number {
  const L = bruteLoop(rig, g)
  const top = Math.PI * rig.loopRate
  let best = Infinity
  let prev = Math.hypot(...L(top * 1e-6)) - 1
  const n = 400_000
  for (let k = 1; k <= n; k++) {
    const w = (top * k) / n
    const l = L(w)
    const cur = Math.hypot(...l) - 1
    if (prev * cur <= 0) {
      let pm = (Math.atan2(l[1], l[0]) * 180) / Math.PI + 180
      if (pm > 180) pm -= 360
      best = Math.min(best, pm)
    }
    prev = cur
  }
  return best
}

const CASES: [string, Rig, Targets][] = [
  ['reference rig, PD', REFERENCE_RIG, REFERENCE_TARGETS],
  ['reference rig, PID', REFERENCE_RIG, { ...REFERENCE_TARGETS, form: 'PID' }],
  ['20 Hz classroom numbers, PD', SLOW_RIG, SLOW_TARGETS],
  ['reference rig at 200 Hz, PD, error derivative', { ...REFERENCE_RIG, loopRate: 200 },
    { ...REFERENCE_TARGETS, derivativeOn: 'error' }],
]

describe('the sampled loop\'s margins (docs/planner-model.md §4)', () => {
  for (const [name, rig, targets] of CASES) {
    it(`${name}: the gain margin is the factor at which the root test flips`, () => {
      const plan = planGains(rig, targets)
      const a = plan.analysis!
      expect(a.stable).toBe(true)
      const k = 10 ** (a.gainMarginDb! / 20)
      expect(flip(rig, plan.gains!, 1, 4 * k)).toBeCloseTo(k, 6)
      if (targets.form === 'PID') {
        const r = 10 ** (a.gainReductionMarginDb! / 20)
        expect(r).toBeLessThan(1)
        expect(flip(rig, plan.gains!, r / 4, 1)).toBeCloseTo(r, 6)
      }
    })
    it(`${name}: the phase margin matches a brute-force evaluation`, () => {
      const plan = planGains(rig, targets)
      expect(plan.analysis!.phaseMarginDeg!).toBeCloseTo(brutePhaseMargin(rig, plan.gains!), 1)
    })
  }

  it('Ms matches a brute-force evaluation; the delay margin counts whole extra samples', () => {
    for (const [, rig, targets] of CASES) {
      const plan = planGains(rig, targets)
      const a = plan.analysis!
      const L = bruteLoop(rig, plan.gains!)
      const top = Math.PI * rig.loopRate
      let ms = 0
      for (let k = 1; k <= 200_000; k++) {
        const l = L((top * k) / 200_000)
        ms = Math.max(ms, 1 / Math.hypot(1 + l[0], l[1]))
      }
      expect(a.sensitivityPeak!).toBeGreaterThanOrEqual(ms * (1 - 1e-9))
      expect(a.sensitivityPeak!).toBeCloseTo(ms, 4)
    }
    // m more samples rotate L by exactly ω·m·T on the unit circle: a delay of m·T. (At 200 Hz
    // the margin is about 80 samples, past where (w + 1)^m keeps its precision.)
    for (const [, rig, targets] of CASES.slice(0, 3)) {
      const plan = planGains(rig, targets)
      const a = plan.analysis!
      const T = 1 / rig.loopRate
      const m = Math.floor(a.delayMargin! / T)
      expect(analyzeLoop(rig, plan.gains!, { extraDelaySamples: m }).sampledStable).toBe(true)
      expect(analyzeLoop(rig, plan.gains!, { extraDelaySamples: m + 1 }).sampledStable).toBe(false)
    }
  })

  it('warns on the sampled loop\'s gain margin where the continuous one looks safe', () => {
    const plan = planGains(SLOW_RIG, SLOW_TARGETS)
    const a = plan.analysis!
    expect(a.continuous.gainMarginDb!).toBeGreaterThanOrEqual(6)
    expect(a.gainMarginDb!).toBeLessThan(6)
    expect(plan.warnings.map(w => w.code)).toContain('low-gain-margin')
    const w = plan.warnings.find(x => x.code === 'low-gain-margin')!
    expect(w.message).toContain(`${a.gainMarginDb!.toFixed(1)} dB`)
  })

  it('an unstable loop shows no margin and says why', () => {
    const plan = planGains(REFERENCE_RIG, REFERENCE_TARGETS)
    const a = analyzeLoop(REFERENCE_RIG, scaled(plan.gains!, 20))
    expect(a.stable).toBe(false)
    expect(a.gainMarginDb).toBeNull()
    expect(a.phaseMarginDeg).toBeNull()
    expect(a.delayMargin).toBeNull()
    expect(a.sensitivityPeak).toBeNull()
    expect(a.explanation).toMatch(/further each time/)
    const noD = analyzeLoop(REFERENCE_RIG, { ...plan.gains!, kd: 0 })
    expect(noD.stable).toBe(false)
    expect(noD.gainMarginDb).toBeNull()
    expect(noD.explanation).toMatch(/derivative/)
  })

  it('one extra sample of delay lowers the margins and matches the root test', () => {
    const plan = planGains(REFERENCE_RIG, REFERENCE_TARGETS)
    const a0 = plan.analysis!
    const a1 = analyzeLoop(REFERENCE_RIG, plan.gains!, { extraDelaySamples: 1 })
    expect(a1.gainMarginDb!).toBeLessThan(a0.gainMarginDb!)
    expect(a1.phaseMarginDeg!).toBeLessThan(a0.phaseMarginDeg!)
    // the lost phase at the crossover is about ω_c·T (one sample)
    const T = 1 / REFERENCE_RIG.loopRate
    const lost = a0.phaseMarginDeg! - a1.phaseMarginDeg!
    expect(lost).toBeGreaterThan((0.5 * a1.gainCrossover! * T * 180) / Math.PI)
    const plant = plantOf(REFERENCE_RIG)
    const k = 10 ** (a1.gainMarginDb! / 20)
    const ok = (f: number) =>
      sampledStable({ ...sampledLoopOf(plant, scaled(plan.gains!, f)), extraDelaySamples: 1 })
    expect(ok(k * 0.999)).toBe(true)
    expect(ok(k * 1.001)).toBe(false)
  })
})
