// fast-check generators of valid rigs and targets, shared by the property tests.
import fc from 'fast-check'
import type { Rig, Targets } from '../../../shared/utils/planner'

const real = (min: number, max: number) =>
  fc.double({ min, max, noNaN: true, noDefaultInfinity: true })

/**
 * Any rig a careful builder could measure: every cross-field rule of rigSchema holds by
 * construction.
 */
export const validRig: fc.Arbitrary<Rig> = fc
  .record({
    beamLength: real(0.15, 1.5),
    pivotShare: real(0.3, 1),
    leverArm: real(0.008, 0.06),
    direct: fc.boolean(),
    gearRatio: real(5, 60),
    ballDiameter: real(0.008, 0.05),
    ballShell: fc.constantFrom('solid' as const, 'thin-shell' as const),
    railShare: real(0, 0.85),
    servoSecondsPer60: real(0.03, 0.4),
    servoTravelDeg: real(90, 270),
    servoType: fc.constantFrom('analog' as const, 'digital' as const, undefined),
    loopRate: real(15, 500),
    adcBits: fc.integer({ min: 6, max: 24 }),
    sensorSpanRatio: fc.option(real(0.3, 1), { nil: undefined }),
    sensorShare: fc.option(real(0.5, 1), { nil: undefined }),
    pushrodLength: fc.option(real(0.06, 0.3), { nil: undefined }),
  })
  .map((r): Rig => {
    const rig: Rig = {
      beamLength: r.beamLength,
      pivotToLink: r.beamLength * r.pivotShare,
      leverArm: Math.min(r.leverArm, r.beamLength * r.pivotShare * 0.5),
      drive: r.direct ? 'direct' : 'lever',
      ballDiameter: r.ballDiameter,
      ballShell: r.ballShell,
      railGap: r.ballDiameter * r.railShare,
      servoSecondsPer60: r.servoSecondsPer60,
      servoTravel: (r.servoTravelDeg * Math.PI) / 180,
      loopRate: r.loopRate,
      adcBits: r.adcBits,
    }
    if (r.direct) rig.gearRatio = r.gearRatio
    if (r.servoType !== undefined) rig.servoType = r.servoType
    if (r.sensorSpanRatio !== undefined) rig.sensorSpanRatio = r.sensorSpanRatio
    if (r.sensorShare !== undefined) rig.sensorLength = r.beamLength * r.sensorShare
    if (r.pushrodLength !== undefined) rig.pushrodLength = r.pushrodLength
    return rig
  })

/**
 * Targets as multiples of the rig's own effective lag, so every rig sees both hard and easy
 * requests: settling times from `minRatio`·τ_eff to `maxRatio`·τ_eff.
 */
export function targetsFor(
  effectiveLag: number,
  opts: {
    minRatio: number
    maxRatio: number
    minN?: number
    maxN?: number
    maxOvershoot?: number
    forms?: Targets['form'][]
  },
): fc.Arbitrary<Targets> {
  return fc.record({
    overshootPct: real(0, opts.maxOvershoot ?? 40),
    settlingTime: real(opts.minRatio, opts.maxRatio).map(k => k * effectiveLag),
    form: fc.constantFrom(...(opts.forms ?? (['PD', 'PID'] as const))),
    derivativeFilterN: real(opts.minN ?? 2, opts.maxN ?? 50),
    method: fc.constant('lag-aware' as const),
    derivativeOn: fc.constantFrom('measurement' as const, 'error' as const),
  })
}
