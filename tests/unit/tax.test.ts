// Sales tax by destination, the exemption, and what the documents say about it.
import { describe, expect, it } from 'vitest'
import { US_STATES } from '../../shared/data/us-sales-tax'
import { priceCart, taxCents } from '../../shared/utils/pricing'
import {
  formatRate,
  quoteTaxNote,
  retax,
  taxBasisFor,
  taxLineLabel,
  taxNotes,
  usState,
} from '../../shared/utils/tax'
import { checkoutAddressesSchema } from '../../shared/schemas/address'
import { fieldErrorsOf } from '../../shared/utils/field-errors'

const tiers = [{ minQuantity: 1, unitPriceCents: 10_000 }]
const cart = (state: string | null, exempt = false) =>
  priceCart(
    [{ productId: 1, name: 'Kit', quantity: 1, tiers, weightGrams: 100 }],
    taxBasisFor(state, exempt),
  )

describe('the state table', () => {
  it('has the 50 states and DC once each, with rates from 0 to 10 %', () => {
    expect(new Set(US_STATES.map(s => s.code)).size).toBe(51)
    for (const s of US_STATES) {
      expect(s.baseRateBasisPoints).toBeGreaterThanOrEqual(0)
      expect(s.baseRateBasisPoints).toBeLessThanOrEqual(1000)
      // Whole or half basis points only: taxCents works in integer tenths.
      expect(Number.isInteger(s.baseRateBasisPoints * 2)).toBe(true)
    }
  })

  it('charges nothing in the states without a statewide sales tax', () => {
    for (const code of ['AK', 'DE', 'MT', 'NH', 'OR']) {
      expect(usState(code)!.baseRateBasisPoints).toBe(0)
      expect(cart(code).taxCents).toBe(0)
    }
  })
})

describe('tax by destination', () => {
  it('takes the ship-to state\'s rate, whatever case it is written in', () => {
    expect(taxBasisFor('wa', false)).toEqual({
      state: 'WA',
      rateBasisPoints: usState('WA')!.baseRateBasisPoints,
      exempt: false,
    })
    const wa = cart('WA')
    const ca = cart('CA')
    expect(wa.taxCents).toBe(taxCents(10_000, usState('WA')!.baseRateBasisPoints, false))
    expect(ca.taxCents).toBe(taxCents(10_000, usState('CA')!.baseRateBasisPoints, false))
    expect(wa.taxState).toBe('WA')
    expect(wa.totalCents).toBe(wa.subtotalCents + wa.shippingCents + wa.taxCents)
  })

  it(
    'works half basis points in integers: 6.875 % of $100.00 is $6.88 (6.875 rounds '
    + 'half up)', () => {
      expect(taxCents(10_000, 687.5, false)).toBe(688)
      expect(taxCents(100, 687.5, false)).toBe(7)
      expect(taxCents(40, 687.5, false)).toBe(3) // 2.75 → 3
      expect(formatRate(687.5)).toBe('6.875%')
      expect(formatRate(650)).toBe('6.5%')
    })

  it('charges no tax and knows no state when the destination is unknown', () => {
    const anon = cart(null)
    expect(anon).toMatchObject({ taxCents: 0, taxState: null, taxExempt: false })
    expect(taxBasisFor('ZZ', false).state).toBeNull()
    expect(taxLineLabel(anon)).toBe('Sales tax (by ship-to state)')
  })
})

describe('the exemption', () => {
  it('charges nothing anywhere once the certificate is accepted, and says it was applied', () => {
    const exempt = cart('CA', true)
    expect(exempt).toMatchObject({ taxCents: 0, taxExempt: true, taxRateBasisPoints: 0 })
    expect(taxLineLabel(exempt)).toMatch(/exemption applied/)
    expect(taxNotes(exempt).join(' ')).toMatch(/exemption applied/i)
    expect(taxNotes(exempt).join(' ')).toMatch(/business office decides/)
  })

  it('says a taxed document\'s tax is an estimate without local rates', () => {
    const notes = taxNotes(cart('WA')).join(' ')
    expect(notes).toMatch(/estimate/)
    expect(notes).toMatch(/local .* not included/)
    expect(notes).toMatch(/Washington/)
    expect(taxLineLabel(cart('WA'))).toBe(
      `Sales tax (WA ${formatRate(usState('WA')!.baseRateBasisPoints)}, estimated)`,
    )
    expect(taxLineLabel(cart('OR'))).toBe('Sales tax (OR: no state sales tax)')
  })

  it(
    'takes the tax off a quote turned into an order after the exemption, keeping its '
    + 'prices and shipping', () => {
      const quoted = cart('CA')
      expect(quoted.taxCents).toBeGreaterThan(0)
      const ordered = retax(quoted, taxBasisFor('CA', true))
      expect(ordered).toMatchObject({
        subtotalCents: quoted.subtotalCents,
        shippingCents: quoted.shippingCents,
        taxCents: 0,
        taxExempt: true,
      })
      expect(ordered.totalCents).toBe(quoted.totalCents - quoted.taxCents)
      expect(quoteTaxNote(quoted, ordered)).toMatch(/exemption applied/i)
    })

  it('re-taxes a quote for another ship-to state, and says nothing when nothing changed', () => {
    const quoted = cart('CA')
    expect(quoteTaxNote(quoted, retax(quoted, taxBasisFor('CA', false)))).toBeNull()
    const toOregon = retax(quoted, taxBasisFor('OR', false))
    expect(toOregon.taxCents).toBe(0)
    expect(quoteTaxNote(quoted, toOregon)).toMatch(/ship-to state \(OR\)/)
  })
})

describe('checkout addresses', () => {
  const address = {
    name: 'Wrenfield Middle School',
    line1: '48 Orchard Terrace',
    city: 'Bramley Falls',
    region: 'or',
    postalCode: '97999',
  }

  it('accepts a US address, reading the state in capitals', () => {
    const r = checkoutAddressesSchema.parse({
      shipTo: address,
      billTo: address,
      deliveryNote: ' Room 114, science department ',
    })
    expect(r.shipTo).toMatchObject({ region: 'OR', country: 'US', attention: null, line2: null })
    expect(r.deliveryNote).toBe('Room 114, science department')
  })

  it('names each bad field: an unknown state, a ZIP that is not one, another country', () => {
    const r = checkoutAddressesSchema.safeParse({
      shipTo: { ...address, region: 'XX', postalCode: '9799' },
      billTo: { ...address, country: 'CA' },
    })
    expect(Object.keys(fieldErrorsOf(r.error!)).sort()).toEqual([
      'billTo.country',
      'shipTo.postalCode',
      'shipTo.region',
    ])
  })
})
