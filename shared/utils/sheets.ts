// A tuning sheet's results are always computed from its inputs (never taken from a client
// or a file), and its file form is Tiltwright's own documented JSON shape.
import { analyzeLoop, type LoopAnalysis } from './planner/analyze'
import { firmwareConstants } from './planner/firmware'
import { planGains } from './planner/plan'
import type { Gains } from './planner/schema'
import {
  SHEET_FILE_FORMAT,
  SHEET_FILE_VERSION,
  type SheetFile,
  type SheetInputs,
} from '../schemas/planner'
import type { Role } from './roles'

export interface SheetResults {
  suggested: Gains | null
  feasible: boolean
  analysis: LoopAnalysis
  firmware: { cSource: string, json: unknown } | null
  warnings: { code: string, severity: string, message: string }[]
}

export function sheetResults(inputs: SheetInputs): SheetResults {
  const plan = planGains(inputs.rig, inputs.targets)
  const analysis = analyzeLoop(inputs.rig, inputs.gains, {
    discretization: inputs.targets.discretization,
  })
  const fw = firmwareConstants(inputs.rig, inputs.gains, {
    discretization: inputs.targets.discretization,
  })
  return {
    suggested: plan.gains,
    feasible: plan.feasible,
    analysis,
    firmware: { cSource: fw.cSource, json: fw.json },
    warnings: [...plan.warnings, ...fw.warnings].map(w => ({
      code: w.code,
      severity: w.severity,
      message: w.message,
    })),
  }
}

export function sheetToFile(sheet: {
  title: string
  note: string | null
  createdAt: Date | string
  inputs: SheetInputs
  results: unknown
}): SheetFile {
  return {
    format: SHEET_FILE_FORMAT,
    version: SHEET_FILE_VERSION,
    title: sheet.title,
    note: sheet.note,
    savedAt: new Date(sheet.createdAt).toISOString(),
    inputs: sheet.inputs,
    results: sheet.results as Record<string, unknown>,
  }
}

export const canSaveSheets = (u: { role: Role } | null | undefined) =>
  u?.role === 'teacher' || u?.role === 'builder'

/** A sheet is its author's. One saved to a rig is also read by whoever may see the rig (the
 *  server checks that: server/utils/sheets.ts); only its author changes it. */
export const canSeeSheet = (
  u: { id: number, role: Role } | null | undefined,
  sheet: { authorId: number },
) => !!u && sheet.authorId === u.id

export const canEditSheet = canSeeSheet
