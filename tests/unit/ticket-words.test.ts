import { describe, expect, it } from 'vitest'
import { gainsText, measuredText } from '../../shared/utils/sheet-words'
import { rigLabel, ticketAbout } from '../../shared/utils/ticket-words'

describe('what a ticket is about, in words', () => {
  it('names a rig once when its name is its serial, and an order by its number', () => {
    expect(rigLabel({ name: 'TW-10001-02', serial: 'TW-10001-02' })).toBe('TW-10001-02')
    expect(rigLabel({ name: 'Tall Tower', serial: 'TW-10001-03' })).toBe(
      'Tall Tower (TW-10001-03)',
    )
    const order = { id: 4, number: 'TW-10001' }
    expect(ticketAbout({ rig: null, order })).toBe('Order TW-10001')
    expect(ticketAbout({ rig: { id: 1, name: 'A', serial: 'TW-1-01' }, order })).toBe(
      'Rig A (TW-1-01)',
    )
  })

  const gains = (kp: number, kd: number, ki: number) =>
    ({ kp, kd, ki, n: 10, derivativeOn: 'error' as const })

  it('says a sheet\'s gains in degrees per mm and what was measured', () => {
    // 1 rad/m = 180/π °/m = 0.0573 °/mm.
    expect(gainsText(gains(1, 0.5, 0))).toBe('Kp 0.0573°/mm, Kd 0.0286°·s/mm')
    expect(gainsText(gains(1, 0.5, 2))).toContain('Ki 0.115°/(mm·s)')
    expect(measuredText(null)).toBe('—')
    expect(measuredText({ settlingTime: 1.42, overshootPct: 12 })).toBe(
      'settled in 1.42 s, 12 % overshoot',
    )
  })
})
