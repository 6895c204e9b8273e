// Loading a tuning sheet the caller may see (404 otherwise, so ids do not leak): the author's,
// and a sheet saved to a rig for whoever may see the rig (server/utils/build-spaces.ts).
import { and, eq } from 'drizzle-orm'
import { canSeeSheet } from '../../shared/utils/sheets'
import type { SheetInputs } from '../../shared/schemas/planner'
import type { MeasuredRun } from '../../shared/schemas/build'
import type { SheetVerdict } from '../../shared/utils/build'
import type { SheetView } from '../../shared/types/sheets'
import type { SessionUser } from '../../shared/utils/roles'
import { tuningSheets } from '../database/schema'

export async function loadVisibleSheet(user: SessionUser, id: number) {
  const [row] = await useDb()
    .select()
    .from(tuningSheets)
    .where(and(eq(tuningSheets.id, id), eq(tuningSheets.archived, false)))
    .limit(1)
  if (!row || !(canSeeSheet(user, row) || (await maySeeRigOf(user, row.rigId))))
    throw notFound('That tuning sheet')
  return { ...row, inputs: row.inputs as unknown as SheetInputs }
}

async function maySeeRigOf(user: SessionUser, rigId: number | null) {
  if (rigId === null) return false
  return loadRigFor(user, rigId, 'see').then(() => true, () => false)
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
    verdict?: SheetVerdict | null
    measured?: MeasuredRun | null
    inputs: SheetInputs
    results: unknown
  },
  db: DbOrTx = useDb(),
) {
  const [row] = await db
    .insert(tuningSheets)
    .values({
      authorId: userId,
      title: sheet.title,
      note: sheet.note,
      rigId: sheet.rigId ?? null,
      verdict: sheet.verdict ?? null,
      measured: sheet.measured ?? null,
      inputs: sheet.inputs as unknown as Record<string, unknown>,
      results: sheet.results as Record<string, unknown>,
    })
    .$returningId()
  return row!.id
}

/** The verdict a sheet's stored results give: stable, phase margin, overshoot, settling. */
export function verdictNumbers(results: Record<string, unknown>) {
  const res = results as {
    analysis?: {
      stable?: boolean
      phaseMarginDeg?: number | null
      step?: { overshootPct?: number | null, settlingTime?: number | null }
    }
  }
  return {
    stable: res.analysis?.stable ?? null,
    phaseMarginDeg: res.analysis?.phaseMarginDeg ?? null,
    overshootPct: res.analysis?.step?.overshootPct ?? null,
    settlingTime: res.analysis?.step?.settlingTime ?? null,
  }
}
