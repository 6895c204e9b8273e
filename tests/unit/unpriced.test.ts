import { describe, expect, it } from 'vitest'
import { formatCents } from '../../shared/utils/pricing'
import { withoutAmounts } from '../../shared/utils/unpriced'

describe('withoutAmounts', () => {
  it('takes every amount formatCents writes out of the timeline words', () => {
    for (const cents of [0, 5, 1250, 123456, 100000000, -500]) {
      const words = `Payment of ${formatCents(cents)} recorded by Ada (reference 12.50).`
      expect(withoutAmounts(words)).toBe('Payment of an amount recorded by Ada (reference 12.50).')
    }
  })

  it('leaves words without amounts alone', () => {
    const words = 'Shipped with UPS, tracking 1Z 99.'
    expect(withoutAmounts(words)).toBe(words)
  })
})
