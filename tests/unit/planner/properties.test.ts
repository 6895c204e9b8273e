// Property tests (fast-check) over random valid rigs. Seeds are fixed so a failure reproduces
// and CI never flakes; change a seed to explore further.
import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import {
  analyzeLoop,
  planGains,
  plantOf,
  proportionalOscillation,
  rigSchema,
  sampledLoopOf,
  sampledStable,
  settlingTimeBounds,
  stabilityMap,
  WARNING_CODES,
  zetaFromOvershoot,
  type Gains,
} from '../../../shared/utils/planner'
import { targetsFor, validRig } from './arbitraries'

const rigAndTargets = (opts: Parameters<typeof targetsFor>[1]) =>
  validRig.chain(rig =>
    targetsFor(plantOf(rig).effectiveLag, opts).map(targets => ({ rig, targets })),
  )

describe('properties over random valid rigs', () => {
  it('rigSchema accepts every generated rig', () => {
    fc.assert(
      fc.property(validRig, (rig) => {
        const r = rigSchema.safeParse(rig)
        expect(r.success, JSON.stringify(r.error?.issues)).toBe(true)
      }),
      { seed: 11, numRuns: 500 },
    )
  })

  it(
    'every feasible lag-aware suggestion is stable with positive margins, from hard '
    + 'targets to easy ones', () => {
      let feasible = 0
      fc.assert(
        fc.property(rigAndTargets({ minRatio: 5, maxRatio: 200 }), ({ rig, targets }) => {
          const plan = planGains(rig, targets)
          if (!plan.feasible) {
            expect(plan.gains).toBeNull()
            expect(plan.analysis).toBeNull()
            expect(plan.warnings.some(w => w.severity === 'danger')).toBe(true)
            return
          }
          feasible++
          const a = plan.analysis!
          expect(a.stable).toBe(true)
          expect(a.sampledStable).toBe(true)
          expect(a.phaseMarginDeg!).toBeGreaterThan(0)
          if (a.gainMarginDb !== null) expect(a.gainMarginDb).toBeGreaterThan(0)
          expect(a.delayMargin!).toBeGreaterThan(0)
          // Stable but not settled within the horizon (a lightly damped loop) is called out.
          if (a.step.settlingTime === null)
            expect(plan.warnings.map(w => w.code)).toContain('targets-missed')
          expect(plan.firmware).not.toBeNull()
          // analysis is analyzeLoop of the suggestion
          expect(
            analyzeLoop(rig, plan.gains!, {
              discretization: plan.firmware!.discretization,
              horizon: 10 * targets.settlingTime,
            }),
          ).toEqual(a)
        }),
        { seed: 12, numRuns: 300 },
      )
      expect(feasible).toBeGreaterThan(100)
    })

  it(
    'from the recommended T_s (28·τ_eff for PD) up, with N ≥ 5, the §3 formulas '
    + 'themselves give stable loops', () => {
      const arb = fc
        .tuple(
          rigAndTargets({ minRatio: 1, maxRatio: 1, minN: 5, maxOvershoot: 30 }),
          fc.double({ min: 1.001, max: 10, noNaN: true }),
        )
        .map(([{ rig, targets }, factor]) => {
          const lag = plantOf(rig).effectiveLag
          const rec = settlingTimeBounds(
            lag,
            zetaFromOvershoot(targets.overshootPct),
            targets.form,
          ).recommended!
          return { rig, targets: { ...targets, settlingTime: factor * rec } }
        })
      fc.assert(
        fc.property(arb, ({ rig, targets }) => {
          const plan = planGains(rig, targets)
          expect(plan.rejectedGains).toBeNull()
          expect(plan.feasible).toBe(true)
          expect(plan.analysis!.stable).toBe(true)
          expect(plan.warnings.map(w => w.code)).not.toContain('real-pole-close')
        }),
        { seed: 13, numRuns: 300 },
      )
    })

  it('P only is never stable once there is any lag, and its swing grows', () => {
    fc.assert(
      fc.property(validRig, fc.double({ min: 1e-3, max: 1e3, noNaN: true }), (rig, kp) => {
        const gains: Gains = { kp, kd: 0, ki: 0, n: 10, derivativeOn: 'measurement' }
        const a = analyzeLoop(rig, gains)
        expect(a.stable).toBe(false)
        expect(a.nyquistStable).toBe(false)
        // no margin for an unstable loop: the explanation says why
        expect(a.phaseMarginDeg).toBeNull()
        expect(a.explanation).toMatch(/derivative/)
        const p = plantOf(rig)
        expect(proportionalOscillation(p.kb, kp, p.servoLag, p.period).growthRate).toBeGreaterThan(
          0,
        )
      }),
      { seed: 14, numRuns: 300 },
    )
  })

  it(
    'every plan survives JSON unchanged and its messages carry no NaN, Infinity or '
    + 'undefined', () => {
      fc.assert(
        fc.property(
          rigAndTargets({ minRatio: 2, maxRatio: 150, forms: ['P', 'PD', 'PID'] }),
          ({ rig, targets }) => {
            const plan = planGains(rig, targets)
            expect(JSON.parse(JSON.stringify(plan))).toEqual(plan)
            for (const w of plan.warnings) {
              expect(WARNING_CODES).toContain(w.code)
              expect(w.message).not.toMatch(/NaN|Infinity|undefined|null/)
            }
          },
        ),
        { seed: 15, numRuns: 200 },
      )
    })

  it('a stability map cell says what the sampled loop\'s root test says about the same gains '
    + '(docs/planner-model.md §9)', () => {
    fc.assert(
      fc.property(validRig, (rig) => {
        const plan = planGains(rig, {
          overshootPct: 10,
          settlingTime: 40 * plantOf(rig).effectiveLag,
          form: 'PD',
          derivativeFilterN: 10,
          method: 'lag-aware',
          derivativeOn: 'measurement',
        })
        const g = plan.gains!
        const map = stabilityMap(
          rig,
          { kpRange: [0, 4 * g.kp], kdRange: [0, 4 * g.kd], n: 10, derivativeOn: 'measurement' },
          7,
        )
        const plant = plantOf(rig)
        map.kd.forEach((kd, j) =>
          map.kp.forEach((kp, i) => {
            if (kp === 0) {
              expect(map.stable[j]![i]).toBe(false)
              return
            }
            const gains = { kp, kd, ki: 0, n: 10, derivativeOn: 'measurement' as const }
            expect(map.stable[j]![i]).toBe(sampledStable(sampledLoopOf(plant, gains)))
          }),
        )
        // kd = 0 is P only: never stable
        expect(map.stable[0]!.some(Boolean)).toBe(false)
      }),
      { seed: 16, numRuns: 40 },
    )
  })
})
