// The shape every order-step route shares: the path's order id (plain decimal, else 404),
// visible to the caller (else 404), then the step, then the fresh order view.
import type { H3Event } from 'h3'
import type { SessionUser } from '../../shared/utils/roles'
import { canSeeOrder } from '../../shared/utils/shop-rules'

export async function visibleOrderId(event: H3Event, user: SessionUser): Promise<number> {
  const raw = getRouterParam(event, 'id') ?? ''
  if (!/^[1-9]\d{0,15}$/.test(raw)) throw notFound('That order')
  const order = await loadOrder(useDb(), Number(raw))
  if (!order || !canSeeOrder(user, order)) throw notFound('That order')
  return order.id
}
