// The teacher stops a join code at once (students who joined with it stay).
import { and, eq } from 'drizzle-orm'
import { joinCodeParams } from '../../../../../../shared/schemas/ids'
import type { JoinCodeView } from '../../../../../../shared/types/build'
import { joinCodes } from '../../../../../database/schema'

export default defineEventHandler(async (event): Promise<JoinCodeView> => {
  const user = await requireUser(event)
  const { id, codeId } = paramsAs(event, joinCodeParams, 'That join code')
  await loadSpaceFor(user, id, 'manage', ['teacher'])
  const mine = and(eq(joinCodes.id, codeId), eq(joinCodes.orderId, id))
  const [code] = await useDb().select().from(joinCodes).where(mine).limit(1)
  if (!code) throw notFound('That join code')
  if (!code.revokedAt)
    await useDb().update(joinCodes).set({ revokedAt: new Date() }).where(mine)
  const [now] = await useDb().select().from(joinCodes).where(mine).limit(1)
  return joinCodeView(now!)
})
