// docs/planner-model.md §9: the stability map judges every cell with the sampled loop's exact
// root test, and its margins are those of the sampled loop (checked at the margin nodes against
// an independent evaluation in z, and the gain margin against the stability of the scaled loop).
import { describe, expect, it } from 'vitest'
import {
  derivativeCoefficients,
  discretizePlant,
  filterTimeConstant,
  planGains,
  plantOf,
  sampledStable,
  stabilityMap,
  type Discretization,
  type Rig,
  type StabilityMapOptions,
} from '../../../shared/utils/planner'
import { REFERENCE_RIG, REFERENCE_TARGETS } from './fixtures'

const rig = REFERENCE_RIG
const g = planGains(rig, REFERENCE_TARGETS).gains!

function loopOf(r: Rig, kp: number, kd: number, ki: number, o: StabilityMapOptions) {
  const p = plantOf(r)
  const tf = filterTimeConstant(kp, kd, o.n)
  let discretization: Discretization = o.discretization ?? 'backward-euler'
  if (!derivativeCoefficients(kd, tf, p.period, discretization).ok)
    discretization = 'backward-euler'
  return {
    kb: p.kb,
    servoLag: p.servoLag,
    period: p.period,
    kp,
    ki,
    kd,
    tf,
    derivativeOn: o.derivativeOn,
    discretization,
  }
}

/**
 * The sampled loop z⁻¹·P(z)·C(z) at z = e^(jθ), from the plant in z (discretizePlant, not the w
 * form the map uses) and C(z) = Kp + b(z − 1)/(z − a) + Ki·T·z/(z − 1), on a dense grid (2000
 * points a decade), with the phase unwrapped by continuity from −180° at θ → 0.
 */
function denseMargins(loop: ReturnType<typeof loopOf>) {
  const d = discretizePlant(loop.kb, loop.servoLag, loop.period)
  const { a, b } = derivativeCoefficients(loop.kd, loop.tf, loop.period, loop.discretization)
  const kiT = loop.ki * loop.period
  const evalPoly = (p: number[], zr: number, zi: number) => {
    let r = 0
    let i = 0
    for (const c of p) {
      const nr = r * zr - i * zi + c
      i = r * zi + i * zr
      r = nr
    }
    return [r, i] as const
  }
  const div = (xr: number, xi: number, yr: number, yi: number) => {
    const m = yr * yr + yi * yi
    return [(xr * yr + xi * yi) / m, (xi * yr - xr * yi) / m] as const
  }
  let prevPh = -Math.PI
  let prev: { lm: number, ph: number } | null = null
  let pm: number | null = null
  const crossings: number[] = []
  for (let e = -6 * 2000; ; e++) {
    const th = Math.min(Math.PI, 10 ** (e / 2000))
    const zr = Math.cos(th)
    const zi = Math.sin(th)
    const [nr, ni] = evalPoly(d.num, zr, zi)
    const [dr, di] = evalPoly(d.den, zr, zi)
    let [pr, pi] = div(nr, ni, dr * zr - di * zi, dr * zi + di * zr)
    const [qr, qi] = div(zr - 1, zi, zr - a, zi)
    let cr = loop.kp + b * qr
    let ci = b * qi
    if (kiT > 0) {
      const [ir, ii] = div(zr, zi, zr - 1, zi)
      cr += kiT * ir
      ci += kiT * ii
    }
    ;[pr, pi] = [pr * cr - pi * ci, pr * ci + pi * cr]
    const lm = Math.log(pr * pr + pi * pi)
    let ph = Math.atan2(pi, pr)
    ph += 2 * Math.PI * Math.round((prevPh - ph) / (2 * Math.PI))
    prevPh = ph
    if (prev !== null) {
      if (prev.lm * lm < 0) {
        const f = prev.lm / (prev.lm - lm)
        const m = 180 + ((prev.ph + f * (ph - prev.ph)) * 180) / Math.PI
        if (pm === null || m < pm) pm = m
      }
      const k0 = Math.floor((prev.ph + Math.PI) / (2 * Math.PI))
      const k1 = Math.floor((ph + Math.PI) / (2 * Math.PI))
      if (k0 !== k1) {
        const target = 2 * Math.PI * Math.max(k0, k1) - Math.PI
        const f = (target - prev.ph) / (ph - prev.ph)
        crossings.push(Math.exp(prev.lm + f * (lm - prev.lm)))
      }
    }
    prev = { lm, ph }
    if (th === Math.PI) break
  }
  const below = crossings.filter(m2 => m2 < 1)
  return {
    phaseMarginDeg: pm,
    gainMarginDb: below.length ? -10 * Math.log10(Math.max(...below)) : null,
  }
}

