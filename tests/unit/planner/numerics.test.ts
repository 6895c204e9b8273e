// The fast numerics against straightforward versions (reference.ts): the same numbers, found
// the slow way — a dense sweep of the complex L(jω) with numerical unwrapping, and RK4 on fine
// sub-steps for the sampled step response.
import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import {
  analyzeFrequency,
  analyzeLoop,
  designGains,
  diskStable,
  hurwitzStable,
  loopParamsOf,
  planGains,
  plantOf,
  polynomialRoots,
  sampledCharacteristic,
  sampledCharacteristicW,
  sampledLoopOf,
  schurStable,
  type Gains,
  type Rig,
} from '../../../shared/utils/planner'
import { targetsFor, validRig } from './arbitraries'
import { referenceMargins, referenceStep } from './reference'

describe('margins and step metrics equal the straightforward versions', () => {
  it('on random rigs with their lag-aware PD suggestions', () => {
    const arb = validRig.chain(rig =>
      targetsFor(plantOf(rig).effectiveLag, {
        minRatio: 12,
        maxRatio: 60,
        minN: 5,
        forms: ['PD'],
      }).map(targets => ({ rig, targets })),
    )
    let checked = 0
    fc.assert(
      fc.property(arb, ({ rig, targets }) => {
        const plan = planGains(rig, targets)
        if (!plan.feasible) return
        const plant = plantOf(rig)
        const a = plan.analysis!
        // the continuous stand-in's margins (the secondary line), against the reference
        const f = analyzeFrequency(loopParamsOf(plant, plan.gains!))
        const ref = referenceMargins(loopParamsOf(plant, plan.gains!), 1e-3, 1e5)
        expect(f.phaseMarginDeg!).toBeCloseTo(ref.phaseMarginDeg!, 6)
        expect(f.gainCrossover!).toBeCloseTo(ref.gainCrossover!, 6)
        expect(f.gainMarginDb!).toBeCloseTo(ref.gainMarginDb!, 6)
        expect(f.phaseCrossover!).toBeCloseTo(ref.phaseCrossover!, 5)
        expect(a.continuous).toEqual({
          gainMarginDb: f.gainMarginDb,
          phaseMarginDeg: f.phaseMarginDeg,
          delayMargin: f.delayMargin,
        })
        const horizon = Math.min(60, 40 * targets.settlingTime)
        const step = referenceStep(sampledLoopOf(plant, plan.gains!), horizon, 40)
        // sub-steps of T/40 miss the true peak by at most ½·ẍ·(T/80)²
        expect(a.step.overshootPct!).toBeCloseTo(step.overshootPct, 2)
        if (step.settlingTime !== null && step.tail < 0.01)
          expect(a.step.settlingTime!).toBeCloseTo(step.settlingTime, 3)
        checked++
      }),
      { seed: 21, numRuns: 12 },
    )
    expect(checked).toBeGreaterThan(5)
  })

  it('on a PID loop with a low-frequency phase crossover (a conditionally stable loop)', () => {
    const rig: Rig = {
      beamLength: 0.4,
      pivotToLink: 0.2,
      leverArm: 0.025,
      drive: 'lever',
      ballDiameter: 0.019,
      ballShell: 'solid',
      railGap: 0.01,
      servoSecondsPer60: 0.12,
      servoTravel: Math.PI,
      loopRate: 50,
      adcBits: 10,
    }
    const gains: Gains = { kp: 9.2, kd: 4.4, ki: 4.6, n: 10, derivativeOn: 'measurement' }
    const plant = plantOf(rig)
    const f = analyzeFrequency(loopParamsOf(plant, gains))
    const ref = referenceMargins(loopParamsOf(plant, gains), 1e-3, 1e5)
    // The reference takes "the smallest over the phase crossovers" (docs/planner-model.md §4)
    // literally and lands on the low-frequency crossover, where |L| > 1: that is how far the
    // gain may FALL.
    expect(f.nyquistStable).toBe(true)
    expect(f.gainReductionMarginDb!).toBeCloseTo(ref.gainMarginDb!, 6)
    expect(f.gainReductionMarginDb!).toBeLessThan(0)
    expect(f.gainMarginDb!).toBeGreaterThan(6)
    expect(f.phaseCrossovers).toHaveLength(2)
    expect(f.phaseMarginDeg!).toBeCloseTo(ref.phaseMarginDeg!, 6)
    // Scaling the gain by the reported margins lands on the stability boundary.
    const up = 10 ** (f.gainMarginDb! / 20)
    const scaled = (k: number) => ({
      ...loopParamsOf(plant, gains),
      kp: k * gains.kp,
      kd: k * gains.kd,
      ki: k * gains.ki,
    })
    expect(analyzeFrequency(scaled(up * 0.999)).nyquistStable).toBe(true)
    expect(analyzeFrequency(scaled(up * 1.001)).nyquistStable).toBe(false)
    const down = 10 ** (f.gainReductionMarginDb! / 20)
    expect(analyzeFrequency(scaled(down * 1.001)).nyquistStable).toBe(true)
    expect(analyzeFrequency(scaled(down * 0.999)).nyquistStable).toBe(false)
  })
})

