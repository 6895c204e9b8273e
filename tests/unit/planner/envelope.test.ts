import { describe, expect, it } from 'vitest'
import {
  analyzeLoop,
  planGains,
  plantOf,
  simulate,
  whatIfEnvelope,
} from '../../../shared/utils/planner'
import { DEFAULT_TARGETS, KIT_PRESETS } from '../../../shared/utils/planner/presets'

const kit = KIT_PRESETS[0]!.rig
const gains = planGains(kit, DEFAULT_TARGETS).gains!

describe('whatIfEnvelope', () => {
  const env = whatIfEnvelope(kit, gains, { duration: 6 })

  it('lists the nominal run and the four what-ifs, each analysed as its own sampled loop', () => {
    expect(env.variants.map(v => v.id)).toEqual([
      'nominal', 'servo-slower', 'gain-low', 'gain-high', 'extra-delay',
    ])
    const nominal = analyzeLoop(kit, gains)
    expect(env.variants[0]!.phaseMarginDeg).toBe(nominal.phaseMarginDeg)
    const slower = analyzeLoop({ ...kit, servoSecondsPer60: kit.servoSecondsPer60 * 1.3 }, gains)
    expect(env.variants[1]!.phaseMarginDeg).toBe(slower.phaseMarginDeg)
    const high = analyzeLoop({ ...kit, leverArm: kit.leverArm * 1.3 }, gains)
    expect(plantOf({ ...kit, leverArm: kit.leverArm * 1.3 }).kb / plantOf(kit).kb)
      .toBeCloseTo(1.3, 12)
    expect(env.variants[3]!.gainMarginDb).toBe(high.gainMarginDb)
    const late = analyzeLoop(kit, gains, { extraDelaySamples: 1 })
    expect(env.variants[4]!.phaseMarginDeg).toBe(late.phaseMarginDeg)
    // a slower servo, more gain or more delay all cost phase
    for (const i of [1, 3, 4])
      expect(env.variants[i]!.phaseMarginDeg!).toBeLessThan(nominal.phaseMarginDeg!)
  })

  it('the band holds every variant\'s run, and the worst margins are the smallest', () => {
    const slow = simulate(kit, gains, { duration: 6, servoLagScale: 1.3 })
    const nominal = simulate(kit, gains, { duration: 6 })
    expect(env.t).toEqual(nominal.t)
    for (let i = 0; i < env.t.length; i++) {
      expect(env.lowerMm[i]!).toBeLessThanOrEqual(slow.x[i]! * 1000 + 1e-9)
      expect(env.upperMm[i]!).toBeGreaterThanOrEqual(slow.x[i]! * 1000 - 1e-9)
      expect(env.lowerMm[i]!).toBeLessThanOrEqual(nominal.x[i]! * 1000 + 1e-9)
    }
    expect(Math.max(...env.upperMm.map((u, i) => u - env.lowerMm[i]!))).toBeGreaterThan(1)
    expect(env.allStable).toBe(true)
    expect(env.worstPhaseMarginDeg).toBe(Math.min(...env.variants.map(v => v.phaseMarginDeg!)))
    expect(env.worstGainMarginDb).toBe(Math.min(...env.variants.map(v => v.gainMarginDb!)))
  })

  it('a loop that one what-if tips over shows no worst margin and names the variant', () => {
    // the kit's gains raised until 1.5 dB of gain margin is left: 30 % more plant gain (2.3 dB)
    // tips them over
    const gm = analyzeLoop(kit, gains).gainMarginDb!
    const up = 10 ** ((gm - 1.5) / 20)
    const hot = { ...gains, kp: gains.kp * up, kd: gains.kd * up }
    expect(analyzeLoop(kit, hot).stable).toBe(true)
    const e = whatIfEnvelope(kit, hot, { duration: 4 })
    expect(e.variants[0]!.stable).toBe(true)
    expect(e.variants.find(v => v.id === 'gain-high')!.stable).toBe(false)
    expect(e.allStable).toBe(false)
    expect(e.worstGainMarginDb).toBeNull()
    const tipped = e.variants.filter(v => !v.stable)
    expect(tipped.length).toBeGreaterThan(0)
    for (const v of tipped) expect(v.phaseMarginDeg).toBeNull()
  })
})
