import { describe, expect, it } from 'vitest'
import { kitQuantityProblem } from '../../shared/utils/kit-quantity'

describe('kitQuantityProblem', () => {
  it('accepts a quantity within the stock left after the cart', () => {
    expect(kitQuantityProblem(2, 5, 3)).toBe('')
    expect(kitQuantityProblem(5, 5, 0)).toBe('')
  })
  it('counts the cart: names what is in it and how many more fit', () => {
    expect(kitQuantityProblem(3, 5, 3)).toBe(
      'Your cart has 3 already; 2 more can be added (5 in stock).',
    )
    expect(kitQuantityProblem(1, 5, 5)).toBe('All 5 in stock are in your cart already.')
  })
  it('says the stock plainly when the cart holds none', () => {
    expect(kitQuantityProblem(6, 5, 0)).toBe('Only 5 left in stock.')
  })
  it('keeps the line limits', () => {
    expect(kitQuantityProblem(0, 5, 0)).toBe('Enter a whole number of at least 1.')
    expect(kitQuantityProblem(1.5, 5, 0)).toBe('Enter a whole number of at least 1.')
    expect(kitQuantityProblem(501, 900, 0)).toBe('At most 500 in one order.')
    expect(kitQuantityProblem(10, 900, 495)).toBe(
      'At most 500 in one order: the cart has 495 already.',
    )
  })
})
