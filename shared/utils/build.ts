// The build space's words and rules, shared by the routes, the pages and the seed: the checklist,
// its cautions, when a rig counts as stuck, the verdicts a builder gives a sheet, join codes and
// the board's sort and filters (docs/build.md).

/** The build checklist, in the order a rig is built. */
export const CHECKLIST_STEPS = [
  'frame',
  'linkage',
  'wiring',
  'rail-sensor',
  'calibration',
  'tuning',
  'nudge-test',
] as const
export type ChecklistStep = (typeof CHECKLIST_STEPS)[number]

export const STEP_LABELS: Record<ChecklistStep, string> = {
  'frame': 'Frame',
  'linkage': 'Linkage',
  'wiring': 'Wiring',
  'rail-sensor': 'Rail sensor',
  'calibration': 'Calibration',
  'tuning': 'Tuning',
  'nudge-test': 'Nudge test',
}

/** What "done" means for each step, in a builder's words. */
export const STEP_DONE_WHEN: Record<ChecklistStep, string> = {
  'frame': 'The base is square, the pivot turns freely and the beam rests level.',
  'linkage': 'The servo horn, pushrod and lever arm move the beam through its whole range '
    + 'without binding.',
  'wiring': 'The servo, the rails and the supply are wired to the controller as the kit\'s '
    + 'diagram shows, and every joint is checked.',
  'rail-sensor': 'With the ball on the rails, the controller\'s reading changes smoothly from '
    + 'one end to the other.',
  'calibration': 'Readings at known positions are fitted and saved to the rig.',
  'tuning': 'Gains from the Gain Planner are loaded and the ball settles at the setpoint.',
  'nudge-test': 'A gentle nudge is caught: the ball returns to the setpoint without '
    + 'running off.',
}

/**
 * Cautions shown at the steps where hands, power and heat meet the rig. They say what can hurt
 * and always defer to the school's own safety rules.
 */
export const STEP_CAUTIONS: Partial<Record<ChecklistStep, string>> = {
  'linkage': 'Pinch points: keep fingers clear of the lever arm and pushrod whenever the servo '
    + 'has power, and unplug before you adjust the linkage.',
  'wiring': 'Unplug the supply while you wire. Use a supply sized for the servo\'s stall '
    + 'current, and solder only where your school\'s rules allow it, with eye protection and '
    + 'ventilation.',
  'rail-sensor': 'First power-up: the servo can jump to its end stop. Keep hands clear of the '
    + 'linkage and the ball on the beam when you switch on.',
  'tuning': 'The beam can swing hard with new gains. Keep hands clear of the linkage while the '
    + 'loop runs; unplug before you adjust anything.',
  'nudge-test': 'Nudge the ball with a pencil or ruler, not your fingers near the lever arm.',
}

export const SCHOOL_RULES_NOTE
  = 'Your school\'s own safety rules come first; ask your teacher when unsure.'

/** A lesson, in minutes: a rig whose current step has not moved for longer is flagged. */
export const LESSON_MINUTES = 50

/** How the real rig behaved with a sheet's gains, in the builder's judgement. */
export const SHEET_VERDICTS = [
  'balances',
  'slow',
  'oscillates',
  'drifts',
  'runs-away',
] as const
export type SheetVerdict = (typeof SHEET_VERDICTS)[number]

export const VERDICT_LABELS: Record<SheetVerdict, string> = {
  'balances': 'Balances',
  'slow': 'Settles, but slowly',
  'oscillates': 'Keeps swinging',
  'drifts': 'Settles off the setpoint',
  'runs-away': 'Runs away',
}

/** Join codes: eight characters from an alphabet without look-alikes (no 0/O, 1/I/L, 5/S). */
export const JOIN_CODE_ALPHABET = '2346789ABCDEFGHJKMNPQRTUVWXYZ'
export const JOIN_CODE_LENGTH = 8
/** How long a new join code lasts unless the teacher says otherwise, and at most. */
export const JOIN_CODE_DEFAULT_HOURS = 24 * 7
export const JOIN_CODE_MAX_HOURS = 24 * 90

/** "K7PQ-X2MD": the way a code is shown and printed; typing it either way works. */
export const formatJoinCode = (code: string) => `${code.slice(0, 4)}-${code.slice(4)}`

/** The code as stored: upper case, without spaces or dashes. */
export const normaliseJoinCode = (typed: string) => typed.toUpperCase().replace(/[\s-]/g, '')

/** A rig's serial number: its order's number and the unit, two digits ("TW-10007-03"). */
export const rigSerial = (orderNumber: string, unit: number) =>
  `${orderNumber}-${String(unit).padStart(2, '0')}`

/** Builder usernames: lower-case letters, digits and dashes. */
export const USERNAME_PATTERN = /^[a-z][a-z0-9-]{2,29}$/

const USERNAME_WORDS = [
  ['swift', 'steady', 'bright', 'calm', 'brisk', 'keen', 'quiet', 'bold', 'level', 'true'],
  ['pivot', 'beam', 'lever', 'rail', 'servo', 'marble', 'gear', 'spring', 'axle', 'hinge'],
] as const

/**
 * A username that says nothing about the student ("steady-pivot-42"), from three random
 * numbers in [0, 1).
 */
export function suggestUsername(r: [number, number, number]): string {
  const pick = (words: readonly string[], x: number) => words[Math.floor(x * words.length)]!
  const n = 10 + Math.floor(r[2] * 90)
  return `${pick(USERNAME_WORDS[0], r[0])}-${pick(USERNAME_WORDS[1], r[1])}-${n}`
}

