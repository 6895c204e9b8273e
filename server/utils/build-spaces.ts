// Build spaces (docs/build.md): who may see, work on or manage an order's rigs, opening a build
// space when an order is paid or its purchase order approved, and the replies every build
// route shares. Nothing here carries a price: builders read these replies.
import { randomInt } from 'node:crypto'
import type { H3Event } from 'h3'
import { and, asc, desc, eq, inArray, sum } from 'drizzle-orm'
import {
  buildMembers,
  joinCodes,
  orderLines,
  orders,
  products,
  purchaseOrders,
  rigSteps,
  rigs,
  schools,
  tuningSheets,
  users,
} from '../database/schema'
import { buildSpaceReadyMail } from '../emails/build'
import {
  CHECKLIST_STEPS,
  JOIN_CODE_ALPHABET,
  JOIN_CODE_LENGTH,
  rigProgress,
  rigSerial,
  suggestUsername,
} from '../../shared/utils/build'
import type { SheetInputs } from '../../shared/schemas/planner'
import type {
  BuildMember,
  BuildSpaceRef,
  ChecklistEntry,
  JoinCodeView,
  RigPermissions,
  RigSheet,
  RigView,
} from '../../shared/types/build'
import { canSeeOrder } from '../../shared/utils/shop-rules'
import { JOIN_THROTTLE } from '../../shared/utils/sign-in-rules'
import type { SessionUser } from '../../shared/utils/roles'

export type RigRow = typeof rigs.$inferSelect
type JoinCodeRow = typeof joinCodes.$inferSelect

/** What the caller may do in a build space: see (read its rigs), work (tick, measure, save
 *  sheets) or manage (the teacher: rigs, codes, builders). */
export type BuildNeed = 'see' | 'work' | 'manage'

/** Who the caller is to a build space: its school's teacher, one of its builders, staff (read
 *  only: nothing a support agent sees lets them act as a customer), or nobody. */
export type SpaceRole = 'teacher' | 'builder' | 'staff' | null

const ALLOWED: Record<Exclude<SpaceRole, null>, Record<BuildNeed, boolean>> = {
  teacher: { see: true, work: true, manage: true },
  builder: { see: true, work: true, manage: false },
  staff: { see: true, work: false, manage: false },
}

export const mayIn = (role: SpaceRole, need: BuildNeed) => !!role && ALLOWED[role][need]

export function permissionsOf(role: SpaceRole): RigPermissions {
  return { manage: mayIn(role, 'manage'), work: mayIn(role, 'work') }
}

/** The caller's role in the build space of `order`: a builder must be a member right now. */
export async function spaceRoleOf(
  db: DbOrTx,
  user: SessionUser,
  order: { id: number, schoolId: number },
): Promise<SpaceRole> {
  if (user.role === 'support' || user.role === 'admin') return 'staff'
  if (user.role === 'teacher') return canSeeOrder(user, order) ? 'teacher' : null
  if (user.role !== 'builder') return null
  const [member] = await db
    .select({ id: buildMembers.id })
    .from(buildMembers)
    .where(and(eq(buildMembers.orderId, order.id), eq(buildMembers.userId, user.id)))
    .limit(1)
  return member ? 'builder' : null
}

/** The order whose build space the caller needs; 404 for anyone without that right. */
export async function loadSpaceFor(
  user: SessionUser,
  orderId: number,
  need: BuildNeed,
  roles: readonly Exclude<SpaceRole, null>[] = ['teacher', 'builder', 'staff'],
  db: DbOrTx = useDb(),
) {
  const order = await loadOrder(db, orderId)
  const role = order ? await spaceRoleOf(db, user, order) : null
  if (!order || !role || !roles.includes(role) || !mayIn(role, need)) throw notFound('That order')
  return { order, role }
}