describe('sampled-loop stability', () => {
  const maxRootModulus = (w: number[]) =>
    Math.max(...polynomialRoots(w).map(r => Math.hypot(1 + r.re, r.im)))

  it('agrees with the roots of the characteristic polynomial on random loops', () => {
    fc.assert(
      fc.property(
        validRig,
        fc.double({ min: 0.05, max: 5, noNaN: true }),
        fc.double({ min: 0, max: 3, noNaN: true }),
        fc.double({ min: 0, max: 1, noNaN: true }),
        fc.double({ min: 2, max: 30, noNaN: true }),
        (rig, kpScale, kdScale, kiScale, n) => {
          const plant = plantOf(rig)
          const base = planGains(rig, {
            overshootPct: 10,
            settlingTime: 30 * plant.effectiveLag,
            form: 'PD',
            derivativeFilterN: 10,
            method: 'lag-aware',
            derivativeOn: 'measurement',
          }).gains!
          const gains: Gains = {
            kp: base.kp * kpScale,
            kd: base.kd * kdScale,
            ki: base.kp * kiScale,
            n,
            derivativeOn: 'measurement',
          }
          const w = sampledCharacteristicW(sampledLoopOf(plant, gains))
          const m = maxRootModulus(w)
          if (Math.abs(m - 1) < 1e-6) return // too close to call either way
          expect(diskStable(w)).toBe(m < 1)
        },
      ),
      { seed: 22, numRuns: 400 },
    )
  })

  it(
    'stays right where the z-domain Schur–Cohn test loses its precision (fast loop, '
    + 'slow response)', () => {
    // 500 Hz loop, a response of tens of seconds: every closed-loop pole crowds z = 1.
      const rig: Rig = {
        beamLength: 0.8,
        pivotToLink: 0.6,
        leverArm: 0.02,
        drive: 'lever',
        ballDiameter: 0.02,
        ballShell: 'solid',
        railGap: 0,
        servoSecondsPer60: 0.28,
        servoTravel: Math.PI,
        loopRate: 500,
        adcBits: 12,
      }
      const plant = plantOf(rig)
      // the §3 placement itself (planGains would go on to refine it, §8)
      const d = designGains(plant, {
        overshootPct: 5,
        settlingTime: 25,
        form: 'PID',
        derivativeFilterN: 15,
        method: 'lag-aware',
        derivativeOn: 'measurement',
      })
      expect(d.feasible).toBe(true)
      const gains: Gains = {
        kp: d.kp!,
        kd: d.kd!,
        ki: d.ki!,
        n: 15,
        derivativeOn: 'measurement',
      }
      const loop = sampledLoopOf(plant, gains)
      const w = sampledCharacteristicW(loop)
      expect(maxRootModulus(w)).toBeLessThan(1)
      expect(diskStable(w)).toBe(true)
      // the z-form's rounding, not the loop
      expect(schurStable(sampledCharacteristic(loop))).toBe(false)
      // and the loop really does settle
      expect(analyzeLoop(rig, gains).step.settlingTime).not.toBeNull()
    })

  it('Routh–Hurwitz on known polynomials', () => {
    expect(hurwitzStable([1, 6, 11, 6])).toBe(true) // (s+1)(s+2)(s+3)
    expect(hurwitzStable([1, 0, 1])).toBe(false) // ±j
    expect(hurwitzStable([1, -1, 2])).toBe(false)
    expect(hurwitzStable([1, 1, 1, 2])).toBe(false) // a1·a2 < a0·a3
    expect(hurwitzStable([1, 2, 3, 5, 1])).toBe(true)
  })
})

describe('analyzeLoop', () => {
  it('reports none as null, never Infinity or NaN', () => {
    const rig: Rig = {
      beamLength: 0.4,
      pivotToLink: 0.2,
      leverArm: 0.025,
      drive: 'lever',
      ballDiameter: 0.019,
      ballShell: 'solid',
      railGap: 0.01,
      servoSecondsPer60: 0.12,
      servoTravel: Math.PI,
      loopRate: 50,
      adcBits: 10,
    }
    for (const gains of [
      { kp: 7.2, kd: 3.8, ki: 0, n: 10, derivativeOn: 'measurement' as const },
      { kp: 7.2, kd: 0, ki: 0, n: 10, derivativeOn: 'measurement' as const },
      { kp: 500, kd: 0.1, ki: 50, n: 10, derivativeOn: 'error' as const },
    ]) {
      const a = analyzeLoop(rig, gains)
      const text = JSON.stringify(a)
      expect(JSON.parse(text)).toEqual(a)
      expect(text).not.toMatch(/NaN|Infinity/)
    }
    const unstable = analyzeLoop(rig, { kp: 7.2, kd: 0, ki: 0, n: 10, derivativeOn: 'measurement' })
    expect(unstable.stable).toBe(false)
    expect(unstable.step.overshootPct).toBeNull()
    // an unstable loop shows no margin, and says why
    expect(unstable.delayMargin).toBeNull()
    expect(unstable.phaseMarginDeg).toBeNull()
    expect(unstable.gainMarginDb).toBeNull()
    expect(unstable.explanation).toMatch(/derivative/)
  })
})
