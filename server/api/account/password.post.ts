// A new password ends every other session of the account; this one stays signed in.
import { eq } from 'drizzle-orm'
import { changePasswordSchema } from '../../../shared/schemas/auth'
import { users } from '../../database/schema'
import { passwordChangedMail } from '../../emails/account'
import type { OkReply } from '../../../shared/types/common'

export default defineEventHandler(async (event): Promise<OkReply> => {
  const user = await requireUser(event)
  const sessionId = await currentSessionId(event)
  const { currentPassword, newPassword } = await readBodyAs(event, changePasswordSchema)
  const db = useDb()
  const [row] = await db.select().from(users).where(eq(users.id, user.id)).limit(1)
  if (!row || !(await verifyPassword(row.passwordHash, currentPassword))) {
    throw invalid({ currentPassword: 'That is not your current password.' })
  }
  const passwordHash = await hashPassword(newPassword)
  await transactionWithRetry(async (tx) => {
    await tx.update(users).set({ passwordHash }).where(eq(users.id, user.id))
    await revokeSessions(tx, user.id, sessionId)
    await spendResetLinks(tx, user.id)
    // A builder who joined with a code has no address: nothing is mailed to students.
    if (user.email)
      await enqueueMail(tx, 'password-changed', user.email, passwordChangedMail(user.name))
    await audit(tx, {
      actorId: user.id,
      action: 'account.password-changed',
      subjectType: 'user',
      subjectId: user.id,
    })
  })
  return { ok: true }
})
