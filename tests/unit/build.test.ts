// The build space's pure rules (shared/utils/build.ts) and its request schemas
// (shared/schemas/build.ts): progress, the stuck rule, the board's filters and sorts, join codes
// and usernames, and the field errors a bad body gets (docs/build.md).
import { describe, expect, it } from 'vitest'
import type { z } from 'zod'
import {
  BOARD_SORTS,
  CHECKLIST_STEPS,
  JOIN_CODE_ALPHABET,
  JOIN_CODE_LENGTH,
  JOIN_CODE_MAX_HOURS,
  LESSON_MINUTES,
  USERNAME_PATTERN,
  boardRows,
  currentStepSince,
  formatJoinCode,
  isStuck,
  openedAtOf,
  rigState,
  normaliseJoinCode,
  rigProgress,
  suggestUsername,
  type BoardQuery,
  type BoardSortable,
  type ChecklistStep,
  type StepState,
} from '../../shared/utils/build'
import {
  boardQuerySchema,
  createJoinCodeSchema,
  joinCheckSchema,
  joinSchema,
  updateStepSchema,
} from '../../shared/schemas/build'
import { fieldErrorsOf } from '../../shared/utils/field-errors'

const fields = (schema: z.ZodType, body: unknown) => {
  const r = schema.safeParse(body)
  return r.success ? {} : fieldErrorsOf(r.error)
}

const opened = '2026-03-02T08:00:00.000Z'
const at = (minutes: number) => new Date(Date.parse(opened) + minutes * 60_000).toISOString()
const ticked = (...pairs: [ChecklistStep, number][]): StepState[] =>
  pairs.map(([step, minutes]) => ({ step, doneAt: at(minutes) }))

describe('rigProgress', () => {
  it('counts nothing done on a fresh rig and starts at the frame', () => {
    expect(rigProgress([])).toEqual({ done: 0, total: 7, current: 'frame' })
  })
  it('takes the first step not done as current, even when a later one is ticked', () => {
    const p = rigProgress(ticked(['frame', 1], ['linkage', 2], ['tuning', 3]))
    expect(p).toEqual({ done: 3, total: CHECKLIST_STEPS.length, current: 'wiring' })
  })
  it('ignores a step with a note but no tick', () => {
    const p = rigProgress([...ticked(['frame', 1]), { step: 'linkage', doneAt: null }])
    expect(p).toMatchObject({ done: 1, current: 'linkage' })
  })
  it('has no current step once every step is done', () => {
    const p = rigProgress(ticked(...CHECKLIST_STEPS.map((s, i): [ChecklistStep, number] => [s, i])))
    expect(p).toEqual({ done: 7, total: 7, current: null })
  })
})

describe('currentStepSince', () => {
  it('is the opening time while nothing is ticked', () => {
    expect(currentStepSince([], opened)?.toISOString()).toBe(opened)
  })
  it('is the latest tick before the current step', () => {
    const since = currentStepSince(ticked(['linkage', 90], ['frame', 30]), opened)
    expect(since?.toISOString()).toBe(at(90))
  })
  it('is not moved by a step ticked ahead of the current one', () => {
    const since = currentStepSince(ticked(['frame', 30], ['tuning', 500]), opened)
    expect(since?.toISOString()).toBe(at(30))
  })
  it('never goes before the opening', () => {
    expect(currentStepSince(ticked(['frame', -60]), opened)?.toISOString()).toBe(opened)
  })
  it('is null for a finished rig', () => {
    const all = ticked(...CHECKLIST_STEPS.map((s, i): [ChecklistStep, number] => [s, i]))
    expect(currentStepSince(all, opened)).toBeNull()
  })
  it('accepts Date objects as well as strings', () => {
    const since = currentStepSince([{ step: 'frame', doneAt: new Date(at(5)) }], new Date(opened))
    expect(since?.toISOString()).toBe(at(5))
  })
})

