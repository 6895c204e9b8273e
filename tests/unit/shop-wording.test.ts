// The words the shop pages show for a line's quantity, a tier and an order's shipping state.
import { describe, expect, it } from 'vitest'
import { lineQuantityProblem, MAX_LINE_QUANTITY } from '../../shared/schemas/shop'
import { tierRangeLabel, tierWording } from '../../shared/utils/pricing'
import { releasedWords, shippingNote } from '../../shared/utils/shop-rules'

describe('a cart line\'s quantity', () => {
  it('names the allowed range for 0, negatives, fractions, blanks and too many', () => {
    for (const q of [0, -2, 2.5, Number.NaN, MAX_LINE_QUANTITY + 1, 99999]) {
      expect(lineQuantityProblem(q)).toBe(`The quantity must be a whole number from 1 to ${MAX_LINE_QUANTITY}.`)
    }
  })
  it('says how many are left when the line asks for more than the stock', () => {
    expect(lineQuantityProblem(120, 100)).toBe('Only 100 left in stock: lower the quantity to 100 or fewer.')
    expect(lineQuantityProblem(3, 0)).toBe('Out of stock: remove this line.')
    expect(lineQuantityProblem(100, 100)).toBeNull()
    expect(lineQuantityProblem(1)).toBeNull()
  })
})

describe('tier wording', () => {
  it('uses the kit page\'s range labels', () => {
    const tiers = [{ minQuantity: 1, unitPriceCents: 500 }, { minQuantity: 5, unitPriceCents: 450 }, { minQuantity: 12, unitPriceCents: 400 }]
    expect(tierWording(tierRangeLabel(tiers, tiers[0]!))).toBe('price for 1–4')
    expect(tierWording(tierRangeLabel(tiers, tiers[2]!))).toBe('price for 12+')
  })
})

describe('an order\'s shipping note', () => {
  it('matches the state of the order', () => {
    expect(shippingNote({ status: 'po review', paymentMethod: 'purchase-order' })).toBe('Ships once the PO is approved and allocated.')
    expect(shippingNote({ status: 'awaiting payment', paymentMethod: 'card' })).toBe('Ships once paid and allocated.')
    expect(shippingNote({ status: 'awaiting payment', paymentMethod: 'purchase-order', allocated: true })).toBe('Ready to ship.')
    expect(shippingNote({ status: 'rejected', paymentMethod: 'purchase-order', purchaseOrder: { status: 'rejected', rejectReason: 'The PO is unsigned' } }))
      .toBe('Purchase order rejected: The PO is unsigned. Nothing will ship.')
    expect(shippingNote({ status: 'cancelled', paymentMethod: 'card' })).toBe('Cancelled: nothing will ship.')
  })
  it('counts the released units in words', () => {
    expect(releasedWords(7)).toBe('The 7 units it held were released.')
    expect(releasedWords(1)).toBe('The 1 unit it held was released.')
    expect(releasedWords(0)).toBe('')
  })
})
