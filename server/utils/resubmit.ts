// Loads what the way back from a refused purchase order needs (shared/utils/resubmit.ts).
import { eq } from 'drizzle-orm'
import { quotes } from '../database/schema'
import { wayBackAfterRejection, type WayBack } from '../../shared/utils/resubmit'

export async function wayBackForOrder(
  db: DbOrTx,
  order: { id: number, quoteId: number | null },
  po: { status: string } | null | undefined,
): Promise<WayBack | null> {
  if (po?.status !== 'rejected') return null
  const [quote] = order.quoteId
    ? await db.select().from(quotes).where(eq(quotes.id, order.quoteId)).limit(1)
    : []
  return wayBackAfterRejection(order, po, quote)
}