describe('isStuck', () => {
  const since = at(0)
  const after = (minutes: number) => new Date(Date.parse(since) + minutes * 60_000)
  it('is not stuck within a lesson, nor at exactly a lesson', () => {
    expect(isStuck(since, false, after(LESSON_MINUTES - 1))).toBe(false)
    expect(isStuck(since, false, after(LESSON_MINUTES))).toBe(false)
  })
  it('is stuck just past a lesson', () => {
    expect(isStuck(since, false, after(LESSON_MINUTES + 1))).toBe(true)
    expect(isStuck(new Date(since), false, after(3 * LESSON_MINUTES))).toBe(true)
  })
  it('is never stuck when retired', () => {
    expect(isStuck(since, true, after(10 * LESSON_MINUTES))).toBe(false)
  })
  it('is never stuck when finished (no current step)', () => {
    expect(isStuck(null, false, after(10 * LESSON_MINUTES))).toBe(false)
  })
})

describe('rigState', () => {
  const openedAt = new Date(at(0))
  const later = new Date(Date.parse(at(0)) + 3 * LESSON_MINUTES * 60_000)
  it('calls a rig nobody has touched waiting, not stuck', () => {
    const s = rigState([], openedAt, { retired: false, lastActivityAt: null }, later)
    expect(s.progress.current).toBe('frame')
    expect(s.since?.toISOString()).toBe(at(0))
    expect(s.stuck).toBe(false)
  })
  it('flags a started rig that has not moved for longer than a lesson', () => {
    const touched = { retired: false, lastActivityAt: at(0) }
    expect(rigState([], openedAt, touched, later).stuck).toBe(true)
    const ticked = [{ step: 'frame' as const, doneAt: at(0) }]
    const s = rigState(ticked, openedAt, { retired: false, lastActivityAt: null }, later)
    expect(s).toMatchObject({ stuck: true, progress: { done: 1, current: 'linkage' } })
  })
  it('takes the opening from the first rig made', () => {
    const rigs = [{ createdAt: new Date(at(9)) }, { createdAt: new Date(at(2)) }]
    expect(openedAtOf(rigs).toISOString()).toBe(at(2))
  })
})

// ── The board ────────────────────────────────────────────────────────────────────────────

const row = (r: Partial<BoardSortable> & { serial: string }): BoardSortable => ({
  name: r.serial,
  groupLabel: null,
  retired: false,
  done: 0,
  currentStep: 'frame',
  currentSince: null,
  stuck: false,
  lastActivityAt: null,
  builders: [],
  ...r,
})

const ROWS: BoardSortable[] = [
  row({
    serial: 'TW-10001-03',
    name: 'Tall Tower',
    groupLabel: 'Bench 2',
    done: 4,
    currentStep: 'calibration',
    currentSince: at(100),
    stuck: true,
    lastActivityAt: at(100),
    builders: [{ name: 'Sam W.', username: 'bold-pivot-82' }],
  }),
  row({
    serial: 'TW-10001-01',
    groupLabel: 'Bench 1',
    done: 7,
    currentStep: null,
    lastActivityAt: at(400),
    builders: [
      { name: 'Theo M.', username: 'swift-beam-37' },
      { name: 'Priya K.', username: 'bright-servo-56' },
    ],
  }),
  row({
    serial: 'TW-10001-02',
    groupLabel: 'bench 1',
    done: 5,
    currentStep: 'tuning',
    currentSince: at(600),
    lastActivityAt: at(650),
    builders: [{ name: 'Jonah Pell', username: null }],
  }),
  row({
    serial: 'TW-10001-05',
    done: 0,
    currentSince: at(0),
    stuck: true,
  }),
  row({
    serial: 'TW-10001-04',
    groupLabel: 'Bench 2',
    done: 4,
    currentStep: 'calibration',
    currentSince: at(50),
    stuck: true,
    lastActivityAt: at(50),
  }),
  row({
    serial: 'TW-10001-06',
    name: 'Spares',
    groupLabel: 'Bench 3',
    retired: true,
    lastActivityAt: at(20),
  }),
]

const serials = (q: Partial<BoardQuery>) =>
  boardRows(ROWS, { sort: 'serial', dir: 'asc', ...q }).map(r => r.serial.slice(-2))

