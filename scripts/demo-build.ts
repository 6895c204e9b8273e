// The demo build space: a paid order of Wrenfield Middle School for six Classroom Rig Kits, its
// six rigs in different states, the class's builders, their ticks, calibrations and tuning
// sheets, and one live join code (docs/build.md, "The demo build space"). Every time is
// relative to the moment of seeding, so the board reads the same on any day. Invented names.
import { randomInt } from 'node:crypto'
import { asc, eq } from 'drizzle-orm'
import type { MySql2Database } from 'drizzle-orm/mysql2'
import * as schema from '../server/database/schema'
import {
  JOIN_CODE_ALPHABET,
  JOIN_CODE_DEFAULT_HOURS,
  JOIN_CODE_LENGTH,
  rigSerial,
  suggestUsername,
  type ChecklistStep,
  type SheetVerdict,
} from '../shared/utils/build'
import { ORDER_FLOW, flowWording, type OrderAction } from '../shared/utils/order-flow'
import { formatCents, priceCart } from '../shared/utils/pricing'
import { taxBasisFor } from '../shared/utils/tax'
import { fitCalibration } from '../shared/utils/planner/calibration'
import { planGains } from '../shared/utils/planner/plan'
import { DEFAULT_TARGETS, KIT_PRESETS } from '../shared/utils/planner/presets'
import type { Gains, Rig, Targets } from '../shared/utils/planner/schema'
import { sheetResults } from '../shared/utils/sheets'
import type { MeasuredRun, RigCalibration } from '../shared/schemas/build'
import type { PostalAddress } from '../shared/schemas/address'

type Db = MySql2Database<typeof schema>
export type SeedTx = Parameters<Parameters<Db['transaction']>[0]>[0]

/** The people the build space needs, already seeded. */
export interface DemoBuildPeople {
  schoolId: number
  teacher: { id: number, name: string }
  /** builder@tiltwright.test: keeps its e-mail sign-in, joins the tuning rig. */
  builder: { id: number, name: string }
  passwordHash: string
}

/** The order's size: one kit per rig. */
export const DEMO_RIGS = 6

const MINUTE = 60_000
const HOUR = 60 * MINUTE
const DAY = 24 * HOUR

/** The class's code-joined builders: a display name and a username, nothing else. */
const CLASS = [
  { key: 'theo', name: 'Theo M.', r: [0.05, 0.15, 0.3] },
  { key: 'priya', name: 'Priya K.', r: [0.25, 0.45, 0.52] },
  { key: 'ana', name: 'Ana R.', r: [0.55, 0.75, 0.1] },
  { key: 'sam', name: 'Sam W.', r: [0.75, 0.05, 0.8] },
  { key: 'lena', name: 'Lena D.', r: [0.95, 0.65, 0.45] },
] as const satisfies readonly { key: string, name: string, r: [number, number, number] }[]
type ClassKey = (typeof CLASS)[number]['key'] | 'jonah'

interface Tick {
  step: ChecklistStep
  /** Before the moment of seeding. */
  ago: number
  by: ClassKey
  note?: string
  /** A note without a tick: the step is still open. */
  open?: boolean
}

interface DemoSheet {
  title: string
  ago: number
  by: ClassKey
  verdict: SheetVerdict
  note: string
  /** The gains loaded, as multiples of the planner's suggestion. */
  kpTimes: number
  kdTimes: number
  measured?: MeasuredRun
}

interface DemoRig {
  name: string | null
  group: string
  builders: ClassKey[]
  ticks: Tick[]
  preset: string | null
  /** Calibration readings (ADC counts) at 40, 120, 200, 280 and 360 mm. */
  readings?: number[]
  sheets?: DemoSheet[]
  retiredAgo?: number
}

