// The teacher renames, regroups, retires or brings back a rig ("" clears a name or a group).
import { eq } from 'drizzle-orm'
import { idParams } from '../../../shared/schemas/ids'
import { updateRigSchema } from '../../../shared/schemas/build'
import type { RigView } from '../../../shared/types/build'
import { rigs } from '../../database/schema'

export default defineEventHandler(async (event): Promise<RigView> => {
  const user = await requireUser(event)
  const { id } = paramsAs(event, idParams, 'That rig')
  const input = await readBodyAs(event, updateRigSchema)
  return transactionWithRetry(async (tx) => {
    const { rig, role } = await lockRigFor(tx, user, id, 'manage')
    const retiredAt = input.retired === undefined
      ? undefined
      : input.retired ? (rig.retiredAt ?? new Date()) : null
    await tx
      .update(rigs)
      .set({
        ...(input.name !== undefined ? { name: input.name || null } : {}),
        ...(input.groupLabel !== undefined ? { groupLabel: input.groupLabel || null } : {}),
        ...(retiredAt !== undefined ? { retiredAt } : {}),
      })
      .where(eq(rigs.id, id))
    return rigView(tx, id, role)
  })
})
