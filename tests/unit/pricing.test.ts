import { describe, expect, it } from 'vitest'
import fc from 'fast-check'
import {
  formatCents,
  MAX_ORDER_TOTAL_CENTS,
  orderSizeProblem,
  priceCart,
  priceLine,
  SHIPPING,
  shippingCents,
  taxCents,
  tierFor,
  tierProblems,
  tierRangeLabel,
  totalsFor,
} from '../../shared/utils/pricing'

const tiers = [
  { minQuantity: 1, unitPriceCents: 14900 },
  { minQuantity: 5, unitPriceCents: 13400 },
  { minQuantity: 12, unitPriceCents: 11900 },
]

describe('classroom tiers', () => {
  it('picks the tier whose minimum the quantity reaches, at each boundary', () => {
    expect([1, 4, 5, 11, 12, 300].map(q => tierFor(tiers, q).unitPriceCents)).toEqual([
      14900, 14900, 13400, 13400, 11900, 11900,
    ])
  })

  it('does not depend on the order tiers are listed in', () => {
    expect(tierFor([...tiers].reverse(), 7).minQuantity).toBe(5)
  })

  it('refuses quantities below one, fractions, and tier lists with no tier from 1', () => {
    expect(() => tierFor(tiers, 0)).toThrow(RangeError)
    expect(() => tierFor(tiers, 2.5)).toThrow(RangeError)
    expect(() => tierFor([{ minQuantity: 5, unitPriceCents: 100 }], 2)).toThrow(/tier from 1/)
  })

  it('prices a line as tier price times quantity', () => {
    expect(
      priceLine({ productId: 1, name: 'Kit', quantity: 12, tiers, weightGrams: 2100 }),
    ).toMatchObject({ tierMinQuantity: 12, unitPriceCents: 11900, lineTotalCents: 142_800 })
  })

  it('labels tier ranges like 1–4, 5–11, 12+', () => {
    expect(tiers.map(t => tierRangeLabel(tiers, t))).toEqual(['1–4', '5–11', '12+'])
    expect(
      tierRangeLabel(
        [
          { minQuantity: 1, unitPriceCents: 1 },
          { minQuantity: 2, unitPriceCents: 1 },
        ],
        { minQuantity: 1, unitPriceCents: 1 },
      ),
    ).toBe('1')
  })

  it('says what is wrong with a tier list', () => {
    expect(tierProblems(tiers)).toBeNull()
    expect(tierProblems([])).toMatch(/at least one/)
    expect(tierProblems([{ minQuantity: 2, unitPriceCents: 5 }])).toMatch(/quantity 1/)
    expect(
      tierProblems([
        { minQuantity: 1, unitPriceCents: 5 },
        { minQuantity: 1, unitPriceCents: 4 },
      ]),
    ).toMatch(/same quantity/)
    expect(tierProblems([{ minQuantity: 1, unitPriceCents: 0 }])).toMatch(/above zero/)
  })

  it('never charges more per unit for a larger quantity when tiers fall in price', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 499 }),
        q => tierFor(tiers, q + 1).unitPriceCents <= tierFor(tiers, q).unitPriceCents,
      ),
    )
  })
})