describe('boardRows filters', () => {
  it('leaves retired rigs out unless asked for', () => {
    expect(serials({})).toEqual(['01', '02', '03', '04', '05'])
    expect(serials({ retired: false })).toEqual(['01', '02', '03', '04', '05'])
    expect(serials({ retired: true })).toEqual(['01', '02', '03', '04', '05', '06'])
  })
  it('keeps one group, matching its label exactly; "" means rigs without a group', () => {
    expect(serials({ group: 'Bench 2' })).toEqual(['03', '04'])
    expect(serials({ group: 'Bench 1' })).toEqual(['01'])
    expect(serials({ group: '' })).toEqual(['05'])
    expect(serials({ group: 'Bench 9' })).toEqual([])
  })
  it('keeps rigs on one step, or the finished ones for "done"', () => {
    expect(serials({ step: 'calibration' })).toEqual(['03', '04'])
    expect(serials({ step: 'frame' })).toEqual(['05'])
    expect(serials({ step: 'done' })).toEqual(['01'])
    expect(serials({ step: 'nudge-test' })).toEqual([])
  })
  it('keeps the stuck rigs, or those not stuck', () => {
    expect(serials({ stuck: true })).toEqual(['03', '04', '05'])
    expect(serials({ stuck: false })).toEqual(['01', '02'])
  })
  it('searches serial, name, group, builder names and usernames, in any case', () => {
    expect(serials({ q: '10001-02' })).toEqual(['02'])
    expect(serials({ q: 'tall' })).toEqual(['03'])
    expect(serials({ q: 'BENCH 1' })).toEqual(['01', '02'])
    expect(serials({ q: 'priya' })).toEqual(['01'])
    expect(serials({ q: 'bold-pivot' })).toEqual(['03'])
    expect(serials({ q: '  jonah  ' })).toEqual(['02'])
    expect(serials({ q: 'spares' })).toEqual([])
    expect(serials({ q: 'spares', retired: true })).toEqual(['06'])
    expect(serials({ q: '   ' })).toHaveLength(5)
  })
  it('combines filters', () => {
    expect(serials({ group: 'Bench 2', stuck: true, step: 'calibration', q: 'sam' })).toEqual([
      '03',
    ])
  })
  it('does not change the rows it is given', () => {
    const copy = ROWS.map(r => r.serial)
    boardRows(ROWS, { sort: 'progress', dir: 'desc' })
    expect(ROWS.map(r => r.serial)).toEqual(copy)
  })
})

describe('boardRows sorts', () => {
  const sorted = (sort: BoardQuery['sort'], dir: BoardQuery['dir']) =>
    serials({ sort, dir, retired: true })

  it('offers the sorts the board names', () => {
    expect([...BOARD_SORTS]).toEqual(['serial', 'group', 'progress', 'activity', 'stuck'])
  })
  it('by serial, both directions', () => {
    expect(sorted('serial', 'asc')).toEqual(['01', '02', '03', '04', '05', '06'])
    expect(sorted('serial', 'desc')).toEqual(['06', '05', '04', '03', '02', '01'])
  })
  it('by group ignoring case, rigs without a group last when ascending; ties by serial', () => {
    expect(sorted('group', 'asc')).toEqual(['01', '02', '03', '04', '06', '05'])
    expect(sorted('group', 'desc')).toEqual(['05', '06', '03', '04', '01', '02'])
  })
  it('by progress, ties by serial in both directions', () => {
    expect(sorted('progress', 'asc')).toEqual(['05', '06', '03', '04', '02', '01'])
    expect(sorted('progress', 'desc')).toEqual(['01', '02', '03', '04', '05', '06'])
  })
  it('by last activity, never-active rigs as the oldest', () => {
    expect(sorted('activity', 'asc')).toEqual(['05', '06', '04', '03', '01', '02'])
    expect(sorted('activity', 'desc')).toEqual(['02', '01', '03', '04', '06', '05'])
  })
  it('by stuck: stuck rigs first in either direction, oldest first when ascending', () => {
    expect(sorted('stuck', 'asc')).toEqual(['05', '04', '03', '01', '02', '06'])
    expect(sorted('stuck', 'desc')).toEqual(['03', '04', '05', '01', '02', '06'])
  })
  it('breaks ties by serial whichever the direction', () => {
    const same = ['TW-1-03', 'TW-1-01', 'TW-1-02'].map(serial => row({ serial, done: 2 }))
    for (const dir of ['asc', 'desc'] as const) {
      expect(boardRows(same, { sort: 'progress', dir }).map(r => r.serial)).toEqual([
        'TW-1-01',
        'TW-1-02',
        'TW-1-03',
      ])
    }
  })
})

