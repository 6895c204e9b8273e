// The teacher's progress board: every rig of the order with its checklist progress, latest
// sheet and last activity, stuck rigs flagged, filtered and sorted by boardRows(). Support and
// admins read it (without join codes); builders and everyone else get 404. An order paid
// before build spaces existed has its space opened here.
import { and, desc, eq, inArray } from 'drizzle-orm'
import { idParams } from '../../../../shared/schemas/ids'
import { boardQuerySchema } from '../../../../shared/schemas/build'
import { boardRows, openedAtOf, rigState } from '../../../../shared/utils/build'
import type { BoardReply, BoardRig } from '../../../../shared/types/build'
import { joinCodes, rigs, tuningSheets } from '../../../database/schema'

export default defineEventHandler(async (event): Promise<BoardReply> => {
  const user = await requireUser(event)
  const { id } = paramsAs(event, idParams, 'That order')
  const query = queryAs(event, boardQuerySchema)
  const { order, role } = await loadSpaceFor(user, id, 'see', ['teacher', 'staff'])
  await ensureBuildSpace(order)
  const db = useDb()
  const now = new Date()
  const rigRows = await db.select().from(rigs).where(eq(rigs.orderId, id)).orderBy(rigs.serial)
  const ids = rigRows.map(r => r.id)
  const [steps, members, sheets, codes, space] = await Promise.all([
    stepsOf(db, ids),
    membersOf(db, id),
    db
      .select()
      .from(tuningSheets)
      .where(and(inArray(tuningSheets.rigId, ids), eq(tuningSheets.archived, false)))
      .orderBy(desc(tuningSheets.createdAt), desc(tuningSheets.id)),
    role === 'teacher'
      ? db.select().from(joinCodes).where(eq(joinCodes.orderId, id)).orderBy(desc(joinCodes.id))
      : Promise.resolve([]),
    spaceRefOf(db, order),
  ])
  const openedAt = openedAtOf(rigRows)
  const all: BoardRig[] = rigRows.map((rig) => {
    const mine = steps.filter(s => s.rigId === rig.id)
    const { progress, since, stuck } = rigState(
      mine,
      openedAt,
      { retired: !!rig.retiredAt, lastActivityAt: rig.lastActivityAt },
      now,
    )
    const latest = sheets.find(s => s.rigId === rig.id)
    return {
      id: rig.id,
      serial: rig.serial,
      name: rig.name ?? rig.serial,
      groupLabel: rig.groupLabel,
      retired: !!rig.retiredAt,
      builders: members.filter(m => m.rigId === rig.id),
      done: progress.done,
      total: progress.total,
      currentStep: progress.current,
      currentSince: since?.toISOString() ?? null,
      stuck,
      latestSheet: latest
        ? {
            id: latest.id,
            title: latest.title,
            createdAt: latest.createdAt.toISOString(),
            verdict: latest.verdict ?? null,
            stable: verdictNumbers(latest.results).stable,
          }
        : null,
      lastActivityAt: rig.lastActivityAt?.toISOString() ?? null,
    }
  })
  const groups = [...new Set(all.map(r => r.groupLabel).filter((g): g is string => !!g))]
  return {
    space,
    openedAt: openedAt.toISOString(),
    rigs: boardRows(all, query),
    totals: {
      rigs: all.length,
      finished: all.filter(r => r.currentStep === null).length,
      stuck: all.filter(r => r.stuck).length,
      retired: all.filter(r => r.retired).length,
    },
    groups: groups.sort((a, b) => a.localeCompare(b)),
    members,
    joinCodes: codes.map(joinCodeView),
    updatedAt: now.toISOString(),
  }
})