describe('stabilityMap (docs/planner-model.md §9)', () => {
  const cases: [string, Rig, StabilityMapOptions][] = [
    [
      'PD, derivative on the measurement, backward Euler',
      rig,
      { kpRange: [0, 3 * g.kp], kdRange: [0, 3 * g.kd], n: 10, derivativeOn: 'measurement' },
    ],
    [
      'PID with Tustin (falling back where T_f < T/2), a 200 Hz loop',
      { ...rig, loopRate: 200 },
      {
        kpRange: [0.5, 4 * g.kp],
        kdRange: [0, 3 * g.kd],
        n: 4,
        derivativeOn: 'error',
        ki: 0.3 * g.kp,
        discretization: 'tustin',
      },
    ],
    [
      'a geared drive on log axes',
      { ...rig, drive: 'direct', gearRatio: 3, loopRate: 100 },
      {
        kpRange: [0.05, 20 * g.kp],
        kdRange: [0.01, 20 * g.kd],
        n: 20,
        derivativeOn: 'measurement',
        scale: 'log',
      },
    ],
  ]

  for (const [name, r, options] of cases) {
    it(`${name}: every cell agrees with sampledStable of its own gains`, () => {
      const map = stabilityMap(r, options, 100)
      expect(map.stable).toHaveLength(100)
      let stable = 0
      let unstable = 0
      map.kd.forEach((kd, j) =>
        map.kp.forEach((kp, i) => {
          const want = kp > 0 && sampledStable(loopOf(r, kp, kd, options.ki ?? 0, options))
          expect(map.stable[j]![i], `Kp ${kp}, Kd ${kd}`).toBe(want)
          if (want) stable++
          else unstable++
        }),
      )
      // The ranges straddle the boundary, so both verdicts are exercised.
      expect(stable).toBeGreaterThan(100)
      expect(unstable).toBeGreaterThan(100)
      expect(map.stableFraction).toBeCloseTo(stable / 10_000, 12)
    })
  }

  it('the margins at its nodes match an independent evaluation of the sampled loop in z', () => {
    const options = cases[0]![2]
    const map = stabilityMap(rig, options, 100)
    let checked = 0
    // Nodes of a 100-cell axis are every 4th index.
    for (let j = 4; j < 100; j += 12) {
      for (let i = 4; i < 100; i += 12) {
        if (!map.stable[j]![i]) continue
        const want = denseMargins(loopOf(rig, map.kp[i]!, map.kd[j]!, 0, options))
        expect(map.phaseMarginDeg[j]![i]).toBeCloseTo(want.phaseMarginDeg!, 0)
        if (want.gainMarginDb === null) expect(map.gainMarginDb[j]![i]).toBeNull()
        else expect(Math.abs(map.gainMarginDb[j]![i]! - want.gainMarginDb)).toBeLessThan(0.05)
        checked++
      }
    }
    expect(checked).toBeGreaterThan(10)
  })

  it('a stable PD cell\'s gain margin is how far all its gains may be scaled', () => {
    const options = cases[0]![2]
    const map = stabilityMap(rig, options, 100)
    let checked = 0
    for (let j = 8; j < 100; j += 20) {
      for (let i = 8; i < 100; i += 20) {
        const gm = map.gainMarginDb[j]![i] ?? null
        if (!map.stable[j]![i] || gm === null) continue
        // Scaling Kp and Kd together keeps T_f = Kd/(N·Kp), so this is the loop gain alone.
        const k = 10 ** (gm / 20)
        const scaled = (f: number) =>
          sampledStable(loopOf(rig, f * map.kp[i]!, f * map.kd[j]!, 0, options))
        expect(scaled(k * 0.99)).toBe(true)
        expect(scaled(k * 1.01)).toBe(false)
        checked++
      }
    }
    expect(checked).toBeGreaterThan(5)
  })

  it('marks the suggestion stable with its phase margin, and P only (Kd = 0) never', () => {
    const p = planGains(rig, REFERENCE_TARGETS)
    const map = stabilityMap(
      rig,
      { kpRange: [0, 3 * g.kp], kdRange: [0, 3 * g.kd], n: 10, derivativeOn: 'measurement' },
      { kp: 31, kd: 16 },
    )
    expect(map.kp).toHaveLength(31)
    expect(map.kd).toHaveLength(16)
    expect(map.stable[0]).toHaveLength(31)
    expect(map.kp[10]).toBeCloseTo(g.kp, 12)
    expect(map.kd[5]).toBeCloseTo(g.kd, 12)
    expect(map.stable[5]![10]).toBe(true)
    const want = denseMargins(loopOf(rig, g.kp, g.kd, 0, { ...p, n: 10, derivativeOn: 'measurement',
      kpRange: [0, 1], kdRange: [0, 1] }))
    expect(map.phaseMarginDeg[5]![10]).toBeCloseTo(want.phaseMarginDeg!, 0)
    expect(map.stable[0]!.every(s => !s)).toBe(true) // Kd = 0
    expect(map.stable.every(row => !row[0])).toBe(true) // Kp = 0
    expect(map.stableFraction).toBeGreaterThan(0.3)
    expect(map.stableFraction).toBeLessThan(1)
    expect(JSON.parse(JSON.stringify(map))).toEqual(map)
  })

  it('log axes', () => {
    const map = stabilityMap(
      rig,
      {
        kpRange: [0.1, 100],
        kdRange: [0.01, 10],
        n: 10,
        derivativeOn: 'measurement',
        scale: 'log',
      },
      4,
    )
    expect(map.kp.map(v => Math.log10(v))).toEqual([-1, 0, 1, 2].map(v => expect.closeTo(v, 12)))
  })
})