describe('shipping and tax', () => {
  it(
    'charges handling plus each started half kilogram, capped, and nothing from the '
    + 'free-freight threshold', () => {
      expect(shippingCents(10_000, 500)).toBe(SHIPPING.handlingCents + SHIPPING.perHalfKiloCents)
      const twoHalfKilos = SHIPPING.handlingCents + 2 * SHIPPING.perHalfKiloCents
      expect(shippingCents(10_000, 501)).toBe(twoHalfKilos)
      expect(shippingCents(10_000, 400_000)).toBe(SHIPPING.capCents)
      expect(shippingCents(SHIPPING.freeFromSubtotalCents - 1, 2100)).toBeGreaterThan(0)
      expect(shippingCents(SHIPPING.freeFromSubtotalCents, 2100)).toBe(0)
      expect(shippingCents(0, 0)).toBe(0)
    })

  it('rounds tax half up to the cent, and charges none when exempt', () => {
    // 7.25 % of $1.00 is 7.25 ¢ → 7 ¢; of $2.00 is 14.5 ¢ → 15 ¢ (half up).
    expect(taxCents(100, 725, false)).toBe(7)
    expect(taxCents(200, 725, false)).toBe(15)
    expect(taxCents(14_900, 725, false)).toBe(1080)
    expect(taxCents(14_900, 725, true)).toBe(0)
  })

  it('keeps every total a whole number of cents equal to the sum of its parts', () => {
    fc.assert(
      fc.property(
        fc.array(
          fc.record({ q: fc.integer({ min: 1, max: 60 }), w: fc.integer({ min: 1, max: 5000 }) }),
          { minLength: 1, maxLength: 6 },
        ),
        fc.boolean(),
        (ls, exempt) => {
          const cart = priceCart(
            ls.map((l, i) => ({
              productId: i + 1,
              name: `P${i}`,
              quantity: l.q,
              tiers,
              weightGrams: l.w,
            })),
            { exempt, rateBasisPoints: 725, state: 'CA' },
          )
          expect(Number.isInteger(cart.totalCents)).toBe(true)
          expect(cart.totalCents).toBe(cart.subtotalCents + cart.shippingCents + cart.taxCents)
          expect(cart.subtotalCents).toBe(cart.lines.reduce((s, l) => s + l.lineTotalCents, 0))
          if (exempt) expect(cart.taxCents).toBe(0)
        },
      ),
    )
  })

  it('prices a class set of 12 rig kits for a taxed school', () => {
    const cart = priceCart(
      [{ productId: 1, name: 'Kit', quantity: 12, tiers, weightGrams: 2100 }],
      { exempt: false, rateBasisPoints: 725, state: 'CA' },
    )
    // 12 × $119.00 = $1,428.00, under free freight: $9.00 + 51 half-kilos × $1.40 = $80.40; tax
    // 7.25 % = $103.53.
    expect(cart).toMatchObject({
      subtotalCents: 142_800,
      shippingCents: 8040,
      taxCents: 10_353,
      totalCents: 161_193,
    })
  })

  it('totals an empty cart as zero', () => {
    expect(totalsFor([], 0, { exempt: false, rateBasisPoints: 725, state: 'CA' })).toMatchObject({
      subtotalCents: 0,
      shippingCents: 0,
      taxCents: 0,
      totalCents: 0,
    })
  })
})

describe('money as text', () => {
  it('formats cents as US dollars with thousands separators', () => {
    expect([0, 5, 100, 123_456, 100_000_000, -250].map(formatCents)).toEqual([
      '$0.00',
      '$0.05',
      '$1.00',
      '$1,234.56',
      '$1,000,000.00',
      '-$2.50',
    ])
  })
})

describe('prices typed by an admin', () => {
  it('turns dollar text into whole cents without floating point', async () => {
    const { parseDollars } = await import('../../shared/utils/pricing')
    expect(['24.5', '$1,240.00', '0.07', '19', '4.10'].map(parseDollars)).toEqual([
      2450, 124_000, 7, 1900, 410,
    ])
    expect(['', 'abc', '1.234', '-3', '1e3'].map(parseDollars)).toEqual([
      null,
      null,
      null,
      null,
      null,
    ])
  })
})

describe('order size', () => {
  it('allows up to the online limit and names it beyond', () => {
    expect(MAX_ORDER_TOTAL_CENTS).toBeLessThan(2 ** 31)
    expect(orderSizeProblem({ totalCents: MAX_ORDER_TOTAL_CENTS })).toBeNull()
    expect(orderSizeProblem({ totalCents: MAX_ORDER_TOTAL_CENTS + 1 })).toMatch(
      /at most \$5,000,000\.00/,
    )
  })
})
