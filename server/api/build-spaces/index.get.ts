// The build spaces the caller teaches (their school's orders with rigs) or builds in (with
// their own rigs), each with a progress summary. Staff reach spaces through the orders.
import { desc, eq, inArray } from 'drizzle-orm'
import { openedAtOf, rigState } from '../../../shared/utils/build'
import type { BuildSpaceSummary, SpaceRig } from '../../../shared/types/build'
import { orders, rigs } from '../../database/schema'

const spaceRig = (x: { rig: typeof rigs.$inferSelect, current: SpaceRig['currentStep'] }) => ({
  id: x.rig.id,
  serial: x.rig.serial,
  name: x.rig.name ?? x.rig.serial,
  groupLabel: x.rig.groupLabel,
  currentStep: x.current,
})

export default defineEventHandler(async (event): Promise<BuildSpaceSummary[]> => {
  const user = await requireUser(event)
  if (user.role !== 'teacher' && user.role !== 'builder') return []
  const db = useDb()
  const memberships = user.role === 'builder' ? await membershipsOf(db, user.id) : []
  const spaceOrders = await db
    .selectDistinct({ o: orders })
    .from(orders)
    .innerJoin(rigs, eq(rigs.orderId, orders.id))
    .where(
      user.role === 'teacher'
        ? eq(orders.schoolId, user.schoolId ?? 0)
        : inArray(orders.id, [0, ...memberships.map(m => m.orderId)]),
    )
    .orderBy(desc(orders.createdAt), desc(orders.id))
  if (!spaceOrders.length) return []
  const orderIds = spaceOrders.map(r => r.o.id)
  const allRigs = await db.select().from(rigs).where(inArray(rigs.orderId, orderIds))
  const steps = await stepsOf(db, allRigs.map(r => r.id))
  const now = new Date()
  return Promise.all(spaceOrders.map(async ({ o }) => {
    const mine = allRigs
      .filter(r => r.orderId === o.id)
      .sort((a, b) => a.serial.localeCompare(b.serial))
    const openedAt = openedAtOf(mine)
    const state = mine.map((rig) => {
      const { progress, stuck } = rigState(
        steps.filter(x => x.rigId === rig.id),
        openedAt,
        { retired: !!rig.retiredAt, lastActivityAt: rig.lastActivityAt },
        now,
      )
      return { rig, current: progress.current, stuck }
    })
    const myRigIds = new Set(
      memberships.filter(m => m.orderId === o.id && m.rigId !== null).map(m => m.rigId),
    )
    return {
      ...(await spaceRefOf(db, o)),
      status: o.status,
      openedAt: openedAt.toISOString(),
      rigs: mine.filter(r => !r.retiredAt).length,
      finished: state.filter(x => !x.rig.retiredAt && x.current === null).length,
      stuck: state.filter(x => x.stuck).length,
      myRigs: state.filter(x => myRigIds.has(x.rig.id)).map(spaceRig),
      classRigs: user.role === 'builder'
        ? state.filter(x => !x.rig.retiredAt).map(spaceRig)
        : [],
    }
  }))
})