// ── Progress and the board ──────────────────────────────────────────────────────────────────

export interface StepState {
  step: ChecklistStep
  doneAt: Date | string | null
}

export interface RigProgress {
  done: number
  total: number
  /** The first step not done; null when every step is. */
  current: ChecklistStep | null
}

export function rigProgress(steps: readonly StepState[]): RigProgress {
  const done = new Set(steps.filter(s => s.doneAt).map(s => s.step))
  return {
    done: done.size,
    total: CHECKLIST_STEPS.length,
    current: CHECKLIST_STEPS.find(s => !done.has(s)) ?? null,
  }
}

/**
 * Since when the rig has been on its current step: the latest tick among the steps before it,
 * or, with none ticked, when the build space opened. Null when the rig is finished.
 */
export function currentStepSince(
  steps: readonly StepState[],
  openedAt: Date | string,
): Date | null {
  const { current } = rigProgress(steps)
  if (!current) return null
  // A step ticked ahead of the current one does not move the rig on.
  const before = new Set(CHECKLIST_STEPS.slice(0, CHECKLIST_STEPS.indexOf(current)))
  const ticks = steps
    .filter(s => s.doneAt && before.has(s.step))
    .map(s => new Date(s.doneAt!).getTime())
  return new Date(Math.max(new Date(openedAt).getTime(), ...ticks))
}

/** Stuck: on one step for longer than a lesson, while the rig is still in use. */
export function isStuck(since: Date | string | null, retired: boolean, now: Date): boolean {
  if (!since || retired) return false
  return now.getTime() - new Date(since).getTime() > LESSON_MINUTES * 60_000
}

/** When a build space opened: its first rig's creation. */
export const openedAtOf = (rigs: readonly { createdAt: Date }[]) =>
  new Date(Math.min(...rigs.map(r => r.createdAt.getTime())))

/**
 * A rig's place on the board: its progress, since when it has been on its current step, and
 * whether it is stuck. A rig nobody has touched yet is waiting for builders, not stuck.
 */
export function rigState(
  steps: readonly StepState[],
  openedAt: Date,
  rig: { retired: boolean, lastActivityAt: Date | string | null },
  now: Date,
) {
  const progress = rigProgress(steps)
  const since = currentStepSince(steps, openedAt)
  const started = !!rig.lastActivityAt || steps.length > 0
  return { progress, since, stuck: started && isStuck(since, rig.retired, now) }
}

export const BOARD_SORTS = ['serial', 'group', 'progress', 'activity', 'stuck'] as const
export type BoardSort = (typeof BOARD_SORTS)[number]

export const BOARD_SORT_LABELS: Record<BoardSort, string> = {
  serial: 'Serial number',
  group: 'Group',
  progress: 'Progress',
  activity: 'Last activity',
  stuck: 'Stuck longest',
}

/** The fields of a board row that its sort and filters read. */
export interface BoardSortable {
  serial: string
  name: string
  groupLabel: string | null
  retired: boolean
  done: number
  currentStep: ChecklistStep | null
  currentSince: string | null
  stuck: boolean
  lastActivityAt: string | null
  builders: { name: string, username: string | null }[]
}

export interface BoardQuery {
  sort: BoardSort
  dir: 'asc' | 'desc'
  /** Only rigs of this group ('' for rigs without one). */
  group?: string
  /** Only rigs whose current step is this ('done' for finished rigs). */
  step?: ChecklistStep | 'done'
  stuck?: boolean
  /** Retired rigs are left out unless asked for. */
  retired?: boolean
  /** Words in the serial, the name, the group or a builder's name or username. */
  q?: string
}

const time = (iso: string | null) => (iso ? new Date(iso).getTime() : 0)

/** The board's rows, filtered and sorted; ties fall back to the serial number. */
export function boardRows<R extends BoardSortable>(rows: readonly R[], query: BoardQuery): R[] {
  const q = query.q?.trim().toLowerCase()
  const kept = rows.filter(r =>
    (query.retired || !r.retired)
    && (query.group === undefined || (r.groupLabel ?? '') === query.group)
    && (query.step === undefined
      || (query.step === 'done' ? r.currentStep === null : r.currentStep === query.step))
    && (query.stuck === undefined || r.stuck === query.stuck)
    && (!q
      || [r.serial, r.name, r.groupLabel ?? '', ...r.builders.flatMap(b => [b.name, b.username])]
        .some(w => w?.toLowerCase().includes(q))),
  )
  const key: Record<BoardSort, (r: R) => number | string> = {
    serial: r => r.serial,
    group: r => (r.groupLabel ?? '\uffff').toLowerCase(),
    progress: r => r.done,
    activity: r => time(r.lastActivityAt),
    stuck: r => (r.stuck ? time(r.currentSince) : 0),
  }
  const k = key[query.sort]
  const sign = query.dir === 'desc' ? -1 : 1
  // By "stuck", a rig that is not stuck sorts after every stuck one in either direction; the
  // stuck ones come oldest first when ascending.
  const apart = (r: R) => (query.sort === 'stuck' && !r.stuck ? 1 : 0)
  return [...kept].sort((a, b) => {
    const ka = k(a)
    const kb = k(b)
    const c = ka < kb ? -1 : ka > kb ? 1 : 0
    return apart(a) - apart(b) || c * sign || a.serial.localeCompare(b.serial)
  })
}