/** The rig if the caller may `need` it (404 otherwise: its existence does not leak). */
export async function loadRigFor(
  user: SessionUser,
  rigId: number,
  need: BuildNeed,
  db: DbOrTx = useDb(),
) {
  const [hit] = await db
    .select({ rig: rigs, order: orders })
    .from(rigs)
    .innerJoin(orders, eq(orders.id, rigs.orderId))
    .where(eq(rigs.id, rigId))
    .limit(1)
  const role = hit ? await spaceRoleOf(db, user, hit.order) : null
  if (!hit || !mayIn(role, need)) throw notFound('That rig')
  return { rig: hit.rig, order: hit.order, role }
}

/** The rig for a change: locked in `tx`; a retired rig takes no more work (409). */
export async function lockRigFor(tx: Tx, user: SessionUser, rigId: number, need: BuildNeed) {
  const found = await loadRigFor(user, rigId, need, tx)
  const [rig] = await tx.select().from(rigs).where(eq(rigs.id, rigId)).for('update')
  if (need === 'work' && rig!.retiredAt)
    throw conflict('This rig is retired: its teacher can bring it back.', 'retired')
  return { ...found, rig: rig! }
}

/** Every change to a rig's build marks it active now. */
export async function touchRig(tx: DbOrTx, rigId: number, at = new Date()) {
  await tx.update(rigs).set({ lastActivityAt: at }).where(eq(rigs.id, rigId))
}

// ── Opening ───────────────────────────────────────────────────────────────────────────────

/** Paid (or further along), or a purchase order approved and waiting for its money. */
export async function isBuildSpaceDue(db: DbOrTx, order: OrderRow): Promise<boolean> {
  if (['paid', 'shipped', 'delivered'].includes(order.status)) return true
  if (order.status !== 'awaiting payment' || order.paymentMethod !== 'purchase-order') return false
  const [po] = await db
    .select({ status: purchaseOrders.status })
    .from(purchaseOrders)
    .where(eq(purchaseOrders.orderId, order.id))
    .limit(1)
  return po?.status === 'approved'
}

/** How many kit units the order holds: each becomes a rig. */
async function kitUnits(db: DbOrTx, orderId: number): Promise<number> {
  const [row] = await db
    .select({ n: sum(orderLines.quantity) })
    .from(orderLines)
    .innerJoin(products, eq(products.id, orderLines.productId))
    .where(and(eq(orderLines.orderId, orderId), eq(products.kind, 'kit')))
  return Number(row?.n ?? 0)
}

async function rigCount(db: DbOrTx, orderId: number) {
  const rows = await db.select({ id: rigs.id }).from(rigs).where(eq(rigs.orderId, orderId))
  return rows.length
}

/**
 * Opens the order's build space: one rig per kit unit, a timeline entry and the teacher's mail,
 * all in `tx`. Call it with the order locked. Idempotent: an order that has rigs keeps them.
 * Answers how many rigs the space has (0: the order holds no kits, so it has no space).
 */
export async function openBuildSpace(tx: Tx, orderId: number): Promise<number> {
  const have = await rigCount(tx, orderId)
  if (have) return have
  const units = await kitUnits(tx, orderId)
  if (!units) return 0
  const [order] = await tx.select().from(orders).where(eq(orders.id, orderId)).limit(1)
  const serials = Array.from({ length: units }, (_, i) => rigSerial(order!.number!, i + 1))
  await tx.insert(rigs).values(serials.map(serial => ({ orderId, serial })))
  const words = units === 1 ? '1 rig ready' : `${units} rigs ready`
  await addOrderEvent(tx, orderId, 'build-space', `Build space opened: ${words} for the class.`)
  const [teacher] = await tx.select().from(users).where(eq(users.id, order!.placedById)).limit(1)
  await enqueueMail(
    tx,
    'build-space-ready',
    mailAddressOf(teacher!),
    buildSpaceReadyMail(
      teacher!.name,
      { number: order!.number!, rigs: units },
      appUrl(`/orders/${orderId}/build`),
    ),
  )
  return units
}

/**
 * The build space of an order the caller's school owns, opened now if the order was paid (or its
 * purchase order approved) before build spaces existed; 409 `not-open` otherwise.
 */
