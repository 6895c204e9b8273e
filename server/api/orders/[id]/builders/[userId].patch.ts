// The teacher moves a builder to another rig of the order, or off every rig (null).
import { and, eq } from 'drizzle-orm'
import { builderParams } from '../../../../../shared/schemas/ids'
import { moveBuilderSchema } from '../../../../../shared/schemas/build'
import type { BuildMember } from '../../../../../shared/types/build'
import { buildMembers, rigs } from '../../../../database/schema'

export default defineEventHandler(async (event): Promise<BuildMember> => {
  const user = await requireUser(event)
  const { id, userId } = paramsAs(event, builderParams, 'That builder')
  const { rigId } = await readBodyAs(event, moveBuilderSchema)
  await loadSpaceFor(user, id, 'manage', ['teacher'])
  const db = useDb()
  await loadMember(db, id, userId)
  if (rigId !== null) {
    const [rig] = await db
      .select({ id: rigs.id })
      .from(rigs)
      .where(and(eq(rigs.id, rigId), eq(rigs.orderId, id)))
      .limit(1)
    if (!rig) throw invalid({ rigId: 'Choose a rig of this build space.' })
  }
  await db
    .update(buildMembers)
    .set({ rigId })
    .where(and(eq(buildMembers.orderId, id), eq(buildMembers.userId, userId)))
  return memberOf(await loadMember(db, id, userId))
})
