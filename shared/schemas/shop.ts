// Zod schemas of the shop, shared by its forms and its routes.
import { z } from 'zod'
import { risingTierProblems, tierProblems } from '../utils/pricing'
import { emailAddress } from './email'
import { listQuerySchema } from './list'
import { CARRIERS, CARRIER_IDS } from '../utils/carriers'
import { ORDER_STATUSES, PAYMENT_METHODS } from '../utils/order-flow'
import { PRODUCT_KINDS } from '../utils/states'
import { multiLine, plainId, singleLine, wholeNumber } from './text'
import { MAX_LINE_QUANTITY } from '../utils/cart-lines'

const id = (what: string) => plainId(`Choose ${what}.`)

// The cart's quantity rule lives without zod (the cart store is on every page); re-exported here
// for the forms and routes that validate with these schemas.
export { MAX_LINE_QUANTITY, lineQuantityProblem } from '../utils/cart-lines'

export const cartLineSchema = z.object({
  productId: id('a product'),
  quantity: wholeNumber('Enter the quantity as a whole number.', 'Use a whole number.').pipe(
    z
      .number()
      .min(1, 'At least 1.')
      .max(MAX_LINE_QUANTITY, `At most ${MAX_LINE_QUANTITY} in one order.`),
  ),
})

export const linesSchema = z
  .array(cartLineSchema, { error: 'The cart is missing.' })
  .min(1, 'The cart is empty.')
  .max(40, 'At most 40 different items in one order.')
  .refine(
    lines => new Set(lines.map(l => l.productId)).size === lines.length,
    'Each product may appear once; change its quantity instead.',
  )

export const cartSchema = z.object({ lines: linesSchema })

/** Checkout from the cart's lines or from a saved quote (at its quoted prices). */
export const checkoutSourceSchema = z.union(
  [
    z.object({ quoteId: id('a quote'), lines: z.undefined().optional() }),
    z.object({ lines: linesSchema, quoteId: z.undefined().optional() }),
  ],
  { error: 'Send the cart lines or a quote.' },
)

