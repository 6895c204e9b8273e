import { describe, expect, it } from 'vitest'
import { REFERENCE_RIG, REFERENCE_TARGETS } from './fixtures'
import {
  calibrationSchema,
  gainsSchema,
  KIT_PRESETS,
  rigSchema,
  targetsSchema,
  type Rig,
} from '../../../shared/utils/planner'

const rig: Rig = REFERENCE_RIG

function issuesOf(result: {
  success: boolean
  error?: { issues: { path: PropertyKey[], message: string }[] }
}) {
  expect(result.success).toBe(false)
  return result.error!.issues
}

/** The parse fails with an issue on `field` whose message names the field. */
function expectFieldError(result: Parameters<typeof issuesOf>[0], field: string) {
  const issues = issuesOf(result)
  const hit = issues.find(i => i.path[0] === field)
  expect(hit, `an issue on ${field}, got ${JSON.stringify(issues)}`).toBeDefined()
  expect(hit!.message).toContain(field)
}

describe('rigSchema', () => {
  it('accepts every kit preset unchanged', () => {
    for (const p of KIT_PRESETS) {
      const r = rigSchema.safeParse(p.rig)
      expect(r.success).toBe(true)
      expect(r.data).toEqual(p.rig)
    }
  })

  const nonsense: [string, Partial<Record<keyof Rig, unknown>>, string][] = [
    ['a negative beam length', { beamLength: -0.4 }, 'beamLength'],
    ['a zero beam length', { beamLength: 0 }, 'beamLength'],
    ['NaN for the beam length', { beamLength: Number.NaN }, 'beamLength'],
    ['Infinity for the beam length', { beamLength: Infinity }, 'beamLength'],
    ['a string for the beam length', { beamLength: '0.4' }, 'beamLength'],
    ['a zero lever arm', { leverArm: 0 }, 'leverArm'],
    ['a lever arm longer than the beam', { leverArm: 0.5 }, 'leverArm'],
    ['a pivot-to-link longer than the beam', { pivotToLink: 0.45 }, 'pivotToLink'],
    ['a negative pivot-to-link', { pivotToLink: -0.2 }, 'pivotToLink'],
    ['rails wider than the ball', { railGap: 0.02 }, 'railGap'],
    ['rails exactly as wide as the ball', { railGap: 0.019 }, 'railGap'],
    ['a negative rail gap', { railGap: -0.001 }, 'railGap'],
    ['a zero ball diameter', { ballDiameter: 0 }, 'ballDiameter'],
    ['a loop rate of 0', { loopRate: 0 }, 'loopRate'],
    ['a negative loop rate', { loopRate: -50 }, 'loopRate'],
    ['an unknown drive', { drive: 'belt' }, 'drive'],
    ['an unknown ball shell', { ballShell: 'hollow' }, 'ballShell'],
    ['an unknown ball material', { ballMaterial: 'wood' }, 'ballMaterial'],
    ['an unknown servo type', { servoType: 'steam' }, 'servoType'],
    ['5 ADC bits', { adcBits: 5 }, 'adcBits'],
    ['25 ADC bits', { adcBits: 25 }, 'adcBits'],
    ['a fractional number of ADC bits', { adcBits: 10.5 }, 'adcBits'],
    ['a zero servo speed', { servoSecondsPer60: 0 }, 'servoSecondsPer60'],
    ['a zero servo travel', { servoTravel: 0 }, 'servoTravel'],
    ['a servo travel over a full turn', { servoTravel: 7 }, 'servoTravel'],
    ['a sensor span ratio above 1', { sensorSpanRatio: 1.5 }, 'sensorSpanRatio'],
    ['a sensor longer than the beam', { sensorLength: 0.5 }, 'sensorLength'],
    ['zero gravity', { gravity: 0 }, 'gravity'],
    ['a zero pushrod', { pushrodLength: 0 }, 'pushrodLength'],
    ['a direct drive with no gear ratio', { drive: 'direct' }, 'gearRatio'],
    ['a zero gear ratio', { drive: 'direct', gearRatio: 0 }, 'gearRatio'],
  ]
  it.each(nonsense)('rejects %s with a message naming the field', (_, patch, field) => {
    expectFieldError(rigSchema.safeParse({ ...rig, ...patch }), field)
  })

  it('names a missing field', () => {
    const { loopRate: _drop, ...rest } = rig
    expectFieldError(rigSchema.safeParse(rest), 'loopRate')
  })

  it('accepts a direct drive with its gear ratio', () => {
    expect(rigSchema.safeParse({ ...rig, drive: 'direct', gearRatio: 20 }).success).toBe(true)
  })
})

describe('targetsSchema', () => {
  it('accepts the default targets', () => {
    expect(targetsSchema.safeParse(REFERENCE_TARGETS).success).toBe(true)
  })
  it.each([
    ['100 % overshoot', { overshootPct: 100 }, 'overshootPct'],
    ['negative overshoot', { overshootPct: -1 }, 'overshootPct'],
    ['a zero settling time', { settlingTime: 0 }, 'settlingTime'],
    ['NaN settling time', { settlingTime: Number.NaN }, 'settlingTime'],
    ['an unknown controller form', { form: 'PI' }, 'form'],
    ['an unknown method', { method: 'magic' }, 'method'],
    ['an unknown derivative signal', { derivativeOn: 'setpoint' }, 'derivativeOn'],
    ['a zero derivative filter N', { derivativeFilterN: 0 }, 'derivativeFilterN'],
    ['a negative integral pole', { integralPole: -1 }, 'integralPole'],
    ['a zero step size', { stepSize: 0 }, 'stepSize'],
    ['an unknown discretisation', { discretization: 'euler' }, 'discretization'],
  ] as const)('rejects %s with a message naming the field', (_, patch, field) => {
    expectFieldError(targetsSchema.safeParse({ ...REFERENCE_TARGETS, ...patch }), field)
  })
})

describe('gainsSchema', () => {
  const gains = { kp: 7, kd: 3.8, ki: 0, n: 10, derivativeOn: 'measurement' }
  it('accepts plain PD gains', () => {
    expect(gainsSchema.safeParse(gains).success).toBe(true)
  })
  it.each([
    ['a zero Kp', { kp: 0 }, 'kp'],
    ['a negative Kd', { kd: -1 }, 'kd'],
    ['an infinite Ki', { ki: Infinity }, 'ki'],
    ['a zero N', { n: 0 }, 'n'],
    ['an unknown derivative signal', { derivativeOn: 'both' }, 'derivativeOn'],
  ] as const)('rejects %s with a message naming the field', (_, patch, field) => {
    expectFieldError(gainsSchema.safeParse({ ...gains, ...patch }), field)
  })
})

describe('calibrationSchema', () => {
  it('needs two pairs and names the field', () => {
    expectFieldError(
      calibrationSchema.safeParse({ adcBits: 10, pairs: [{ reading: 1, position: 0 }] }),
      'pairs',
    )
  })
  it('rejects adcBits out of 6..24', () => {
    expectFieldError(calibrationSchema.safeParse({ adcBits: 30, pairs: [] }), 'adcBits')
  })
})
