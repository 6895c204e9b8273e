// The rig as measured, in the planner's SI units: the Gain Planner opens with them (?rig=).
import { eq } from 'drizzle-orm'
import { idParams } from '../../../../shared/schemas/ids'
import { rigDimensionsSchema } from '../../../../shared/schemas/build'
import type { RigView } from '../../../../shared/types/build'
import { rigs } from '../../../database/schema'

export default defineEventHandler(async (event): Promise<RigView> => {
  const user = await requireUser(event)
  const { id } = paramsAs(event, idParams, 'That rig')
  const { rig } = await readBodyAs(event, rigDimensionsSchema)
  return transactionWithRetry(async (tx) => {
    const { role } = await lockRigFor(tx, user, id, 'work')
    const now = new Date()
    await tx
      .update(rigs)
      .set({ dimensions: rig, dimensionsUpdatedAt: now, lastActivityAt: now })
      .where(eq(rigs.id, id))
    return rigView(tx, id, role)
  })
})