export async function ensureBuildSpace(order: OrderRow): Promise<void> {
  if (await rigCount(useDb(), order.id)) return
  const opened = await transactionWithRetry(async (tx) => {
    const locked = await lockOrder(tx, order.id)
    if (!(await isBuildSpaceDue(tx, locked))) return null
    return openBuildSpace(tx, order.id)
  })
  if (opened === null)
    throw conflict(
      'This order\'s build space opens once the order is paid or its purchase order is '
      + 'approved.',
      'not-open',
    )
  if (opened === 0)
    throw conflict(
      'Only kits become rigs, and this order holds none, so it has no build space.',
      'not-open',
    )
}

/** What the order page says about the build space: null for an order without kits. An order
 *  paid before build spaces existed reads as open; its board opens it on the first visit. */
export async function buildSpaceOf(db: DbOrTx, order: OrderRow) {
  const n = await rigCount(db, order.id)
  if (n) return { open: true, rigs: n }
  const units = await kitUnits(db, order.id)
  if (!units) return null
  return (await isBuildSpaceDue(db, order)) ? { open: true, rigs: units } : { open: false, rigs: 0 }
}

// ── Shapes ────────────────────────────────────────────────────────────────────────────────

const iso = (d: Date | null | undefined) => d?.toISOString() ?? null

export async function spaceRefOf(db: DbOrTx, order: OrderRow): Promise<BuildSpaceRef> {
  const [row] = await db
    .select({ school: schools.name, teacher: users.name })
    .from(schools)
    .innerJoin(users, eq(users.id, order.placedById))
    .where(eq(schools.id, order.schoolId))
    .limit(1)
  return {
    orderId: order.id,
    orderNumber: order.number!,
    schoolName: row!.school,
    teacherName: row!.teacher,
  }
}

/** The build space's members: a display name and a username, nothing more. */
export async function membersOf(db: DbOrTx, orderId: number): Promise<BuildMember[]> {
  const rows = await db
    .select({ m: buildMembers, name: users.name, username: users.username })
    .from(buildMembers)
    .innerJoin(users, eq(users.id, buildMembers.userId))
    .where(eq(buildMembers.orderId, orderId))
    .orderBy(asc(users.name), asc(users.id))
  return rows.map(memberOf)
}

export function memberOf(r: {
  m: typeof buildMembers.$inferSelect
  name: string
  username: string | null
}): BuildMember {
  return {
    id: r.m.userId,
    name: r.name,
    username: r.username,
    rigId: r.m.rigId,
    joinedAt: r.m.joinedAt.toISOString(),
  }
}

/** A member of the order's build space (404 naming the builder otherwise). */
export async function loadMember(db: DbOrTx, orderId: number, userId: number) {
  const [row] = await db
    .select({ m: buildMembers, name: users.name, username: users.username })
    .from(buildMembers)
    .innerJoin(users, eq(users.id, buildMembers.userId))
    .where(and(eq(buildMembers.orderId, orderId), eq(buildMembers.userId, userId)))
    .limit(1)
  if (!row) throw notFound('That builder')
  return row
}

/** The steps touched on these rigs. */
export function stepsOf(db: DbOrTx, rigIds: number[]) {
  if (!rigIds.length) return Promise.resolve([] as (typeof rigSteps.$inferSelect)[])
  return db.select().from(rigSteps).where(inArray(rigSteps.rigId, rigIds))
}

async function namesOf(db: DbOrTx, ids: (number | null)[]) {
  const wanted = [...new Set(ids.filter((x): x is number => x !== null))]
  if (!wanted.length) return new Map<number, string>()
  const rows = await db
    .select({ id: users.id, name: users.name })
    .from(users)
    .where(inArray(users.id, wanted))
  return new Map(rows.map(r => [r.id, r.name]))
}

