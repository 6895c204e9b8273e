// Servo jitter from sensor noise, checked two ways: P only, where the command is Kp times the
// reading (so σ_u = Kp·σ_n exactly), and a seeded Monte-Carlo run of the exported recipe's own
// arithmetic with Gaussian reading noise.
import { describe, expect, it } from 'vitest'
import {
  firmwareConstants,
  planGains,
  plantOf,
  servoJitter,
  type Gains,
} from '../../../shared/utils/planner'
import { DEFAULT_TARGETS, KIT_PRESETS } from '../../../shared/utils/planner/presets'
import { definesOf, recipeOf } from './recipe'
import { gaussian, seeded } from './noise'

const kit = { ...KIT_PRESETS[0]!.rig, adcNoiseCounts: 2 }
const gains = planGains(kit, DEFAULT_TARGETS).gains!
const DEG = 180 / Math.PI

describe('servoJitter', () => {
  it('is nothing without a measured noise', () => {
    expect(servoJitter({ ...kit, adcNoiseCounts: undefined }, gains)).toBeNull()
    expect(servoJitter({ ...kit, adcNoiseCounts: 0 }, gains)).toBeNull()
  })

  it('P only gives Kp·σ exactly', () => {
    const p: Gains = { ...gains, kd: 0, ki: 0 }
    const j = servoJitter(kit, p)!
    const ks = plantOf(kit).countsPerMeter
    expect(j.rmsDeg).toBeCloseTo((p.kp * (2 / ks)) * DEG, 12)
    expect(j.proportionalRmsDeg).toBeCloseTo(j.rmsDeg, 12)
    expect(j.rmsUs).toBeCloseTo(j.rmsDeg * (1000 / 90), 9)
    expect(j.peakToPeakDeg).toBeCloseTo(6 * j.rmsDeg, 12)
  })

  it('agrees with a seeded Monte-Carlo run of the recipe within 3 %', () => {
    const j = servoJitter(kit, gains)!
    const recipe = recipeOf(definesOf(firmwareConstants(kit, gains)), gains.derivativeOn)
    const random = gaussian(seeded(12))
    const setpoint = 512
    const out: number[] = []
    for (let k = 0; k < 40000; k++) {
      const servo = recipe.step(setpoint + 2 * random(), setpoint)
      if (k > 100) out.push(servo)
    }
    const mean = out.reduce((a, b) => a + b, 0) / out.length
    const rms = Math.sqrt(out.reduce((a, b) => a + (b - mean) ** 2, 0) / out.length)
    expect(rms / j.rmsDeg).toBeGreaterThan(0.97)
    expect(rms / j.rmsDeg).toBeLessThan(1.03)
    // the derivative term is most of it on the kit
    expect(j.rmsDeg).toBeGreaterThan(3 * j.proportionalRmsDeg)
  })

  it('a longer derivative filter (smaller N) jitters less but leaves less phase margin', () => {
    const j = servoJitter(kit, gains)!
    expect(j.byFilter.map(f => f.n)).toEqual([2, 5, 10, 20])
    for (let i = 1; i < j.byFilter.length; i++)
      expect(j.byFilter[i]!.rmsDeg).toBeGreaterThan(j.byFilter[i - 1]!.rmsDeg)
    expect(j.byFilter.find(f => f.n === gains.n)!.rmsDeg).toBeCloseTo(j.rmsDeg, 12)
    for (let i = 1; i < j.byFilter.length; i++) {
      expect(j.byFilter[i]!.phaseMarginDeg!).toBeGreaterThan(j.byFilter[i - 1]!.phaseMarginDeg!)
    }
  })
})
