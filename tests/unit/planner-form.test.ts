import { describe, expect, it } from 'vitest'
import {
  checkPlannerForm,
  formFrom,
  plainMessage,
  rigFromForm,
  targetsFromForm,
} from '../../shared/utils/planner-form'
import { DEFAULT_TARGETS, KIT_PRESETS } from '../../shared/utils/planner/presets'

const form = () => formFrom(KIT_PRESETS[0]!.rig, DEFAULT_TARGETS)

describe('planner form', () => {
  it('round-trips a preset through the builder\'s units', () => {
    const f = form()
    expect(f.beamLengthMm).toBe(400)
    expect(f.servoTravelDeg).toBe(180)
    const rig = rigFromForm(f)
    for (const [k, v] of Object.entries(KIT_PRESETS[0]!.rig)) {
      const got = (rig as Record<string, unknown>)[k]
      if (typeof v === 'number') expect(got).toBeCloseTo(v, 9)
      else expect(got).toBe(v)
    }
    expect(targetsFromForm(f)).toMatchObject(DEFAULT_TARGETS)
  })

  it('keys errors by form field, in mm for the mm fields', () => {
    const r = checkPlannerForm({
      ...form(),
      beamLengthMm: -5,
      loopRateHz: null as unknown as number,
    })
    expect(r.ok).toBe(false)
    expect(r.errors.beamLengthMm).toBe('Beam length must be greater than 0 mm')
    expect(r.errors.loopRateHz).toMatch(/Loop rate must be a number/)
    // Rules across fields (rails narrower than the ball) are checked once each field is valid.
    expect(checkPlannerForm({ ...form(), railGapMm: 30 }).errors.railGapMm).toMatch(
      /smaller than the ball diameter/,
    )
  })

  it('converts metres in a message to mm only for mm fields', () => {
    expect(plainMessage('Beam length (beamLength) must be at most 5 m', 'beamLengthMm')).toBe(
      'Beam length must be at most 5000 mm',
    )
    expect(plainMessage('Gravity (gravity) must be at most 30 m/s²', 'gravity')).toBe(
      'Gravity must be at most 30 m/s²',
    )
  })

  it('passes the integral pole only for PID', () => {
    expect(
      targetsFromForm({ ...form(), form: 'PD', integralPole: 0.4 }).integralPole,
    ).toBeUndefined()
    expect(targetsFromForm({ ...form(), form: 'PID', integralPole: 0.4 }).integralPole).toBe(0.4)
  })
})
