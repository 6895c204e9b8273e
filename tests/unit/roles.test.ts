import { describe, expect, it } from 'vitest'
import {
  canBuy,
  canManageStaff,
  canUseHelpQueue,
  isStaff,
  landingFor,
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

  it('links customers to their tickets and the staff to the help queue', () => {
    const links = (r: Parameters<typeof navigationFor>[0]) =>
      navigationFor(r).map(l => `${l.label} ${l.to}`)
    for (const role of ['teacher', 'builder'] as const) {
      expect(links({ role })).toContain('Tickets /tickets')
      expect(links({ role })).not.toContain('Help queue /help-queue')
    }
    for (const role of ['support', 'admin'] as const) {
      expect(links({ role })).toContain('Help queue /help-queue')
      expect(links({ role })).not.toContain('Tickets /tickets')
    }
    expect(links(null).some(l => l.includes('/tickets') || l.includes('/help-queue'))).toBe(false)
    expect(landingFor({ role: 'support' })).toBe('/help-queue')
    expect(landingFor({ role: 'admin' })).toBe('/staff')
  })

  it('sends builders to their rigs and gives teachers the build spaces', () => {
    const links = (r: Parameters<typeof navigationFor>[0]) =>
      navigationFor(r).map(l => `${l.label} ${l.to}`)
    expect(links({ role: 'builder' })[0]).toBe('Your rigs /rigs')
    expect(links({ role: 'builder' })).not.toContain('Build spaces /rigs')
    expect(links({ role: 'teacher' })).toContain('Build spaces /rigs')
    expect(links({ role: 'support' }).some(l => l.endsWith('/rigs'))).toBe(false)
    expect(links(null).some(l => l.endsWith('/rigs'))).toBe(false)
    expect(landingFor({ role: 'builder' })).toBe('/rigs')
    expect(landingFor({ role: 'teacher' })).toBe('/')
  })
})
