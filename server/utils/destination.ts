// Where an order ships and whom it bills, and the sales tax that follows from it: the school's
// address prefills both, checkout may change them, and the order keeps what it was placed with.
import { eq } from 'drizzle-orm'
import { schools } from '../database/schema'
import type { CheckoutAddresses, PostalAddress } from '../../shared/schemas/address'
import type { TaxBasis } from '../../shared/utils/pricing'
import { taxBasisFor } from '../../shared/utils/tax'

type SchoolRow = typeof schools.$inferSelect

/** The school's own address as a postal address, for prefilling and for older orders. */
export function schoolPostalAddress(s: SchoolRow): PostalAddress {
  return {
    name: s.name,
    attention: null,
    line1: s.addressLine1,
    line2: s.addressLine2 ?? null,
    city: s.city,
    region: s.region,
    postalCode: s.postalCode,
    country: s.country,
  }
}

export async function loadSchool(db: DbOrTx, schoolId: number): Promise<SchoolRow> {
  const [s] = await db.select().from(schools).where(eq(schools.id, schoolId)).limit(1)
  if (!s) throw notFound('Your school')
  return s
}

/** The addresses an order is placed with: those given at checkout, else the school's. */
export function checkoutAddressesFor(
  school: SchoolRow,
  given?: CheckoutAddresses | null,
): CheckoutAddresses {
  const own = schoolPostalAddress(school)
  return given ?? { shipTo: own, billTo: own, deliveryNote: null }
}

/** The tax basis of a cart, quote or order of this school shipped to `shipToState` (default:
 *  the school's own state); exempt once the school's certificate is accepted. */
export function schoolTaxBasis(school: SchoolRow | null, shipToState?: string | null): TaxBasis {
  return taxBasisFor(shipToState ?? school?.region ?? null, school?.taxExemption === 'accepted')
}

/** The addresses an order shows: its own, or (placed before checkout asked) the school's. */
export function addressesOfOrder(
  order: {
    shipTo: PostalAddress | null
    billTo: PostalAddress | null
    deliveryNote: string | null
  },
  school: SchoolRow,
): CheckoutAddresses {
  const own = schoolPostalAddress(school)
  return {
    shipTo: order.shipTo ?? own,
    billTo: order.billTo ?? own,
    deliveryNote: order.deliveryNote,
  }
}
