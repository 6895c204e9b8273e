// Prices the cart on the server, always: tiers, shipping and tax from the catalog and the
// caller's school (tax-exempt when its certificate is accepted). Tax follows the ship-to state:
// the one checkout names (`shipToState`), else the school's; an anonymous cart with no state
// shows no tax yet. The client never sets a price.
import { z } from 'zod'
import { cartLineSchema } from '../../../shared/schemas/shop'
import { usStateField } from '../../../shared/schemas/address'
import type { PricedCart } from '../../../shared/types/shop'
import { canSeePrices } from '../../../shared/utils/roles'

const body = z.object({
  lines: z.array(cartLineSchema).max(40, 'At most 40 different items in one order.'),
  shipToState: usStateField.optional(),
})

export default defineEventHandler(async (event): Promise<PricedCart> => {
  const session = await getUserSession(event)
  const user = session.user ? await requireUser(event) : null
  if (user && !canSeePrices(user))
    throw forbidden('A builder\'s account shows no prices; your teacher orders the kits.')
  const input = await readBodyAs(event, body)
  const merged = [
    ...input.lines.reduce(
      (m, l) => m.set(l.productId, (m.get(l.productId) ?? 0) + l.quantity),
      new Map<number, number>(),
    ),
  ].map(([productId, quantity]) => ({ productId, quantity }))
  const school = user?.schoolId ? await loadSchool(useDb(), user.schoolId) : null
  const priced = await priceLines(useDb(), merged, schoolTaxBasis(school, input.shipToState))
  const { byId, ...rest } = priced
  return {
    ...rest,
    lines: priced.lines.map((l) => {
      const c = byId.get(l.productId)!
      const stock = { available: c.available, short: c.available < l.quantity }
      return { ...l, tierLabel: l.tierLabel!, slug: c.row.slug, image: c.row.image, ...stock }
    }),
    signedIn: !!user,
  }
})
