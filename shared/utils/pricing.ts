// Classroom pricing, shipping and tax: pure integer-cent arithmetic used by the cart, quotes,
// orders and their PDFs. Nothing here touches floating-point money.

export interface PriceTier {
  minQuantity: number
  unitPriceCents: number
}

export interface PricedLineInput {
  productId: number
  name: string
  quantity: number
  tiers: PriceTier[]
  weightGrams: number
}

export interface PricedLine {
  productId: number
  name: string
  quantity: number
  tierMinQuantity: number
  unitPriceCents: number
  lineTotalCents: number
  /** The tier's range in the shop's words when the line was priced ("1–9", "10+"), kept with the
   *  line so documents never re-read today's tiers; null on lines stored before it was kept. */
  tierLabel: string | null
}

export interface Totals {
  subtotalCents: number
  shippingCents: number
  taxCents: number
  totalCents: number
  taxExempt: boolean
  /** The rate charged, in basis points (may end in a half: 687.5), and the ship-to state it
   *  came from; null state = no destination known yet (an anonymous cart) or an order placed
   *  before tax followed the destination. */
  taxRateBasisPoints: number
  taxState: string | null
}

/** How a document is taxed: the ship-to state's base rate, or nothing for an accepted exemption. */
export interface TaxBasis {
  state: string | null
  rateBasisPoints: number
  exempt: boolean
}

/** Tiltwright's shipping table: a handling charge plus a charge per started half kilogram,
 *  capped, and free freight for orders whose goods reach the threshold. */
export const SHIPPING = {
  handlingCents: 900,
  perHalfKiloCents: 140,
  capCents: 9500,
  freeFromSubtotalCents: 150_000,
}

/** The tier for a quantity: the one with the highest minimum that the quantity reaches. */
export function tierFor(tiers: readonly PriceTier[], quantity: number): PriceTier {
  if (!Number.isInteger(quantity) || quantity < 1)
    throw new RangeError('quantity must be a whole number of at least 1')
  let best: PriceTier | undefined
  for (const t of tiers)
    if (t.minQuantity <= quantity && (!best || t.minQuantity > best.minQuantity)) best = t
  if (!best)
    throw new RangeError('no price tier covers this quantity (every product needs a tier from 1)')
  return best
}

export function priceLine(line: PricedLineInput): PricedLine {
  const tier = tierFor(line.tiers, line.quantity)
  return {
    productId: line.productId,
    name: line.name,
    quantity: line.quantity,
    tierMinQuantity: tier.minQuantity,
    unitPriceCents: tier.unitPriceCents,
    lineTotalCents: tier.unitPriceCents * line.quantity,
    tierLabel: tierRangeLabel(line.tiers, tier),
  }
}

export function shippingCents(subtotalCents: number, totalWeightGrams: number): number {
  if (totalWeightGrams <= 0 || subtotalCents <= 0) return 0
  if (subtotalCents >= SHIPPING.freeFromSubtotalCents) return 0
  const halfKilos = Math.ceil(totalWeightGrams / 500)
  return Math.min(SHIPPING.capCents, SHIPPING.handlingCents + halfKilos * SHIPPING.perHalfKiloCents)
}

/** Tax on the goods, rounded half up to the cent; zero for an accepted exemption. The rate may
 *  end in a half basis point, so the sum is done in integer tenths of a basis point. */
export function taxCents(subtotalCents: number, rateBasisPoints: number, exempt: boolean): number {
  if (exempt || subtotalCents <= 0 || rateBasisPoints <= 0) return 0
  const tenths = Math.round(rateBasisPoints * 10)
  return Math.floor((subtotalCents * tenths + 50_000) / 100_000)
}

export function totalsFor(
  lines: readonly PricedLine[],
  totalWeightGrams: number,
  tax: TaxBasis,
): Totals {
  const subtotal = lines.reduce((s, l) => s + l.lineTotalCents, 0)
  return moneyWith(subtotal, shippingCents(subtotal, totalWeightGrams), tax)
}

/** Subtotal and shipping as they are, taxed on the given basis: the one way totals are made. */
export function moneyWith(subtotalCents: number, shipping: number, tax: TaxBasis): Totals {
  const rate = tax.exempt ? 0 : tax.rateBasisPoints
  const t = taxCents(subtotalCents, rate, tax.exempt)
  return {
    subtotalCents,
    shippingCents: shipping,
    taxCents: t,
    totalCents: subtotalCents + shipping + t,
    taxExempt: tax.exempt,
    taxRateBasisPoints: rate,
    taxState: tax.state,
  }
}

/** Prices a whole cart: each line at its tier, then shipping by weight and tax. */
export function priceCart(lines: readonly PricedLineInput[], tax: TaxBasis) {
  const priced = lines.map(priceLine)
  const weight = lines.reduce((w, l) => w + l.weightGrams * l.quantity, 0)
  return { lines: priced, ...totalsFor(priced, weight, tax) }
}

