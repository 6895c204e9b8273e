// The shape every order-step route shares: the path's order id (plain decimal, else 404),
// visible to the caller (else 404), then the step, then the fresh order view.
import type { H3Event } from 'h3'
import type { SessionUser } from '../../shared/utils/roles'

export async function visibleOrderId(event: H3Event, user: SessionUser): Promise<number> {
  return (await requireVisibleOrder(event, user)).id
}
