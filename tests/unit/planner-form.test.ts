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

  it('takes a motor on the pivot with a blank gear reduction as one for one, not an error', () => {
    const f = { ...form(), drive: 'direct' as const, gearRatio: null }
    const r = checkPlannerForm(f)
    expect(r.errors.gearRatio).toBeUndefined()
    expect(r.ok && r.rig.gearRatio).toBe(1)
    expect(form().gearRatio).toBe(1)
    // An entered reduction is kept.
    expect(rigFromForm({ ...f, gearRatio: 30 }).gearRatio).toBe(30)
  })

  it('refuses a loop rate outside 10 to 1000 Hz, saying the range', () => {
    expect(checkPlannerForm({ ...form(), loopRateHz: 5000 }).errors.loopRateHz).toMatch(
      /at most 1000 Hz/,
    )
    expect(checkPlannerForm({ ...form(), loopRateHz: 5 }).errors.loopRateHz).toMatch(
      /at least 10 Hz/,
    )
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
