// Loading a tuning sheet the caller may see (404 otherwise, so ids do not leak).
import { and, eq } from 'drizzle-orm'
import { canSeeSheet } from '../../shared/utils/sheets'
import type { SheetInputs } from '../../shared/schemas/planner'
import type { SheetView } from '../../shared/types/sheets'
import type { SessionUser } from '../../shared/utils/roles'
import { tuningSheets } from '../database/schema'

export async function loadVisibleSheet(user: SessionUser, id: number) {
  const [row] = await useDb()
    .select()
    .from(tuningSheets)
    .where(and(eq(tuningSheets.id, id), eq(tuningSheets.archived, false)))
    .limit(1)
  if (!row || !canSeeSheet(user, row)) throw notFound('That tuning sheet')
  return { ...row, inputs: row.inputs as unknown as SheetInputs }
}

/** The sheet as its routes answer it. */
export function sheetView(sheet: Awaited<ReturnType<typeof loadVisibleSheet>>): SheetView {
  return { ...sheet, createdAt: sheet.createdAt.toISOString() }
}

export async function insertSheet(
  userId: number,
  sheet: {
    title: string
    note: string | null
    rigId?: number
    inputs: SheetInputs
    results: unknown
  },
) {
  const [row] = await useDb()
    .insert(tuningSheets)
    .values({
      authorId: userId,
      title: sheet.title,
      note: sheet.note,
      rigId: sheet.rigId ?? null,
      inputs: sheet.inputs as unknown as Record<string, unknown>,
      results: sheet.results as Record<string, unknown>,
    })
    .$returningId()
  return row!.id
}
