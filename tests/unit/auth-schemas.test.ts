import { describe, expect, it } from 'vitest'
import { changePasswordSchema, loginSchema, registerSchema } from '../../shared/schemas/auth'
import { fieldErrorsOf } from '../../shared/utils/field-errors'

const school = {
  name: 'A School',
  addressLine1: '1 Road',
  city: 'Town',
  region: 'WA',
  postalCode: '12345',
}

describe('auth schemas', () => {
  it('normalises the e-mail address and defaults the country', () => {
    const r = registerSchema.parse({
      name: ' Ana ',
      email: '  Ana@School.TEST ',
      password: 'long-enough-1',
      school,
    })
    expect(r.email).toBe('ana@school.test')
    expect(r.name).toBe('Ana')
    expect(r.school.country).toBe('US')
  })

  it('names every bad field', () => {
    const r = registerSchema.safeParse({
      name: '',
      email: 'nope',
      password: 'x',
      school: { ...school, postalCode: '', country: 'USA' },
    })
    expect(r.success).toBe(false)
    const f = fieldErrorsOf(r.error!)
    expect(Object.keys(f).sort()).toEqual([
      'email',
      'name',
      'password',
      'school.country',
      'school.postalCode',
    ])
  })

  it('rejects an over-long password and an unchanged new password', () => {
    expect(
      fieldErrorsOf(loginSchema.safeParse({ email: 'a@b.test', password: 'x'.repeat(201) }).error!)
        .password,
    ).toMatch(/too long/)
    expect(
      fieldErrorsOf(
        changePasswordSchema.safeParse({
          currentPassword: 'same-password-1',
          newPassword: 'same-password-1',
        }).error!,
      ).newPassword,
    ).toMatch(/different/)
  })
})