const RIGS: DemoRig[] = [
  {
    // Finished: every step ticked, a sheet that balances with a measured run.
    name: null,
    group: 'Bench 1',
    builders: ['theo', 'priya'],
    preset: 'classroom-20',
    readings: [99, 306, 514, 719, 925],
    ticks: [
      { step: 'frame', ago: 5 * DAY + 2 * HOUR, by: 'theo' },
      { step: 'linkage', ago: 5 * DAY + HOUR, by: 'priya' },
      { step: 'wiring', ago: 4 * DAY + 2 * HOUR, by: 'theo', note: 'Re-soldered the rail lead.' },
      { step: 'rail-sensor', ago: 4 * DAY + HOUR, by: 'priya' },
      { step: 'calibration', ago: 3 * DAY + 2 * HOUR, by: 'priya' },
      { step: 'tuning', ago: DAY + 3 * HOUR, by: 'theo' },
      {
        step: 'nudge-test',
        ago: DAY + 2 * HOUR,
        by: 'priya',
        note: 'Caught five nudges out of five.',
      },
    ],
    sheets: [
      {
        title: 'Bench 1, suggested gains',
        ago: DAY + 3 * HOUR + 20 * MINUTE,
        by: 'theo',
        verdict: 'balances',
        note: 'Settles in about two seconds with one small overshoot. Nudges are caught.',
        kpTimes: 1,
        kdTimes: 1,
        measured: { settlingTime: 2.1, overshootPct: 12 },
      },
    ],
  },
  {
    // Tuning: a first sheet that keeps swinging, then a damped one that is slow.
    name: null,
    group: 'Bench 1',
    builders: ['jonah', 'ana'],
    preset: 'classroom-20',
    readings: [104, 312, 509, 713, 918],
    ticks: [
      { step: 'frame', ago: 5 * DAY + 90 * MINUTE, by: 'jonah' },
      { step: 'linkage', ago: 4 * DAY + 3 * HOUR, by: 'ana' },
      { step: 'wiring', ago: 4 * DAY + 90 * MINUTE, by: 'jonah' },
      { step: 'rail-sensor', ago: 3 * DAY + 3 * HOUR, by: 'ana' },
      { step: 'calibration', ago: 40 * MINUTE, by: 'ana' },
      {
        step: 'tuning',
        ago: 6 * MINUTE,
        by: 'jonah',
        open: true,
        note: 'Kd raised: no more swinging, but slow. Next: a little more Kp.',
      },
    ],
    sheets: [
      {
        title: 'Bench 1 right, first try',
        ago: 30 * MINUTE,
        by: 'ana',
        verdict: 'oscillates',
        note: 'The ball swings past the middle and back, again and again. Too little Kd?',
        kpTimes: 1.6,
        kdTimes: 0.35,
      },
      {
        title: 'Bench 1 right, more Kd',
        ago: 8 * MINUTE,
        by: 'jonah',
        verdict: 'slow',
        note: 'No overshoot now, but it creeps to the setpoint.',
        kpTimes: 0.7,
        kdTimes: 1.8,
        measured: { settlingTime: 7.5, overshootPct: 0 },
      },
    ],
  },
  {
    // Stuck on calibration since yesterday.
    name: 'Tall Tower',
    group: 'Bench 2',
    builders: ['sam'],
    preset: 'classroom-12',
    ticks: [
      { step: 'frame', ago: 4 * DAY + 3 * HOUR, by: 'sam' },
      { step: 'linkage', ago: 3 * DAY + 2 * HOUR, by: 'sam', note: 'Lever arm in the inner hole.' },
      { step: 'wiring', ago: 2 * DAY + 2 * HOUR, by: 'sam' },
      { step: 'rail-sensor', ago: 26 * HOUR, by: 'sam' },
      {
        step: 'calibration',
        ago: 25 * HOUR,
        by: 'sam',
        open: true,
        note: 'Readings jump near the far end. Cleaning the rails next time.',
      },
    ],
  },
  {
    // At wiring, with a note.
    name: null,
    group: 'Bench 2',
    builders: ['lena'],
    preset: 'classroom-20',
    ticks: [
      { step: 'frame', ago: 2 * DAY + HOUR, by: 'lena' },
      { step: 'linkage', ago: 25 * MINUTE, by: 'lena' },
      {
        step: 'wiring',
        ago: 10 * MINUTE,
        by: 'lena',
        open: true,
        note: 'The servo lead does not reach the controller; asked for an extension.',
      },
    ],
  },
  // Fresh: still in its box.
  { name: null, group: 'Bench 3', builders: [], preset: null, ticks: [] },
  {
    // Retired after a cracked beam; its parts are the class's spares.
    name: 'Spares',
    group: 'Bench 3',
    builders: [],
    preset: null,
    retiredAgo: 3 * DAY,
    ticks: [
      {
        step: 'frame',
        ago: 4 * DAY + 2 * HOUR,
        by: 'theo',
        open: true,
        note: 'Cracked beam at the pivot, swapped for a spare. Kept for parts.',
      },
    ],
  },
]

