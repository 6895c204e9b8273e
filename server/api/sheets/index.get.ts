// "My sheets": the caller's own tuning sheets, newest first by default.
import { and, asc, count, desc, eq, like } from 'drizzle-orm'
import { sheetListQuery } from '../../../shared/schemas/sheet-list'
import { tuningSheets } from '../../database/schema'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'teacher', 'builder')
  const q = queryAs(event, sheetListQuery)
  const where = and(
    eq(tuningSheets.authorId, user.id),
    eq(tuningSheets.archived, false),
    q.q ? like(tuningSheets.title, `%${q.q}%`) : undefined,
  )
  const column = { createdAt: tuningSheets.createdAt, title: tuningSheets.title }[q.sort]
  const db = useDb()
  const [rows, [total]] = await Promise.all([
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
      .orderBy(q.dir === 'asc' ? asc(column) : desc(column), desc(tuningSheets.id))
      .limit(q.pageSize)
      .offset((q.page - 1) * q.pageSize),
    db.select({ n: count() }).from(tuningSheets).where(where),
  ])
  const data = rows.map(({ results, ...r }) => {
    const res = results as {
      analysis?: {
        stable?: boolean
        phaseMarginDeg?: number | null
        step?: { overshootPct?: number | null, settlingTime?: number | null }
      }
    }
    return {
      ...r,
      stable: res.analysis?.stable ?? null,
      phaseMarginDeg: res.analysis?.phaseMarginDeg ?? null,
      overshootPct: res.analysis?.step?.overshootPct ?? null,
      settlingTime: res.analysis?.step?.settlingTime ?? null,
    }
  })
  return { data, meta: { total: total?.n ?? 0, page: q.page, pageSize: q.pageSize } }
})
