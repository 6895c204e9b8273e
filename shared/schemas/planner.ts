// Request bodies of the planner routes and the tuning sheet, built on the model's own
// rig / targets / gains schemas (shared/utils/planner/schema.ts).
import { z } from 'zod'
import { gainsSchema, rigSchema, targetsSchema } from '../utils/planner/schema'
import { measuredRunSchema, sheetVerdictField } from './build'
import { multiLine, plainId, singleLine } from './text'

export const planRequestSchema = z.object({ rig: rigSchema, targets: targetsSchema })
export const analyzeRequestSchema = z.object({ rig: rigSchema, gains: gainsSchema })

/**
 * What a tuning sheet stores as its inputs: the rig, the targets, and the gains actually loaded.
 */
export const sheetInputsSchema = z.object({
  rig: rigSchema,
  targets: targetsSchema,
  /** The gains on the rig: the suggestion, or the builder's own after hand-tuning. */
  gains: gainsSchema,
})

const title = singleLine(
  z
    .string({ error: 'Give the sheet a title.' })
    .trim()
    .min(1, 'Give the sheet a title.')
    .max(120, 'Keep the title to 120 characters or fewer.'),
)
const noteText = multiLine(
  z
    .string({ error: 'The note must be text.' })
    .trim()
    .max(4000, 'Keep the note to 4000 characters or fewer.'),
)
const note = noteText.nullish().transform(v => v || null)

export const createSheetSchema = z.object({
  title,
  note,
  rigId: plainId('Choose a rig.').optional(),
  inputs: sheetInputsSchema,
  /** How the real rig behaved, and what was measured on it (docs/build.md). */
  verdict: sheetVerdictField.nullish(),
  measured: measuredRunSchema.nullish(),
})

/** A rename sends only the title: a note left out stays as it is; null or "" clears it. */
export const updateSheetSchema = z.object({
  title: title.optional(),
  note: noteText.nullish().transform(v => (v === undefined ? undefined : v || null)),
  verdict: sheetVerdictField.nullish(),
  measured: measuredRunSchema.nullish(),
})

/** Tiltwright's tuning-sheet file (see README, "Tuning-sheet files"). */
export const SHEET_FILE_FORMAT = 'tiltwright-tuning-sheet'
export const SHEET_FILE_VERSION = 1

export const sheetFileSchema = z.object({
  format: z.literal(SHEET_FILE_FORMAT, {
    error: `This is not a Tiltwright tuning sheet (format must be "${SHEET_FILE_FORMAT}").`,
  }),
  version: z.literal(SHEET_FILE_VERSION, {
    error: `This Tiltwright reads tuning-sheet files of version ${SHEET_FILE_VERSION}.`,
  }),
  title,
  note: multiLine(z.string().max(4000, 'Keep the note to 4000 characters or fewer.'))
    .nullable()
    .optional(),
  savedAt: z.string().optional(),
  inputs: sheetInputsSchema,
  results: z.record(z.string(), z.unknown()).optional(),
})

export type SheetInputs = z.infer<typeof sheetInputsSchema>
export type SheetFile = z.infer<typeof sheetFileSchema>