/** The rig's sheets, newest first, as its history shows them. */
async function rigSheetsOf(db: DbOrTx, rigId: number): Promise<RigSheet[]> {
  const rows = await db
    .select({ s: tuningSheets, authorName: users.name })
    .from(tuningSheets)
    .innerJoin(users, eq(users.id, tuningSheets.authorId))
    .where(and(eq(tuningSheets.rigId, rigId), eq(tuningSheets.archived, false)))
    .orderBy(desc(tuningSheets.createdAt), desc(tuningSheets.id))
  return rows.map(rigSheetOf)
}

/** A tuning sheet as a rig's history (and a ticket's thread) shows it. */
export function rigSheetOf(r: {
  s: typeof tuningSheets.$inferSelect
  authorName: string
}): RigSheet {
  const { s, authorName } = r
  return {
    id: s.id,
    title: s.title,
    note: s.note,
    authorName,
    createdAt: s.createdAt.toISOString(),
    verdict: s.verdict ?? null,
    measured: s.measured ?? null,
    inputs: s.inputs as unknown as SheetInputs,
    ...verdictNumbers(s.results),
  }
}

export async function rigView(db: DbOrTx, rigId: number, role: SpaceRole): Promise<RigView> {
  const [rig] = await db.select().from(rigs).where(eq(rigs.id, rigId)).limit(1)
  const order = (await loadOrder(db, rig!.orderId))!
  const [steps, members, sheets, space] = await Promise.all([
    stepsOf(db, [rig!.id]),
    membersOf(db, order.id),
    rigSheetsOf(db, rig!.id),
    spaceRefOf(db, order),
  ])
  const names = await namesOf(db, steps.flatMap(s => [s.doneById, s.updatedById]))
  const checklist: ChecklistEntry[] = CHECKLIST_STEPS.map((step) => {
    const s = steps.find(x => x.step === step)
    return {
      step,
      done: !!s?.doneAt,
      doneAt: iso(s?.doneAt),
      doneBy: s?.doneById ? (names.get(s.doneById) ?? null) : null,
      note: s?.note ?? null,
      updatedAt: iso(s?.updatedAt),
      updatedBy: s?.updatedById ? (names.get(s.updatedById) ?? null) : null,
    }
  })
  return {
    id: rig!.id,
    serial: rig!.serial,
    name: rig!.name ?? rig!.serial,
    groupLabel: rig!.groupLabel,
    retired: !!rig!.retiredAt,
    space,
    builders: members.filter(m => m.rigId === rig!.id),
    checklist,
    currentStep: rigProgress(steps).current,
    dimensions: rig!.dimensions ?? null,
    dimensionsUpdatedAt: iso(rig!.dimensionsUpdatedAt),
    calibration: rig!.calibration ?? null,
    calibratedAt: iso(rig!.calibratedAt),
    sheets,
    lastActivityAt: iso(rig!.lastActivityAt),
    may: permissionsOf(role),
  }
}

// ── Join codes ────────────────────────────────────────────────────────────────────────────

/** Works now: not revoked, not expired, not used up. */
export const isCodeLive = (c: JoinCodeRow, now = new Date()) =>
  !c.revokedAt
  && c.expiresAt.getTime() > now.getTime()
  && (c.maxUses === null || c.uses < c.maxUses)

export function joinCodeView(c: JoinCodeRow): JoinCodeView {
  return {
    id: c.id,
    code: c.code,
    expiresAt: c.expiresAt.toISOString(),
    maxUses: c.maxUses,
    uses: c.uses,
    revokedAt: iso(c.revokedAt),
    createdAt: c.createdAt.toISOString(),
    live: isCodeLive(c),
  }
}

/** A random code from the alphabet without look-alikes. */
export function newJoinCode(): string {
  return Array.from(
    { length: JOIN_CODE_LENGTH },
    () => JOIN_CODE_ALPHABET[randomInt(JOIN_CODE_ALPHABET.length)],
  ).join('')
}

/** The answer to a code that does not work, whatever the reason (it tells a guesser nothing). */
export const badJoinCode = () =>
  invalid(
    {
      code:
        'That code does not work: it may have expired or been used up. Ask your teacher for '
        + 'a new one.',
    },
    'That join code does not work.',
  )

