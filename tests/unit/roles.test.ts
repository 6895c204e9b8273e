import { describe, expect, it } from 'vitest'
import {
  canBuy,
  canManageStaff,
  canUseHelpQueue,
  isStaff,
  navigationFor,
} from '../../shared/utils/roles'

describe('authorization rules', () => {
  it('gives each role only its own powers', () => {
    expect([
      canBuy({ role: 'teacher' }),
      canBuy({ role: 'builder' }),
      canBuy({ role: 'support' }),
      canBuy(null),
    ]).toEqual([true, false, false, false])
    expect([
      isStaff({ role: 'support' }),
      isStaff({ role: 'admin' }),
      isStaff({ role: 'teacher' }),
    ]).toEqual([true, true, false])
    expect(canUseHelpQueue({ role: 'builder' })).toBe(false)
    expect([canManageStaff({ role: 'support' }), canManageStaff({ role: 'admin' })]).toEqual([
      false,
      true,
    ])
  })

  it('builds the header navigation by role', () => {
    const labels = (r: Parameters<typeof navigationFor>[0]) => navigationFor(r).map(l => l.label)
    expect(labels(null)).not.toContain('Staff desk')
    expect(labels({ role: 'support' })).toContain('Staff desk')
    expect(labels({ role: 'support' })).not.toContain('Staff accounts')
    expect(labels({ role: 'admin' })).toContain('Staff accounts')
  })
})