/** Calibration positions, m: where the ball was put for each reading. */
const CAL_POSITIONS = [0.04, 0.12, 0.2, 0.28, 0.36]

function randomJoinCode() {
  return Array.from(
    { length: JOIN_CODE_LENGTH },
    () => JOIN_CODE_ALPHABET[randomInt(JOIN_CODE_ALPHABET.length)],
  ).join('')
}

function presetRig(id: string): Rig {
  const p = KIT_PRESETS.find(k => k.id === id)
  if (!p) throw new Error(`no kit preset ${id}`)
  return { ...p.rig }
}

/** The gains a sheet loaded: the planner's suggestion for the rig, scaled. */
function sheetGains(rig: Rig, targets: Targets, s: DemoSheet): Gains {
  const plan = planGains(rig, targets)
  if (!plan.gains) throw new Error('the demo rig has no suggested gains')
  const g = plan.gains
  return { ...g, kp: g.kp * s.kpTimes, kd: g.kd * s.kdTimes }
}

const flowRow = (action: OrderAction) => ORDER_FLOW.find(r => r.action === action)!

/**
 * Seeds the demo order and its build space. Needs the catalog (a kit with six units in a batch;
 * without them nothing is seeded and it answers null) and the people; runs inside the seed's
 * transaction.
 */