/** "$1,234.50" — cents to US dollars for display; the only place money becomes text. */
export function formatCents(cents: number): string {
  const sign = cents < 0 ? '-' : ''
  const abs = Math.abs(cents)
  const dollars = Math.floor(abs / 100)
    .toString()
    .replace(/\B(?=(\d{3})+(?!\d))/g, ',')
  return `${sign}$${dollars}.${String(abs % 100).padStart(2, '0')}`
}

/** A tier's quantity range as text, given all the product's tiers: "1–4", "5–11", "12+"; a
 *  product with one price reads "any quantity" (never "1+"). */
export function tierRangeLabel(tiers: readonly PriceTier[], tier: PriceTier): string {
  const next = [...tiers]
    .map(t => t.minQuantity)
    .filter(m => m > tier.minQuantity)
    .sort((a, b) => a - b)[0]
  if (next === undefined) return tier.minQuantity <= 1 ? 'any quantity' : `${tier.minQuantity}+`
  return next - 1 === tier.minQuantity ? `${tier.minQuantity}` : `${tier.minQuantity}–${next - 1}`
}

/** The one wording of "which tier this line is priced at", wherever a line shows it: the
 *  range as the kit page's tier table shows it ("1–4", "12+"). */
export function tierWording(label: string): string {
  return `price for ${label}`
}

/** The tier wording of a stored line: its own label when it kept one, else its minimum as a
 *  range with no upper end known ("12+"), or "any quantity" from 1. */
export function lineTierWording(line: {
  tierLabel?: string | null
  tierMinQuantity: number
}): string {
  return tierWording(
    line.tierLabel || (line.tierMinQuantity <= 1 ? 'any quantity' : `${line.tierMinQuantity}+`),
  )
}

/**
 * A tier list is usable when it starts at 1, has no repeated minimum, and every price is positive.
 */
export function tierProblems(tiers: readonly PriceTier[]): string | null {
  if (!tiers.length) return 'Add at least one price tier.'
  if (!tiers.some(t => t.minQuantity === 1)) return 'One tier must start at quantity 1.'
  if (new Set(tiers.map(t => t.minQuantity)).size !== tiers.length)
    return 'Two tiers start at the same quantity.'
  if (tiers.some(t => !Number.isInteger(t.unitPriceCents) || t.unitPriceCents <= 0))
    return 'Every tier needs a price above zero.'
  return null
}

/** Tier prices never rise with quantity: the index (in the given order) of each tier whose unit
 *  price is above that of a tier with a smaller minimum, with the words shown beside it. */
export function risingTierProblems(
  tiers: readonly PriceTier[],
): { index: number, message: string }[] {
  const order = tiers
    .map((t, index) => ({ t, index }))
    .sort((a, b) => a.t.minQuantity - b.t.minQuantity)
  const found: { index: number, message: string }[] = []
  let cheapest: PriceTier | undefined
  for (const { t, index } of order) {
    if (cheapest && t.unitPriceCents > cheapest.unitPriceCents) {
      const limit = formatCents(cheapest.unitPriceCents)
      const message
        = `From ${t.minQuantity} the price must not be above ${limit} `
          + `(the price from ${cheapest.minQuantity}): larger orders never pay more each.`
      found.push({ index, message })
    }
    if (!cheapest || t.unitPriceCents <= cheapest.unitPriceCents) cheapest = t
  }
  return found
}

/** The largest order taken online: $5,000,000.00. Amounts are stored as 32-bit cents, and a
 *  larger order is a conversation with us, not a cart. */
export const MAX_ORDER_TOTAL_CENTS = 500_000_000

/** What is wrong with an order's size, or null; the same words for the cart, quote and checkout. */
export function orderSizeProblem(totals: Pick<Totals, 'totalCents'>): string | null {
  return totals.totalCents > MAX_ORDER_TOTAL_CENTS
    ? `An order online can be at most ${formatCents(MAX_ORDER_TOTAL_CENTS)}. Split it, or `
    + `write to us for a quote.`
    : null
}

export const QUOTE_VALID_DAYS = 30
export const INVOICE_NET_DAYS = 30

export function addDays(date: Date, days: number): Date {
  return new Date(date.getTime() + days * 24 * 3600_000)
}

/** "24.5" or "$1,240.00" typed by a person → whole cents; null when it is not a price. */
export function parseDollars(text: string): number | null {
  const m = text
    .trim()
    .replace(/^\$/, '')
    .replace(/,/g, '')
    .match(/^(\d{1,7})(?:\.(\d{1,2}))?$/)
  if (!m) return null
  return Number(m[1]) * 100 + Number((m[2] ?? '').padEnd(2, '0'))
}
