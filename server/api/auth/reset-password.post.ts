// A reset link sets a new password once. Using it spends every other reset link of the
// account, ends every session of the account, clears its sign-in throttles (the owner's way
// back in) and signs this browser in with a new session.
import { eq } from 'drizzle-orm'
import { resetPasswordSchema } from '../../../shared/schemas/auth'
import { users } from '../../database/schema'
import { passwordChangedMail } from '../../emails/account'
import type { OkReply } from '../../../shared/types/common'

export default defineEventHandler(async (event): Promise<OkReply> => {
  const { token, password } = await readBodyAs(event, resetPasswordSchema)
  const passwordHash = await hashPassword(password)
  const done = await transactionWithRetry(async (tx) => {
    const id = await consumeToken(tx, token, 'reset-password')
    if (id === null) return false
    // Reading the link proves the address, so a reset also verifies it.
    await tx.update(users).set({ passwordHash, verifiedAt: new Date() }).where(eq(users.id, id))
    const [u] = await tx.select().from(users).where(eq(users.id, id)).limit(1)
    await spendResetLinks(tx, id)
    await revokeSessions(tx, id)
    // Reset links go to e-mail accounts only (a builder's teacher resets theirs).
    const to = mailAddressOf(u!)
    await clearSignInThrottles(tx, to)
    await enqueueMail(tx, 'password-changed', to, passwordChangedMail(u!.name))
    await audit(tx, {
      actorId: id,
      action: 'account.password-reset',
      subjectType: 'user',
      subjectId: id,
    })
    await startSession(event, tx, toSessionUser(u!))
    return true
  })
  if (!done)
    throw badRequest(
      'This reset link has expired or was already used. Ask for a new one.',
      'token-invalid',
    )
  return { ok: true }
})