export async function seedDemoBuild(tx: SeedTx, people: DemoBuildPeople, now = new Date()) {
  const at = (ago: number) => new Date(now.getTime() - ago)

  // ── The order: six kits at their tier, tax exempt, paid by card ────────────────────────
  const [kit] = await tx
    .select()
    .from(schema.products)
    .where(eq(schema.products.kind, 'kit'))
    .orderBy(asc(schema.products.sortOrder), asc(schema.products.id))
    .limit(1)
  // A catalog from an older data folder may lack the kit or its stock: then no demo order.
  if (!kit) return null
  const stock = await tx
    .select()
    .from(schema.batches)
    .where(eq(schema.batches.productId, kit.id))
    .orderBy(asc(schema.batches.builtOn), asc(schema.batches.id))
  const batch = stock.find(b => b.quantityBuilt - b.reserved >= DEMO_RIGS)
  if (!batch) return null
  const tiers = await tx
    .select()
    .from(schema.priceTiers)
    .where(eq(schema.priceTiers.productId, kit.id))
  const [school] = await tx
    .select()
    .from(schema.schools)
    .where(eq(schema.schools.id, people.schoolId))
  if (!school) throw new Error('the demo school is missing')
  const priced = priceCart(
    [
      {
        productId: kit.id,
        name: kit.name,
        quantity: DEMO_RIGS,
        tiers,
        weightGrams: kit.weightGrams,
      },
    ],
    taxBasisFor(school.region, school.taxExemption === 'accepted'),
  )
  const { lines, ...totals } = priced
  const address: PostalAddress = {
    name: school.name,
    attention: null,
    line1: school.addressLine1,
    line2: school.addressLine2 ?? null,
    city: school.city,
    region: school.region,
    postalCode: school.postalCode,
    country: school.country,
  }
  const placedAt = at(6 * DAY + 3 * HOUR)
  const paidAt = new Date(placedAt.getTime() + 12 * MINUTE)
  const allocatedAt = at(5 * DAY + 22 * HOUR)
  const openedAt = new Date(paidAt.getTime() + 1000)
  const paymentReference = `pi_demo${placedAt.getTime().toString(36)}`
  const [ins] = await tx
    .insert(schema.orders)
    .values({
      schoolId: school.id,
      placedById: people.teacher.id,
      status: 'paid',
      paymentMethod: 'card',
      subtotalCents: totals.subtotalCents,
      shippingCents: totals.shippingCents,
      taxCents: totals.taxCents,
      totalCents: totals.totalCents,
      taxExempt: totals.taxExempt,
      taxRateBasisPoints: totals.taxRateBasisPoints,
      taxState: totals.taxState,
      shipTo: address,
      billTo: address,
      paidAt,
      paymentReference,
      createdAt: placedAt,
      updatedAt: allocatedAt,
    })
    .$returningId()
  const orderId = ins!.id
  // The shop's rule for order numbers (server/utils/orders.ts, orderNumberFor).
  const number = `TW-${10000 + orderId}`
  await tx.update(schema.orders).set({ number }).where(eq(schema.orders.id, orderId))
  await tx.insert(schema.orderLines).values(lines.map(l => ({ ...l, orderId })))

  // Stock: reserved from the oldest batch with room, then allocated for packing.
  await tx
    .update(schema.batches)
    .set({ reserved: batch.reserved + DEMO_RIGS })
    .where(eq(schema.batches.id, batch.id))
  await tx.insert(schema.stockReservations).values({
    orderId,
    productId: kit.id,
    batchId: batch.id,
    quantity: DEMO_RIGS,
    status: 'allocated',
    createdAt: placedAt,
  })

  // ── Its timeline: placed, paid, build space opened, allocated ──────────────────────────
  const events = [
    {
      kind: 'placed',
      message: flowWording(flowRow('placeCard'), { actor: people.teacher.name }),
      actorId: people.teacher.id,
      createdAt: placedAt,
    },
    {
      kind: 'paid',
      message: flowWording(flowRow('markPaid'), {
        amount: formatCents(totals.totalCents),
        reference: paymentReference,
      }),
      actorId: null,
      createdAt: paidAt,
    },
    {
      // The words server/utils/build-spaces.ts writes when it opens a space.
      kind: 'build-space',
      message: `Build space opened: ${DEMO_RIGS} rigs ready for the class.`,
      actorId: null,
      createdAt: openedAt,
    },
    {
      kind: 'allocated',
      message: flowWording(flowRow('allocate'), {
        reference: `batch ${batch.code} × ${DEMO_RIGS}`,
      }),
      actorId: null,
      createdAt: allocatedAt,
    },
  ]
  await tx.insert(schema.orderEvents).values(events.map(e => ({ ...e, orderId })))

  // ── The class: code-joined builders (no e-mail) and the demo builder ───────────────────
  const firstCode = {
    code: randomJoinCode(),
    createdAt: new Date(openedAt.getTime() + 20 * HOUR),
  }
  const [first] = await tx
    .insert(schema.joinCodes)
    .values({
      orderId,
      code: firstCode.code,
      // Made for the first lesson, for two days; every student of the class joined with it.
      expiresAt: new Date(firstCode.createdAt.getTime() + 48 * HOUR),
      maxUses: 30,
      uses: CLASS.length,
      createdById: people.teacher.id,
      createdAt: firstCode.createdAt,
    })
    .$returningId()
  await tx.insert(schema.joinCodes).values({
    orderId,
    code: randomJoinCode(),
    expiresAt: at(-JOIN_CODE_DEFAULT_HOURS * HOUR),
    maxUses: null,
    createdById: people.teacher.id,
    createdAt: at(0),
  })

  const ids = new Map<ClassKey, number>([['jonah', people.builder.id]])
  for (const [i, s] of CLASS.entries()) {
    const joinedAt = new Date(firstCode.createdAt.getTime() + (5 + i) * MINUTE)
    const [u] = await tx
      .insert(schema.users)
      .values({
        email: null,
        username: suggestUsername(s.r),
        name: s.name,
        passwordHash: people.passwordHash,
        role: 'builder',
        schoolId: school.id,
        verifiedAt: joinedAt,
        lastSignInAt: joinedAt,
        createdAt: joinedAt,
      })
      .$returningId()
    ids.set(s.key, u!.id)
  }

  // ── The rigs ───────────────────────────────────────────────────────────────────────────
  const targets: Targets = { ...DEFAULT_TARGETS }
  const rigIds: number[] = []
  for (const [i, r] of RIGS.entries()) {
    const ticks = r.ticks.filter(t => !t.open)
    const frameAt = ticks.find(t => t.step === 'frame')
    const calibratedAt = ticks.find(t => t.step === 'calibration')
    const rig = r.preset ? presetRig(r.preset) : null
    const calibration: RigCalibration | null = r.readings
      ? (() => {
          const adcBits = rig?.adcBits ?? 10
          const pairs = r.readings.map((reading, k) => ({ reading, position: CAL_POSITIONS[k]! }))
          return { adcBits, pairs, fit: fitCalibration(pairs, adcBits) }
        })()
      : null
    const activity = [
      ...r.ticks.map(t => t.ago),
      ...(r.sheets ?? []).map(s => s.ago),
      ...(r.retiredAgo ? [r.retiredAgo] : []),
    ]
    const [row] = await tx
      .insert(schema.rigs)
      .values({
        orderId,
        serial: rigSerial(number, i + 1),
        name: r.name,
        groupLabel: r.group,
        retiredAt: r.retiredAgo ? at(r.retiredAgo) : null,
        dimensions: rig && frameAt ? rig : null,
        dimensionsUpdatedAt: rig && frameAt ? at(frameAt.ago - 10 * MINUTE) : null,
        calibration: calibratedAt ? calibration : null,
        calibratedAt: calibratedAt ? at(calibratedAt.ago + 5 * MINUTE) : null,
        lastActivityAt: activity.length ? at(Math.min(...activity)) : null,
        createdAt: openedAt,
      })
      .$returningId()
    const rigId = row!.id
    rigIds.push(rigId)
    for (const t of r.ticks) {
      const by = ids.get(t.by)!
      await tx.insert(schema.rigSteps).values({
        rigId,
        step: t.step,
        doneAt: t.open ? null : at(t.ago),
        doneById: t.open ? null : by,
        note: t.note ?? null,
        updatedById: by,
        updatedAt: at(t.ago),
      })
    }
    for (const s of r.sheets ?? []) {
      const inputs = { rig: rig!, targets, gains: sheetGains(rig!, targets, s) }
      await tx.insert(schema.tuningSheets).values({
        authorId: ids.get(s.by)!,
        rigId,
        title: s.title,
        note: s.note,
        verdict: s.verdict,
        measured: s.measured ?? null,
        inputs,
        results: sheetResults(inputs) as unknown as Record<string, unknown>,
        createdAt: at(s.ago),
      })
    }
  }

  // ── Memberships: each builder on their rig ─────────────────────────────────────────────
  for (const [i, r] of RIGS.entries()) {
    for (const key of r.builders) {
      const userId = ids.get(key)!
      const fromCode = key !== 'jonah'
      const k = CLASS.findIndex(c => c.key === key)
      await tx.insert(schema.buildMembers).values({
        orderId,
        userId,
        rigId: rigIds[i]!,
        joinCodeId: fromCode ? first!.id : null,
        joinedAt: fromCode
          ? new Date(firstCode.createdAt.getTime() + (5 + k) * MINUTE)
          : new Date(openedAt.getTime() + 2 * HOUR),
      })
    }
  }
  return { orderId, number, rigIds }
}