describe('boardQuerySchema', () => {
  it('defaults to serial ascending and reads the flags from the query string', () => {
    expect(boardQuerySchema.parse({})).toEqual({ sort: 'serial', dir: 'asc' })
    expect(boardQuerySchema.parse({ stuck: 'true', retired: 'false', step: 'done' })).toEqual({
      sort: 'serial',
      dir: 'asc',
      stuck: true,
      retired: false,
      step: 'done',
    })
  })
  it('names each bad field', () => {
    expect(
      fields(boardQuerySchema, { sort: 'price', dir: 'up', step: 'paint', stuck: 'yes' }),
    ).toEqual({
      sort: 'Unknown sort.',
      dir: 'Direction is asc or desc.',
      step: 'Unknown step.',
      stuck: 'Stuck is true or false.',
    })
  })
})

// ── Join codes and usernames ─────────────────────────────────────────────────────────────

describe('join codes', () => {
  it('formats a code in two halves and normalises what was typed', () => {
    expect(formatJoinCode('K7PQX2MD')).toBe('K7PQ-X2MD')
    expect(normaliseJoinCode(' k7pq-x2md ')).toBe('K7PQX2MD')
    expect(normaliseJoinCode('k7pq x2 md')).toBe('K7PQX2MD')
    expect(normaliseJoinCode(formatJoinCode('K7PQX2MD'))).toBe('K7PQX2MD')
  })
  it('uses an alphabet without look-alikes', () => {
    for (const c of '015OILS') expect(JOIN_CODE_ALPHABET).not.toContain(c)
    expect(new Set(JOIN_CODE_ALPHABET).size).toBe(JOIN_CODE_ALPHABET.length)
    expect(JOIN_CODE_LENGTH).toBe(8)
  })
  it('accepts a code in any case, with or without the dash', () => {
    expect(joinCheckSchema.parse({ code: 'k7pq-x2md' })).toEqual({ code: 'K7PQX2MD' })
    expect(joinCheckSchema.parse({ code: 'K7PQX2MD' })).toEqual({ code: 'K7PQX2MD' })
  })
  it('refuses look-alike letters and digits, wrong lengths and blanks, on the code field', () => {
    for (const bad of ['K7PQX2M0', 'K7PQX2MO', 'K7PQX2M1', 'K7PQX2MI', 'K7PQX2ML', 'K7PQX2M5',
      'K7PQX2MS', 'K7PQX2M', 'K7PQX2MDD', 'K7PQ_X2MD']) {
      expect(fields(joinCheckSchema, { code: bad }), bad).toEqual({
        code: 'That is not a join code: check it with your teacher.',
      })
    }
    expect(fields(joinCheckSchema, { code: ' - ' })).toEqual({
      code: 'Enter the join code your teacher gave you.',
    })
    expect(fields(joinCheckSchema, {})).toEqual({
      code: 'Enter the join code your teacher gave you.',
    })
    expect(fields(joinCheckSchema, { code: 'X'.repeat(41) })).toEqual({
      code: 'That is not a join code.',
    })
  })
})

describe('suggestUsername', () => {
  it('always matches USERNAME_PATTERN, across the whole range of its numbers', () => {
    const xs = [0, 0.05, 0.1, 0.33, 0.5, 0.77, 0.9, 0.999999]
    for (const a of xs)
      for (const b of xs)
        for (const c of xs) {
          const name = suggestUsername([a, b, c])
          expect(name, name).toMatch(USERNAME_PATTERN)
          expect(joinSchema.shape.username.parse(name)).toBe(name)
        }
  })
  it('is made of two words and a two-digit number', () => {
    expect(suggestUsername([0, 0, 0])).toMatch(/^[a-z]+-[a-z]+-10$/)
    expect(suggestUsername([0.999999, 0.999999, 0.999999])).toMatch(/^[a-z]+-[a-z]+-99$/)
    expect(suggestUsername([0.2, 0.4, 0.6])).not.toBe(suggestUsername([0.6, 0.4, 0.2]))
  })
})

