import { describe, expect, it } from 'vitest'
import { formatDay, formatMoment } from '../../shared/utils/dates'

describe('date formats', () => {
  it('shows days and moments the same way everywhere', () => {
    const d = new Date(2026, 11, 2, 10, 15)
    expect(formatDay(d)).toBe('Dec 2, 2026')
    expect(formatDay(d, 'long')).toBe('December 2, 2026')
    expect(formatMoment(d)).toMatch(/^Dec 2, 2026, 10:15\s?AM$/)
  })
})
