// Postal addresses: the school's, and the ship-to and bill-to of an order. Tiltwright ships to
// US schools, so the region is a US state (or DC) from shared/data/us-sales-tax.ts, whose base
// sales-tax rate the ship-to state decides.
import { z } from 'zod'
import { US_STATE_CODES } from '../utils/tax'
import { singleLine } from './text'

const text = (label: string, max: number) =>
  singleLine(
    z
      .string({ error: `Enter ${label}.` })
      .trim()
      .min(1, `Enter ${label}.`)
      .max(max, `Keep ${label} to ${max} characters or fewer.`),
  )
const optionalText = (label: string, max: number) =>
  singleLine(z.string().trim().max(max, `Keep ${label} to ${max} characters or fewer.`))
    .nullish()
    .transform(v => v || null)

/** A US state's two-letter code, as typed or chosen ("wa" reads WA). */
export const usStateField = z
  .string({ error: 'Choose the state.' })
  .trim()
  .toUpperCase()
  .refine(v => US_STATE_CODES.includes(v), 'Choose a US state (we ship to US schools only).')

export const usZipField = z
  .string({ error: 'Enter the ZIP code.' })
  .trim()
  .regex(/^\d{5}(-\d{4})?$/, 'Enter a US ZIP code, e.g. 98999 or 98999-1234.')

export const usCountryField = z
  .string()
  .trim()
  .toUpperCase()
  .default('US')
  .refine(v => v === 'US', 'We ship to US schools only: use US.')

export const postalAddressSchema = z.object({
  name: text('the name (school or department)', 160),
  attention: optionalText('the attention line', 120),
  line1: text('the street address', 160),
  line2: optionalText('the second address line', 160),
  city: text('the city', 100),
  region: usStateField,
  postalCode: usZipField,
  country: usCountryField,
})

export type PostalAddress = z.output<typeof postalAddressSchema>

/** What checkout asks besides the payment: where it ships, whom it bills, and a note for the
 *  delivery ("Room 114, science department"). */
export const checkoutAddressesSchema = z.object({
  shipTo: postalAddressSchema,
  billTo: postalAddressSchema,
  deliveryNote: optionalText('the delivery note', 200),
})

export type CheckoutAddresses = z.output<typeof checkoutAddressesSchema>

/** The school's own address as the teacher edits it on the account page. */
export const schoolAddressSchema = z.object({
  addressLine1: text('the street address', 160),
  addressLine2: optionalText('the second address line', 160),
  city: text('the city', 100),
  region: usStateField,
  postalCode: usZipField,
  country: usCountryField,
})

/** An address as the lines of a label or a document's address block. */
export function addressLines(a: PostalAddress): string[] {
  const attention = a.attention ? `Attn: ${a.attention}` : null
  return [
    a.name,
    attention,
    a.line1,
    a.line2,
    `${a.city}, ${a.region} ${a.postalCode}`,
    a.country === 'US' ? null : a.country,
  ].filter((x): x is string => !!x)
}
