// The teacher gives a builder a new password (builders have no e-mail to reset one by). It is
// shown once; the builder's sessions end, so whoever knew the old one is signed out.
import { eq } from 'drizzle-orm'
import { builderParams } from '../../../../../../shared/schemas/ids'
import type { BuilderPasswordReply } from '../../../../../../shared/types/build'
import { users } from '../../../../../database/schema'

export default defineEventHandler(async (event): Promise<BuilderPasswordReply> => {
  const teacher = await requireUser(event)
  const { id, userId } = paramsAs(event, builderParams, 'That builder')
  await loadSpaceFor(teacher, id, 'manage', ['teacher'])
  const member = await loadMember(useDb(), id, userId)
  const password = readablePassword()
  const passwordHash = await hashPassword(password)
  await transactionWithRetry(async (tx) => {
    await tx.update(users).set({ passwordHash }).where(eq(users.id, userId))
    await revokeSessions(tx, userId)
    if (member.username) await clearSignInThrottles(tx, member.username)
    await audit(tx, {
      actorId: teacher.id,
      action: 'build.builder-password-reset',
      subjectType: 'user',
      subjectId: userId,
    })
  })
  return { username: member.username, password }
})
