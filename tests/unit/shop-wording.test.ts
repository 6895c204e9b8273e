// The words the shop pages show for a line's quantity, a tier and an order's shipping state.
import { describe, expect, it } from 'vitest'
import { lineQuantityProblem, MAX_LINE_QUANTITY, tiersSchema } from '../../shared/schemas/shop'
import {
  lineTierWording,
  priceLine,
  risingTierProblems,
  tierRangeLabel,
  tierWording,
} from '../../shared/utils/pricing'
import { fieldErrorsOf } from '../../shared/utils/field-errors'
import { wayBackAfterRejection } from '../../shared/utils/resubmit'
import { releasedWords, shippingNote } from '../../shared/utils/shop-rules'

describe('a cart line\'s quantity', () => {
  it('names the allowed range for 0, negatives, fractions, blanks and too many', () => {
    for (const q of [0, -2, 2.5, Number.NaN, MAX_LINE_QUANTITY + 1, 99999]) {
      expect(lineQuantityProblem(q)).toBe(
        `The quantity must be a whole number from 1 to ${MAX_LINE_QUANTITY}.`,
      )
    }
  })
  it('says how many are left when the line asks for more than the stock', () => {
    expect(lineQuantityProblem(120, 100)).toBe(
      'Only 100 left in stock: lower the quantity to 100 or fewer.',
    )
    expect(lineQuantityProblem(3, 0)).toBe('Out of stock: remove this line.')
    expect(lineQuantityProblem(100, 100)).toBeNull()
    expect(lineQuantityProblem(1)).toBeNull()
  })
})

describe('tier wording', () => {
  it('uses the kit page\'s range labels', () => {
    const tiers = [
      { minQuantity: 1, unitPriceCents: 500 },
      { minQuantity: 5, unitPriceCents: 450 },
      { minQuantity: 12, unitPriceCents: 400 },
    ]
    expect(tierWording(tierRangeLabel(tiers, tiers[0]!))).toBe('price for 1–4')
    expect(tierWording(tierRangeLabel(tiers, tiers[2]!))).toBe('price for 12+')
  })
})

describe('an order\'s shipping note', () => {
  it('matches the state of the order', () => {
    expect(shippingNote({ status: 'po review', paymentMethod: 'purchase-order' })).toBe(
      'Ships once the PO is approved and allocated.',
    )
    expect(shippingNote({ status: 'awaiting payment', paymentMethod: 'card' })).toBe(
      'Ships once paid and allocated.',
    )
    expect(
      shippingNote({
        status: 'awaiting payment',
        paymentMethod: 'purchase-order',
        allocated: true,
      }),
    ).toBe('Ready to ship.')
    expect(
      shippingNote({
        status: 'rejected',
        paymentMethod: 'purchase-order',
        purchaseOrder: { status: 'rejected', rejectReason: 'The PO is unsigned' },
      }),
    ).toBe('Purchase order rejected: The PO is unsigned. Nothing will ship.')
    expect(shippingNote({ status: 'cancelled', paymentMethod: 'card' })).toBe(
      'Cancelled: nothing will ship.',
    )
  })
  it('counts the released units in words', () => {
    expect(releasedWords(7)).toBe('The 7 units it held were released.')
    expect(releasedWords(1)).toBe('The 1 unit it held was released.')
    expect(releasedWords(0)).toBe('')
  })
})

describe('one tier wording for every line', () => {
  it('never says "1+": a lone tier from 1 is "any quantity", a stored label wins', () => {
    expect(
      tierRangeLabel([{ minQuantity: 1, unitPriceCents: 900 }], {
        minQuantity: 1,
        unitPriceCents: 900,
      }),
    ).toBe('any quantity')
    expect(lineTierWording({ tierMinQuantity: 1, tierLabel: '1–9' })).toBe('price for 1–9')
    expect(lineTierWording({ tierMinQuantity: 10, tierLabel: null })).toBe('price for 10+')
    expect(lineTierWording({ tierMinQuantity: 1, tierLabel: null })).toBe('price for any quantity')
  })

  it('keeps each line\'s range when a cart is priced', () => {
    const tiers = [
      { minQuantity: 1, unitPriceCents: 500 },
      { minQuantity: 10, unitPriceCents: 450 },
    ]
    const lines = [3, 10].map(quantity =>
      priceLine({ productId: 1, name: 'P', quantity, tiers, weightGrams: 1 }),
    )
    expect(lines.map(l => lineTierWording(l))).toEqual(['price for 1–9', 'price for 10+'])
  })
})

describe('tier prices never rise with quantity', () => {
  it('flags each tier priced above a smaller quantity\'s, by its place in the list', () => {
    const ok = [
      { minQuantity: 1, unitPriceCents: 500 },
      { minQuantity: 10, unitPriceCents: 500 },
      { minQuantity: 20, unitPriceCents: 400 },
    ]
    expect(risingTierProblems(ok)).toEqual([])
    const bad = [
      { minQuantity: 20, unitPriceCents: 450 },
      { minQuantity: 1, unitPriceCents: 500 },
      { minQuantity: 10, unitPriceCents: 400 },
    ]
    expect(risingTierProblems(bad).map(p => p.index)).toEqual([0])
    expect(risingTierProblems(bad)[0]!.message).toMatch(/\$4\.00/)
  })

  it('gives the product schema a field error on the rising price', () => {
    const r = tiersSchema.safeParse([
      { minQuantity: 1, unitPriceCents: 500 },
      { minQuantity: 10, unitPriceCents: 600 },
    ])
    expect(Object.keys(fieldErrorsOf(r.error!))).toEqual(['1.unitPriceCents'])
  })
})

describe('the way back from a refused purchase order', () => {
  const future = new Date(Date.now() + 86_400_000)
  const past = new Date(Date.now() - 86_400_000)
  it('offers the quote while it is valid, else the same lines, and nothing unless refused', () => {
    expect(wayBackAfterRejection({ id: 7 }, { status: 'review' }, null)).toBeNull()
    expect(
      wayBackAfterRejection(
        { id: 7 },
        { status: 'rejected' },
        { id: 3, number: 'Q-1', validUntil: future, orderId: null },
      ),
    ).toMatchObject({ kind: 'quote', url: '/checkout?quote=3' })
    expect(
      wayBackAfterRejection(
        { id: 7 },
        { status: 'rejected' },
        { id: 3, number: 'Q-1', validUntil: past, orderId: null },
      ),
    ).toMatchObject({ kind: 'same-lines', url: '/checkout?resubmit=7' })
    expect(wayBackAfterRejection({ id: 7 }, { status: 'rejected' }, null)).toMatchObject({
      kind: 'same-lines',
    })
  })
})
