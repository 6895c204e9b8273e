// The teacher makes a join code for the class: random, from the alphabet without look-alikes,
// lasting JOIN_CODE_DEFAULT_HOURS unless they say otherwise, optionally limited in uses.
import { eq } from 'drizzle-orm'
import { idParams } from '../../../../../shared/schemas/ids'
import { createJoinCodeSchema } from '../../../../../shared/schemas/build'
import { JOIN_CODE_DEFAULT_HOURS } from '../../../../../shared/utils/build'
import type { JoinCodeCreated } from '../../../../../shared/types/build'
import { joinCodes } from '../../../../database/schema'

export default defineEventHandler(async (event): Promise<JoinCodeCreated> => {
  const user = await requireUser(event)
  const { id } = paramsAs(event, idParams, 'That order')
  const input = await readBodyAs(event, createJoinCodeSchema)
  const { order } = await loadSpaceFor(user, id, 'manage', ['teacher'])
  await ensureBuildSpace(order)
  const hours = input.expiresInHours ?? JOIN_CODE_DEFAULT_HOURS
  const expiresAt = new Date(Date.now() + hours * 3600_000)
  // A clash with an existing code (29^8 of them) is all but impossible; draw again if so.
  for (let attempt = 0; ; attempt++) {
    const code = newJoinCode()
    try {
      const [row] = await useDb()
        .insert(joinCodes)
        .values({
          orderId: id,
          code,
          expiresAt,
          maxUses: input.maxUses ?? null,
          createdById: user.id,
        })
        .$returningId()
      const [made] = await useDb().select().from(joinCodes).where(eq(joinCodes.id, row!.id))
      setResponseStatus(event, 201)
      return { code: made!.code, expiresAt: made!.expiresAt.toISOString() }
    } catch (e) {
      if (!isDuplicateKey(e) || attempt >= 4) throw e
    }
  }
})
