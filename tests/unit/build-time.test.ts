import { describe, expect, it } from 'vitest'
import { durationWords, sinceWords } from '../../shared/utils/build-time'

describe('board time words', () => {
  it('says a duration in hours and minutes', () => {
    expect(durationWords(80 * 60_000)).toBe('1 h 20 min')
    expect(durationWords(45 * 60_000 + 59_000)).toBe('45 min')
    expect(durationWords(3 * 3_600_000)).toBe('3 h')
    expect(durationWords(10_000)).toBe('1 min')
    expect(durationWords(26 * 3_600_000 + 2 * 60_000)).toBe('1 day 2 h')
    expect(durationWords(24 * 3_600_000 + 59 * 60_000)).toBe('1 day')
    expect(durationWords(146 * 3_600_000 + 50 * 60_000)).toBe('6 days')
  })

  it('says how long ago, in days past two days', () => {
    const now = new Date('2026-03-02T14:00:00Z')
    expect(sinceWords('2026-03-02T13:59:30Z', now)).toBe('just now')
    expect(sinceWords('2026-03-02T13:48:00Z', now)).toBe('12 min ago')
    expect(sinceWords('2026-03-01T12:00:00Z', now)).toBe('1 day 2 h ago')
    expect(sinceWords('2026-02-27T14:00:00Z', now)).toBe('3 days ago')
  })
})
