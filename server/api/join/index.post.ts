// A student joins a build space with a code and becomes a builder: a display name, a username
// and a password, no e-mail address. The code's row is locked while its use is counted, so a
// code with one use left admits exactly one student however many join at once.
import { eq } from 'drizzle-orm'
import { joinSchema } from '../../../shared/schemas/build'
import type { UserReply } from '../../../shared/types/account'
import { buildMembers, joinCodes, users } from '../../database/schema'

export const USERNAME_TAKEN = 'That username is taken: choose another.'

export default defineEventHandler(async (event): Promise<UserReply> => {
  const input = await readBodyAs(event, joinSchema)
  const passwordHash = await hashPassword(input.password)
  const user = await withJoinThrottle(event, () =>
    uniqueOr409('username', USERNAME_TAKEN, () =>
      transactionWithRetry(async (tx) => {
        const { c, order } = await liveJoinCode(tx, input.code, true)
        await tx.update(joinCodes).set({ uses: c.uses + 1 }).where(eq(joinCodes.id, c.id))
        const [made] = await tx
          .insert(users)
          .values({
            email: null,
            username: input.username,
            name: input.name,
            passwordHash,
            role: 'builder',
            schoolId: order.schoolId,
            verifiedAt: new Date(),
          })
          .$returningId()
        await tx
          .insert(buildMembers)
          .values({ orderId: order.id, userId: made!.id, joinCodeId: c.id })
        const [row] = await tx.select().from(users).where(eq(users.id, made!.id)).limit(1)
        await audit(tx, {
          actorId: made!.id,
          action: 'build.joined',
          subjectType: 'order',
          subjectId: order.id,
        })
        const user = toSessionUser(row!)
        await startSession(event, tx, user)
        return user
      }),
    ),
  )
  setResponseStatus(event, 201)
  return { user }
})
