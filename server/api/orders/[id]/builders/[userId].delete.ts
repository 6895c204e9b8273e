// The teacher removes a builder from the build space. They lose its rigs at once; an account
// left in no build space is disabled and signed out everywhere.
import { and, eq } from 'drizzle-orm'
import { builderParams } from '../../../../../shared/schemas/ids'
import { buildMembers, users } from '../../../../database/schema'

export default defineEventHandler(async (event) => {
  const teacher = await requireUser(event)
  const { id, userId } = paramsAs(event, builderParams, 'That builder')
  await loadSpaceFor(teacher, id, 'manage', ['teacher'])
  await loadMember(useDb(), id, userId)
  await transactionWithRetry(async (tx) => {
    await tx
      .delete(buildMembers)
      .where(and(eq(buildMembers.orderId, id), eq(buildMembers.userId, userId)))
    const [other] = await tx
      .select({ id: buildMembers.id })
      .from(buildMembers)
      .where(eq(buildMembers.userId, userId))
      .limit(1)
    if (!other) {
      await tx
        .update(users)
        .set({ disabledAt: new Date() })
        .where(and(eq(users.id, userId), eq(users.role, 'builder')))
      await revokeSessions(tx, userId)
    }
    await audit(tx, {
      actorId: teacher.id,
      action: 'build.builder-removed',
      subjectType: 'user',
      subjectId: userId,
    })
  })
  return sendNoContent(event)
})
