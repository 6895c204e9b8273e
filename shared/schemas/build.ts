// Request bodies and stored shapes of the build space (docs/build.md): join codes, joining,
// rigs, the checklist, the board's query, what a builder measured on the real rig.
import { z } from 'zod'
import { passwordRule } from './auth'
import { multiLine, plainId, singleLine, wholeNumber } from './text'
import {
  BOARD_SORTS,
  CHECKLIST_STEPS,
  JOIN_CODE_ALPHABET,
  JOIN_CODE_LENGTH,
  JOIN_CODE_MAX_HOURS,
  normaliseJoinCode,
  SHEET_VERDICTS,
  USERNAME_PATTERN,
} from '../utils/build'
import { calibrationSchema, rigSchema } from '../utils/planner/schema'
import type { CalibrationFit } from '../utils/planner/calibration'

const codePattern = new RegExp(`^[${JOIN_CODE_ALPHABET}]{${JOIN_CODE_LENGTH}}$`)

/** A join code as typed: any case, with or without the dash. */
export const joinCodeField = z
  .string({ error: 'Enter the join code your teacher gave you.' })
  .max(40, 'That is not a join code.')
  .transform(normaliseJoinCode)
  .refine(v => v.length > 0, 'Enter the join code your teacher gave you.')
  .refine(v => codePattern.test(v), 'That is not a join code: check it with your teacher.')

export const joinCheckSchema = z.object({ code: joinCodeField })

export const usernameField = z
  .string({ error: 'Choose a username.' })
  .trim()
  .toLowerCase()
  .min(3, 'Use at least 3 characters.')
  .max(30, 'Use at most 30 characters.')
  .regex(
    USERNAME_PATTERN,
    'Use lower-case letters, digits and dashes, starting with a letter.',
  )

/** A builder's display name: what the teacher sees on the board. First name and an initial is
 *  plenty. */
export const displayNameField = singleLine(
  z
    .string({ error: 'Enter the name your teacher will see.' })
    .trim()
    .min(1, 'Enter the name your teacher will see.')
    .max(40, 'Keep the name to 40 characters or fewer.'),
)

export const joinSchema = z.object({
  code: joinCodeField,
  name: displayNameField,
  username: usernameField,
  password: passwordRule,
})

export const createJoinCodeSchema = z.object({
  /** How long the code works, hours (default JOIN_CODE_DEFAULT_HOURS). */
  expiresInHours: wholeNumber('Give the hours as a whole number.')
    .pipe(
      z
        .number()
        .min(1, 'A code must last at least an hour.')
        .max(JOIN_CODE_MAX_HOURS, `A code can last at most ${JOIN_CODE_MAX_HOURS / 24} days.`),
    )
    .optional(),
  /** How many students may join with it; no limit when absent or null. */
  maxUses: wholeNumber('Give the number of uses as a whole number.')
    .pipe(z.number().min(1, 'Allow at least one use.').max(500, 'Allow at most 500 uses.'))
    .nullish(),
})

const label = (what: string, max: number) =>
  singleLine(
    z
      .string({ error: `The ${what} must be text.` })
      .trim()
      .max(max, `Keep the ${what} to ${max} characters or fewer.`),
  )

/** The teacher renames, regroups or retires a rig; "" clears a name or a group. */
export const updateRigSchema = z
  .object({
    name: label('name', 60).optional(),
    groupLabel: label('group', 40).optional(),
    retired: z.boolean({ error: 'Retired is true or false.' }).optional(),
  })
  .refine(v => Object.values(v).some(x => x !== undefined), 'Nothing to change.')

/** Tick or untick a checklist step, with an optional short note. */
export const updateStepSchema = z.object({
  done: z.boolean({ error: 'Done is true or false.' }),
  note: multiLine(
    z
      .string({ error: 'The note must be text.' })
      .trim()
      .max(300, 'Keep the note to 300 characters or fewer.'),
  )
    .nullish()
    .transform(v => (v === undefined ? undefined : v || null)),
})

/** The rig's measured dimensions, in the planner's SI units. */
export const rigDimensionsSchema = z.object({ rig: rigSchema })

/** Calibration readings to fit and keep on the rig (positions in metres). */
export const rigCalibrationSchema = calibrationSchema

/** What a rig keeps of its calibration: the readings and the fit they gave. */
export interface RigCalibration {
  adcBits: number
  pairs: { reading: number, position: number }[]
  fit: CalibrationFit
}

/** The teacher moves a builder to a rig, or off every rig (null). */
export const moveBuilderSchema = z.object({
  rigId: plainId('Choose a rig.').nullable(),
})

