// Sales tax by destination: the ship-to state's base rate from shared/data/us-sales-tax.ts, or
// none for a school whose exemption certificate is accepted. Pure, used by both sides.
import { US_STATES, type UsState } from '../data/us-sales-tax'
import type { TaxBasis, Totals } from './pricing'
import { formatCents, moneyWith } from './pricing'

export const US_STATE_CODES = US_STATES.map(s => s.code)

export function usState(code: string | null | undefined): UsState | undefined {
  const c = (code ?? '').trim().toUpperCase()
  return US_STATES.find(s => s.code === c)
}

/** The tax basis of a document shipped to `state`: its base rate, nothing when exempt, and
 *  nothing (with no state) when the destination is not known yet. */
export function taxBasisFor(state: string | null | undefined, exempt: boolean): TaxBasis {
  const s = usState(state)
  return {
    state: s?.code ?? null,
    rateBasisPoints: exempt || !s ? 0 : s.baseRateBasisPoints,
    exempt,
  }
}

/** A quote's money when it becomes an order: its lines and shipping as quoted, taxed for the
 *  order's destination and the school's exemption as they are when the order is placed. */
export function retax(
  quoted: Pick<Totals, 'subtotalCents' | 'shippingCents'>,
  basis: TaxBasis,
): Totals {
  return moneyWith(quoted.subtotalCents, quoted.shippingCents, basis)
}

/** "6.5%", "6.875%", "7.25%". */
export function formatRate(basisPoints: number): string {
  return `${Number((basisPoints / 100).toFixed(3))}%`
}

type TaxFacts = Pick<Totals, 'taxExempt' | 'taxRateBasisPoints' | 'taxState'>

/** The tax line's label on pages, documents and the payment provider's line items. */
export function taxLineLabel(t: TaxFacts, opts: { charged?: boolean } = {}): string {
  // A bill or receipt states the tax it charges; only quotes and carts call it an estimate.
  const estimate = opts.charged ? '' : ', estimated'
  if (t.taxExempt) return 'Sales tax: exemption applied'
  if (!t.taxState) {
    return t.taxRateBasisPoints
      ? `Sales tax (${formatRate(t.taxRateBasisPoints)}${estimate})`
      : 'Sales tax (by ship-to state)'
  }
  if (!t.taxRateBasisPoints) return `Sales tax (${t.taxState}: no state sales tax)`
  return `Sales tax (${t.taxState} ${formatRate(t.taxRateBasisPoints)}${estimate})`
}

/** What a document says about its tax, in full sentences. A bill or receipt (`charged`) says
 *  what the charged rate covers; a quote says it is an estimate. */
export function taxNotes(t: TaxFacts, opts: { charged?: boolean } = {}): string[] {
  if (t.taxExempt) {
    return [
      'Tax exemption applied: the school\'s tax-exemption certificate is accepted, so no sales '
      + 'tax is charged. '
      + 'The school\'s business office decides whether its exemption covers this purchase.',
    ]
  }
  const where = t.taxState ? ` (${usState(t.taxState)?.name ?? t.taxState})` : ''
  if (opts.charged) {
    return [
      `Sales tax is charged at the ship-to state's base rate${where}; local (county and city) `
      + `add-on rates `
      + 'are not included. The school\'s business office decides whether the school is exempt.',
    ]
  }
  return [
    `Sales tax is an estimate at the ship-to state's base rate${where}; `
    + 'local (county and city) add-on rates are not included. The school\'s business office '
    + 'decides '
    + 'whether the school is exempt; send us its exemption certificate and we charge no sales '
    + 'tax on later orders.',
  ]
}

/** What the timeline says when an order from a quote is taxed differently from the quote. */
export function quoteTaxNote(
  quoted: Pick<Totals, 'taxCents' | 'taxExempt' | 'taxState'>,
  now: Totals,
): string | null {
  if (now.taxExempt && !quoted.taxExempt) {
    return 'Tax exemption applied: the school\'s certificate was accepted after the quote, '
      + 'so no sales tax is charged.'
  }
  if (now.taxCents === quoted.taxCents && now.taxState === quoted.taxState) return null
  const then = quoted.taxState ?? 'earlier estimate'
  return (
    `Sales tax worked out for the ship-to state (${now.taxState ?? 'unknown'}) instead of the `
    + `quote's `
    + `(${then}): ${formatCents(now.taxCents)} instead of ${formatCents(quoted.taxCents)}.`
  )
}
