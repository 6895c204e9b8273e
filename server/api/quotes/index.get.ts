// The caller's school's quotes, newest first.
import { desc, eq } from 'drizzle-orm'
import { quotes } from '../../database/schema'
import { isQuoteValid } from '../../../shared/utils/shop-rules'
import type { QuoteListReply } from '../../../shared/types/shop'

export default defineEventHandler(async (event): Promise<QuoteListReply> => {
  const user = await requireRole(event, 'teacher')
  if (!user.schoolId) return { data: [] }
  const rows = await useDb()
    .select()
    .from(quotes)
    .where(eq(quotes.schoolId, user.schoolId))
    .orderBy(desc(quotes.createdAt), desc(quotes.id))
    .limit(200)
  return {
    data: rows.map(q => ({
      id: q.id,
      number: q.number!,
      createdAt: q.createdAt.toISOString(),
      validUntil: q.validUntil.toISOString(),
      totalCents: q.totalCents,
      orderId: q.orderId,
      valid: isQuoteValid(q),
    })),
  }
})
