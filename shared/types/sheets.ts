// Replies of the tuning-sheet routes (/api/sheets/**).
import type { ListReply } from '../schemas/list'
import type { SheetInputs } from '../schemas/planner'

/** A sheet's row in "My sheets", with the verdict its stored results give. */
export interface SheetSummary {
  id: number
  title: string
  note: string | null
  rigId: number | null
  createdAt: string
  stable: boolean | null
  phaseMarginDeg: number | null
  overshootPct: number | null
  settlingTime: number | null
}
export type SheetListReply = ListReply<SheetSummary>

/** One sheet as its author (or a teacher of the school) opens it. */
export interface SheetView {
  id: number
  authorId: number
  rigId: number | null
  title: string
  note: string | null
  inputs: SheetInputs
  results: Record<string, unknown>
  archived: boolean
  createdAt: string
}
