// Quote queries shared by the quote routes and the order documents.
import { asc, eq } from 'drizzle-orm'
import type { H3Event } from 'h3'
import { quoteLines, quotes, schools, users } from '../database/schema'
import { idParams } from '../../shared/schemas/ids'
import type { QuoteView } from '../../shared/types/shop'
import { canSeeQuote, isQuoteValid } from '../../shared/utils/shop-rules'
import type { SessionUser } from '../../shared/utils/roles'
import { quotePdf } from '../documents/shop'

export type QuoteRow = typeof quotes.$inferSelect

export async function requireVisibleQuote(event: H3Event, user: SessionUser): Promise<QuoteRow> {
  const { id } = paramsAs(event, idParams, 'That quote')
  const [q] = await useDb().select().from(quotes).where(eq(quotes.id, id)).limit(1)
  if (!q || !canSeeQuote(user, q)) throw notFound('That quote')
  return q
}

export async function quoteDetails(db: DbOrTx, q: QuoteRow) {
  const [lines, [row]] = await Promise.all([
    db.select().from(quoteLines).where(eq(quoteLines.quoteId, q.id)).orderBy(asc(quoteLines.id)),
    db
      .select({ school: schools, by: users.name })
      .from(schools)
      .innerJoin(users, eq(users.id, q.createdById))
      .where(eq(schools.id, q.schoolId))
      .limit(1),
  ])
  return { lines, school: row!.school, preparedFor: row!.by }
}

export async function renderQuotePdf(db: DbOrTx, q: QuoteRow) {
  const d = await quoteDetails(db, q)
  return quotePdf({ ...q, number: q.number! }, d.lines, d.school, d.preparedFor)
}

export function quoteView(
  q: QuoteRow,
  lines: (typeof quoteLines.$inferSelect)[],
  school: { name: string, taxExemption: string },
): QuoteView {
  return {
    id: q.id,
    number: q.number!,
    createdAt: q.createdAt.toISOString(),
    validUntil: q.validUntil.toISOString(),
    valid: isQuoteValid(q),
    orderId: q.orderId,
    school: { name: school.name },
    exemptNow: school.taxExemption === 'accepted' && !q.taxExempt,
    subtotalCents: q.subtotalCents,
    shippingCents: q.shippingCents,
    taxCents: q.taxCents,
    totalCents: q.totalCents,
    taxExempt: q.taxExempt,
    taxRateBasisPoints: q.taxRateBasisPoints,
    taxState: q.taxState,
    lines: lines.map(pricedLineOf),
  }
}

export function pdfReply(event: H3Event, filename: string, pdf: Buffer) {
  setResponseHeaders(event, {
    'content-type': 'application/pdf',
    'content-disposition': `inline; filename="${filename}"`,
    'cache-control': 'private, no-store',
    'x-content-type-options': 'nosniff',
  })
  return pdf
}