describe('joinSchema', () => {
  const good = {
    code: 'k7pq-x2md',
    name: ' Ana R. ',
    username: 'Keen-Spring-19 ',
    password: 'long enough pw',
  }
  it('takes a good body, normalising the code, the name and the username', () => {
    expect(joinSchema.parse(good)).toEqual({
      code: 'K7PQX2MD',
      name: 'Ana R.',
      username: 'keen-spring-19',
      password: 'long enough pw',
    })
  })
  it('names every missing field', () => {
    expect(fields(joinSchema, {})).toEqual({
      code: 'Enter the join code your teacher gave you.',
      name: 'Enter the name your teacher will see.',
      username: 'Choose a username.',
      password: 'Enter a password.',
    })
  })
  it('names each bad field in words', () => {
    expect(
      fields(joinSchema, { code: 'OOOOOOOO', name: '  ', username: '9lives', password: 'short' }),
    ).toEqual({
      code: 'That is not a join code: check it with your teacher.',
      name: 'Enter the name your teacher will see.',
      username: 'Use lower-case letters, digits and dashes, starting with a letter.',
      password: 'Use at least 10 characters.',
    })
    expect(fields(joinSchema, { ...good, username: 'ab' })).toEqual({
      username: 'Use at least 3 characters.',
    })
    expect(fields(joinSchema, { ...good, username: 'a'.repeat(31) })).toEqual({
      username: 'Use at most 30 characters.',
    })
    expect(fields(joinSchema, { ...good, username: 'ana r' })).toEqual({
      username: 'Use lower-case letters, digits and dashes, starting with a letter.',
    })
    expect(fields(joinSchema, { ...good, name: 'A'.repeat(41) })).toEqual({
      name: 'Keep the name to 40 characters or fewer.',
    })
    expect(Object.keys(fields(joinSchema, { ...good, name: 'Ana\nR.' }))).toEqual(['name'])
  })
})

describe('createJoinCodeSchema', () => {
  it('takes nothing (the defaults), hours and a limit, also as digits', () => {
    expect(createJoinCodeSchema.parse({})).toEqual({})
    expect(createJoinCodeSchema.parse({ expiresInHours: '48', maxUses: 30 })).toEqual({
      expiresInHours: 48,
      maxUses: 30,
    })
    expect(createJoinCodeSchema.parse({ maxUses: null })).toEqual({ maxUses: null })
  })
  it('names each bad field', () => {
    expect(fields(createJoinCodeSchema, { expiresInHours: 0, maxUses: 0 })).toEqual({
      expiresInHours: 'A code must last at least an hour.',
      maxUses: 'Allow at least one use.',
    })
    expect(
      fields(createJoinCodeSchema, { expiresInHours: JOIN_CODE_MAX_HOURS + 1, maxUses: 501 }),
    ).toEqual({
      expiresInHours: `A code can last at most ${JOIN_CODE_MAX_HOURS / 24} days.`,
      maxUses: 'Allow at most 500 uses.',
    })
    expect(fields(createJoinCodeSchema, { expiresInHours: 1.5, maxUses: 'many' })).toEqual({
      expiresInHours: 'Give the hours as a whole number.',
      maxUses: 'Give the number of uses as a whole number.',
    })
  })
})

describe('updateStepSchema', () => {
  it('ticks with or without a note; a blank note clears it and a missing one leaves it', () => {
    expect(updateStepSchema.parse({ done: true })).toEqual({ done: true })
    expect(updateStepSchema.parse({ done: false, note: '  Rails need cleaning. ' })).toEqual({
      done: false,
      note: 'Rails need cleaning.',
    })
    expect(updateStepSchema.parse({ done: true, note: '   ' })).toEqual({ done: true, note: null })
    expect(updateStepSchema.parse({ done: true, note: null })).toEqual({ done: true, note: null })
  })
  it('names each bad field', () => {
    expect(fields(updateStepSchema, { note: 4 })).toEqual({
      done: 'Done is true or false.',
      note: 'The note must be text.',
    })
    expect(fields(updateStepSchema, { done: 'yes', note: 'x'.repeat(301) })).toEqual({
      done: 'Done is true or false.',
      note: 'Keep the note to 300 characters or fewer.',
    })
  })
})