/** The live code as typed (already normalised), with its order; 422 on `code` otherwise. */
export async function liveJoinCode(db: DbOrTx, code: string, lock = false) {
  // Only the code's row is locked (a join would lock the order's too).
  const q = db.select().from(joinCodes).where(eq(joinCodes.code, code)).limit(1)
  const [c] = lock ? await q.for('update') : await q
  if (!c || !isCodeLive(c)) throw badJoinCode()
  const order = (await loadOrder(db, c.orderId))!
  // A cancelled order's build space takes no new builders.
  if (order.status === 'cancelled' || order.status === 'rejected') throw badJoinCode()
  return { c, order }
}

/** The key join-code guesses are counted under, beside each address (no account or username
 *  can take it: a username has no spaces, an address has an @). */
export const JOIN_CODE_KEY = 'join code'

const joinWait = (when: string) =>
  `Too many join codes tried from here. Try again in ${when}, or check the code with your `
  + 'teacher.'

/**
 * Runs `work` (which looks a join code up) as one counted try from the caller's address: 429
 * while the address must wait; only a wrong code stays counted, anything else is given back.
 */
export async function withJoinThrottle<T>(event: H3Event, work: () => Promise<T>): Promise<T> {
  const address = requestAddress(event)
  await claimSignInAttempt(event, JOIN_CODE_KEY, address, JOIN_THROTTLE, joinWait)
  let wrongCode = false
  try {
    return await work()
  } catch (e) {
    wrongCode = (e as { data?: { fields?: Record<string, string> } }).data?.fields?.code
      !== undefined
    throw e
  } finally {
    if (!wrongCode) await refundSignInAttempt(JOIN_CODE_KEY, address, JOIN_THROTTLE)
  }
}

const randomUnit = () => randomInt(1_000_000) / 1_000_000

/** A username nobody has, from the word pairs of suggestUsername(). */
export async function freeUsername(db: DbOrTx): Promise<string> {
  for (let i = 0; i < 8; i++) {
    const name = suggestUsername([randomUnit(), randomUnit(), randomUnit()])
    if (!(await findUserByUsername(db, name))) return name
  }
  // Every draw was taken (a crowded school year): a longer number makes one that is not.
  return `${suggestUsername([randomUnit(), randomUnit(), randomUnit()])}${randomInt(10, 100)}`
}

// ── Builders' passwords ───────────────────────────────────────────────────────────────────

const PASSWORD_WORDS = [
  'amber', 'anchor', 'arrow', 'basil', 'beacon', 'birch', 'bison', 'bramble', 'breeze',
  'canyon', 'cedar', 'cinder', 'clover', 'comet', 'copper', 'coral', 'crane', 'delta', 'ember',
  'falcon', 'fern', 'fjord', 'flint', 'forest', 'garnet', 'glacier', 'harbor', 'hazel', 'heron',
  'indigo', 'island', 'jasper', 'juniper', 'kestrel', 'lagoon', 'lantern', 'larch', 'lotus',
  'maple', 'meadow', 'meteor', 'nectar', 'nimbus', 'orbit', 'otter', 'pebble', 'pepper',
  'prairie', 'quartz', 'raven', 'ripple', 'saffron', 'sierra', 'spruce', 'summit', 'thistle',
  'timber', 'tundra', 'velvet', 'walnut', 'willow', 'yarrow', 'zephyr', 'zinnia',
]

/** A password a teacher can read out: three words and two digits ("maple-orbit-fern-47"). */
export function readablePassword(): string {
  const word = () => PASSWORD_WORDS[randomInt(PASSWORD_WORDS.length)]
  return `${word()}-${word()}-${word()}-${randomInt(10, 100)}`
}

/** The build spaces a builder belongs to (their memberships), for removal and the list. */
export async function membershipsOf(db: DbOrTx, userId: number) {
  return db.select().from(buildMembers).where(eq(buildMembers.userId, userId))
}
