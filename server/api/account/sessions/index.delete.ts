// "Sign out everywhere": ends every session of the account, this one included.
import type { OkReply } from '../../../../shared/types/common'

export default defineEventHandler(async (event): Promise<OkReply> => {
  const user = await requireUser(event)
  await transactionWithRetry(async (tx) => {
    await revokeSessions(tx, user.id)
    await audit(tx, {
      actorId: user.id,
      action: 'account.signed-out-everywhere',
      subjectType: 'user',
      subjectId: user.id,
    })
  })
  await endSession(event)
  return { ok: true }
})