/** The text fields of the purchase-order form (the files are checked from their bytes). */
export const purchaseOrderFieldsSchema = z.object({
  poNumber: z
    .string({ error: 'Enter the purchase-order number.' })
    .trim()
    .min(1, 'Enter the purchase-order number.')
    .max(60, 'Keep the PO number to 60 characters or fewer.')
    .regex(/^[A-Za-z0-9][A-Za-z0-9 ./_#-]*$/, 'Use letters, digits, spaces and . / _ # - only.'),
  apEmail: emailAddress('the accounts-payable e-mail address'),
})

export const UPLOAD_LIMIT_BYTES = 5 * 1024 * 1024
export const UPLOAD_TYPES = ['application/pdf', 'image/png', 'image/jpeg', 'image/webp'] as const

export const rejectSchema = z.object({
  reason: multiLine(
    z
      .string({ error: 'Say why the purchase order is rejected.' })
      .trim()
      .min(5, 'Say why in a few words (the teacher reads this).')
      .max(500, 'Keep the reason to 500 characters or fewer.'),
  ),
})

export const approveSchema = z.object({
  acceptTaxCertificate: z.boolean().optional().default(false),
})

const PICK_CARRIER = `Pick the carrier: ${CARRIERS.map(c => c.name).join(', ')}.`

/** A form starts with no carrier picked (''), so the input is any string; the output is an id. */
export const shipmentSchema = z.object({
  carrier: z.string({ error: PICK_CARRIER }).pipe(z.enum(CARRIER_IDS, { error: PICK_CARRIER })),
  tracking: z
    .string({ error: 'Enter the tracking number.' })
    .trim()
    .min(4, 'Enter the tracking number.')
    .max(80, 'Keep the tracking number to 80 characters or fewer.')
    .regex(/^[A-Za-z0-9 -]+$/, 'Use letters, digits, spaces and dashes only.'),
})

export const recordPaymentSchema = z.object({
  reference: singleLine(
    z
      .string({ error: 'Enter the payment reference.' })
      .trim()
      .min(2, 'Enter the payment reference (cheque or transfer number).')
      .max(120, 'Keep the reference to 120 characters or fewer.'),
  ),
})

export const adminOrderListQuery = listQuerySchema(
  ['number', 'createdAt', 'status', 'totalCents', 'school'] as const,
  'createdAt',
).extend({
  status: z.enum(ORDER_STATUSES, { error: 'Filter by a known status.' }).optional(),
  method: z
    .enum(PAYMENT_METHODS, { error: 'Filter by card or purchase-order.' })
    .optional(),
})

export const SLUG_PATTERN = /^[a-z0-9]+(-[a-z0-9]+)*$/

const slug = z
  .string({ error: 'Enter a slug.' })
  .trim()
  .toLowerCase()
  .min(2, 'Enter a slug.')
  .max(80, 'Keep the slug to 80 characters or fewer.')
  .regex(
    SLUG_PATTERN,
    'Use lowercase letters, digits and single dashes, e.g. long-beam-kit.',
  )

export const tierSchema = z.object({
  minQuantity: wholeNumber('Enter the quantity as a whole number.').pipe(
    z.number().min(1, 'At least 1.').max(10_000, 'At most 10000.'),
  ),
  unitPriceCents: wholeNumber('Enter the price in whole cents.').pipe(
    z.number().min(1, 'Above zero.').max(10_000_000, 'That price is too high.'),
  ),
})

export const tiersSchema = z.array(tierSchema).superRefine((tiers, ctx) => {
  const problem = tierProblems(tiers)
  if (problem) ctx.addIssue({ code: 'custom', message: problem })
  for (const r of risingTierProblems(tiers)) {
    ctx.addIssue({ code: 'custom', path: [r.index, 'unitPriceCents'], message: r.message })
  }
})

const specSchema = z.object({
  label: singleLine(z.string().trim().min(1, 'Name the spec.').max(60, 'Keep it short.')),
  value: singleLine(z.string().trim().min(1, 'Give the value.').max(160, 'Keep it short.')),
})

export const productSchema = z.object({
  slug,
  name: singleLine(
    z
      .string({ error: 'Enter the name.' })
      .trim()
      .min(2, 'Enter the name.')
      .max(120, 'Keep the name to 120 characters or fewer.'),
  ),
  kind: z.enum(PRODUCT_KINDS, { error: 'A product is a kit or a part.' }),
  summary: singleLine(
    z
      .string({ error: 'Enter a one-line summary.' })
      .trim()
      .min(5, 'Enter a one-line summary.')
      .max(300, 'Keep the summary to 300 characters or fewer.'),
  ),
  description: multiLine(
    z.string().trim().max(4000, 'Keep the description to 4000 characters or fewer.'),
  ).default(''),
  specs: z.array(specSchema).max(20, 'At most 20 specs.').default([]),
  image: z
    .string()
    .trim()
    .regex(
      /^\/catalog\/[a-z0-9-]+\.svg$/,
      'Use a drawing from /catalog/, e.g. /catalog/rig-kit.svg.',
    )
    .default('/catalog/part.svg'),
  weightGrams: wholeNumber('Enter the packed weight in whole grams.').pipe(
    z.number().min(1, 'At least 1 g.').max(50_000, 'At most 50 kg.'),
  ),
  active: z.boolean().default(true),
  tiers: tiersSchema,
})

export const productPatchSchema = productSchema.partial()

export const batchSchema = z.object({
  productId: id('a product'),
  code: z
    .string({ error: 'Enter the batch code.' })
    .trim()
    .min(1, 'Enter the batch code.')
    .max(40, 'Keep the code to 40 characters or fewer.')
    .regex(/^[A-Za-z0-9-]+$/, 'Use letters, digits and dashes only.'),
  quantity: wholeNumber('Enter how many were built, as a whole number.').pipe(
    z.number().min(1, 'At least 1.').max(100_000, 'At most 100000.'),
  ),
  builtOn: z.coerce.date({ error: 'Enter the date it was built.' }).optional(),
})

export const batchPatchSchema = z.object({
  quantity: batchSchema.shape.quantity,
})

export type CartLine = z.output<typeof cartLineSchema>
export type ProductInput = z.input<typeof productSchema>

/** An admin cancels with a reason the teacher and accounts payable read. */
export const adminCancelSchema = z.object({
  reason: multiLine(
    z
      .string({ error: 'Say why the order is cancelled.' })
      .trim()
      .min(5, 'Say why in a few words (the teacher and accounts payable read this).')
      .max(500, 'Keep the reason to 500 characters or fewer.'),
  ),
})

export const teacherCancelSchema = z.object({
  reason: multiLine(
    z.string().trim().max(500, 'Keep the reason to 500 characters or fewer.'),
  ).optional(),
})
