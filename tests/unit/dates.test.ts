import { describe, expect, it } from 'vitest'
import * as dates from '../../shared/utils/dates'
import { formatDay, formatMoment } from '../../shared/utils/dates'

describe('date formats', () => {
  it('writes a day and a moment one way each', () => {
    const d = new Date(2026, 11, 2, 10, 15)
    expect(formatDay(d)).toBe('Dec 2, 2026')
    expect(formatDay(d.toISOString())).toBe('Dec 2, 2026')
    expect(formatMoment(d)).toMatch(/^Dec 2, 2026, 10:15\s?AM$/)
  })

  it('names a calendar day (a DATE column) as that day in any time zone', () => {
    // Read as a moment, "2026-12-02" is midnight UTC: the evening of Dec 1 in California.
    const was = process.env.TZ
    process.env.TZ = 'America/Los_Angeles'
    try {
      expect(new Date('2026-12-02').toLocaleDateString('en-US')).toBe('12/1/2026')
      expect(formatDay('2026-12-02')).toBe('Dec 2, 2026')
      expect(formatDay('2027-01-01')).toBe('Jan 1, 2027')
    } finally {
      if (was === undefined) delete process.env.TZ
      else process.env.TZ = was
    }
  })

  it('offers no other format', () => {
    expect(Object.keys(dates).sort()).toEqual(['formatDay', 'formatMoment'])
  })
})
