import { eq } from 'drizzle-orm'
import { verifyEmailSchema } from '../../../shared/schemas/auth'
import { users } from '../../database/schema'
import type { VerifiedReply } from '../../../shared/types/account'

export default defineEventHandler(async (event): Promise<VerifiedReply> => {
  const { token } = await readBodyAs(event, verifyEmailSchema)
  const userId = await transactionWithRetry(async (tx) => {
    const id = await consumeToken(tx, token, 'verify-email')
    if (id === null) return null
    await tx.update(users).set({ verifiedAt: new Date() }).where(eq(users.id, id))
    await audit(tx, { actorId: id, action: 'account.verified', subjectType: 'user', subjectId: id })
    return id
  })
  if (userId === null) {
    throw badRequest(
      'This confirmation link has expired or was already used. Sign in and ask for a new one.',
      'token-invalid',
    )
  }
  // Every other signed-in tab and device reads the new state on its next session fetch.
  const live = await liveSession(event)
  if (live?.row.id === userId)
    await refreshSessionUser(event, { ...toSessionUser(live.row), verified: true })
  return { verified: true }
})
