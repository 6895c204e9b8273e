// A teacher saves the cart as a formal quote: numbered, dated, valid QUOTE_VALID_DAYS days,
// priced now and e-mailed with its PDF. Stock is not reserved by a quote.
import { eq } from 'drizzle-orm'
import { cartSchema } from '../../../shared/schemas/shop'
import { addDays, QUOTE_VALID_DAYS } from '../../../shared/utils/pricing'
import { quoteLines, quotes } from '../../database/schema'
import { quoteIssuedMail } from '../../emails/shop'
import { formatDay } from '../../../shared/utils/dates'
import type { QuoteCreatedReply } from '../../../shared/types/shop'

export default defineEventHandler(async (event): Promise<QuoteCreatedReply> => {
  const user = await requireRole(event, 'teacher')
  const input = await readBodyAs(event, cartSchema)
  if (!user.schoolId) throw forbidden('Your account has no school to quote for.')
  const reply = await transactionWithRetry(async (tx) => {
    const src = await resolveCheckout(tx, user, { lines: input.lines })
    const now = new Date()
    const validUntil = addDays(now, QUOTE_VALID_DAYS)
    const [row] = await tx
      .insert(quotes)
      .values({ schoolId: user.schoolId!, createdById: user.id, ...src.totals, validUntil })
      .$returningId()
    const number = quoteNumberFor(row!.id, now)
    await tx.update(quotes).set({ number }).where(eq(quotes.id, row!.id))
    await tx.insert(quoteLines).values(src.lines.map(l => ({ quoteId: row!.id, ...l })))
    const [q] = await tx.select().from(quotes).where(eq(quotes.id, row!.id)).limit(1)
    const mail = quoteIssuedMail(
      user.name,
      { number, totalCents: q!.totalCents, validUntil: formatDay(validUntil), lines: src.lines },
      appUrl(`/quotes/${q!.id}`),
    )
    const attach = [{ document: 'quote' as const, quoteId: q!.id }]
    await enqueueMail(tx, 'quote-issued', mailAddressOf(user), mail, attach)
    await audit(tx, {
      actorId: user.id,
      action: 'quote.issued',
      subjectType: 'quote',
      subjectId: q!.id,
    })
    return { id: q!.id, number, totalCents: q!.totalCents, validUntil: validUntil.toISOString() }
  })
  setResponseStatus(event, 201)
  return reply
})