const RUN_ROWS = 5000
const finiteNumber = (what: string) =>
  z.number({ error: `${what} must be a number.` })
const series = (what: string) =>
  z
    .array(finiteNumber(what), { error: `${what} must be a list of numbers.` })
    .max(RUN_ROWS, `Keep a run to ${RUN_ROWS} rows or fewer.`)
const positive = (what: string) => finiteNumber(what).positive(`${what} must be above 0.`)

/** The logged run itself (shared/utils/planner/measured-run.ts), one entry per row. */
export const runLogSchema = z
  .object({
    unit: z.enum(['counts', 'mm'], { error: 'The log\'s unit is counts or mm.' }),
    /** s from the start of the log. */
    t: series('Time'),
    positionMm: series('Position'),
    setpointMm: series('Setpoint').nullable(),
    commandDeg: series('Servo command').nullable(),
  })
  .superRefine((log, ctx) => {
    for (const key of ['positionMm', 'setpointMm', 'commandDeg'] as const) {
      const column = log[key]
      if (column && column.length !== log.t.length) {
        ctx.addIssue({
          code: 'custom',
          path: [key],
          message: 'Every column of the log needs one value per row.',
        })
      }
    }
  })

/** The least-squares fit of the plant gain and servo lag to the logged run. */
export const runFitSchema = z.object({
  method: z.enum(['replay', 'closed-loop'], { error: 'The fit method is replay or closed-loop.' }),
  /** m/s² per rad of servo. */
  kb: positive('The fitted plant gain'),
  /** s */
  servoLag: positive('The fitted servo lag'),
  modelKb: positive('The planner\'s plant gain'),
  modelServoLag: positive('The planner\'s servo lag'),
  rmsBeforeMm: finiteNumber('The distance before the fit').min(0),
  rmsAfterMm: finiteNumber('The distance after the fit').min(0),
  levelOffsetDeg: finiteNumber('The level offset').nullable(),
  corrected: z.object({
    servoSecondsPer60: positive('The servo speed').optional(),
    leverArm: positive('The lever arm').optional(),
    gearRatio: positive('The gear ratio').optional(),
  }),
  /** The fitted and the predicted ball positions on the log's own times, mm. */
  fittedMm: series('The fitted positions'),
  predictedMm: series('The predicted positions'),
})

/** What a builder measured on the real rig with a sheet's gains (all optional). */
export const measuredRunSchema = z.object({
  settlingTime: z
    .number({ error: 'Settling time must be a number of seconds.' })
    .min(0, 'Settling time must be 0 s or more.')
    .max(600, 'Settling time must be at most 600 s.')
    .optional(),
  overshootPct: z
    .number({ error: 'Overshoot must be a percentage.' })
    .min(0, 'Overshoot must be 0 % or more.')
    .max(1000, 'Overshoot must be at most 1000 %.')
    .optional(),
  /** Position samples from the controller's serial log: seconds and metres. */
  samples: z
    .array(z.tuple([z.number(), z.number()]), { error: 'Samples are [time, position] pairs.' })
    .max(5000, 'Keep a run to 5000 samples or fewer.')
    .optional(),
  /** The uploaded CSV log, in mm and degrees (docs/planner-model.md, "Measured runs"). */
  log: runLogSchema.optional(),
  /** The planner's fit to that log. */
  fit: runFitSchema.optional(),
})
export type MeasuredRun = z.infer<typeof measuredRunSchema>
export type RunLog = z.infer<typeof runLogSchema>
export type StoredRunFit = z.infer<typeof runFitSchema>

export const sheetVerdictField = z.enum(SHEET_VERDICTS, {
  error: 'Choose how the real rig behaved.',
})

export const boardQuerySchema = z.object({
  sort: z.enum(BOARD_SORTS, { error: 'Unknown sort.' }).default('serial'),
  dir: z.enum(['asc', 'desc'], { error: 'Direction is asc or desc.' }).default('asc'),
  group: label('group', 40).optional(),
  step: z.enum([...CHECKLIST_STEPS, 'done'], { error: 'Unknown step.' }).optional(),
  stuck: z
    .enum(['true', 'false'], { error: 'Stuck is true or false.' })
    .transform(v => v === 'true')
    .optional(),
  retired: z
    .enum(['true', 'false'], { error: 'Retired is true or false.' })
    .transform(v => v === 'true')
    .optional(),
  q: label('search', 80).optional(),
})
export type BoardQueryInput = z.input<typeof boardQuerySchema>
