// "My sheets": the caller's own tuning sheets, newest first by default.
import { and, asc, count, desc, eq, like } from 'drizzle-orm'
import { sheetListQuery } from '../../../shared/schemas/sheet-list'
import { tuningSheets } from '../../database/schema'
import type { SheetListReply, SheetSummary } from '../../../shared/types/sheets'
import { containsPattern } from '../../../shared/utils/paging'

export default defineEventHandler(async (event): Promise<SheetListReply> => {
  const user = await requireRole(event, 'teacher', 'builder')
  const q = queryAs(event, sheetListQuery)
  const where = and(
    eq(tuningSheets.authorId, user.id),
    eq(tuningSheets.archived, false),
    q.q ? like(tuningSheets.title, containsPattern(q.q)) : undefined,
  )
  const column = { createdAt: tuningSheets.createdAt, title: tuningSheets.title }[q.sort]
  const db = useDb()
  return pagedList(
    q,
    db.select({ n: count() }).from(tuningSheets).where(where),
    db
      .select({
        id: tuningSheets.id,
        title: tuningSheets.title,
        note: tuningSheets.note,
        rigId: tuningSheets.rigId,
        createdAt: tuningSheets.createdAt,
        results: tuningSheets.results,
      })
      .from(tuningSheets)
      .where(where)
      .orderBy(q.dir === 'asc' ? asc(column) : desc(column), desc(tuningSheets.id)),
    sheetSummaryOf,
  )
})

/** A sheet's row in "My sheets": the verdict its stored results give. */
function sheetSummaryOf({ results, ...r }: {
  id: number
  title: string
  note: string | null
  rigId: number | null
  createdAt: Date
  results: Record<string, unknown>
}): SheetSummary {
  return { ...r, createdAt: r.createdAt.toISOString(), ...verdictNumbers(results) }
}
