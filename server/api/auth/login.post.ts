import { loginSchema } from '../../../shared/schemas/auth'
import type { UserReply } from '../../../shared/types/account'

export default defineEventHandler(async (event): Promise<UserReply> => {
  const { email, password } = await readBodyAs(event, loginSchema)
  const address = requestAddress(event)
  await claimSignInAttempt(event, email, address)
  const row = await findUserByEmail(useDb(), email)
  // Verify against a dummy hash when there is no such account, so timing does not tell.
  const ok = await verifyPassword(row?.passwordHash ?? (await dummyPasswordHash()), password)
  if (!row || !ok || row.disabledAt) {
    const message = 'That e-mail and password do not match an account.'
    throw createError({
      statusCode: 401,
      statusMessage: 'Unauthorized',
      message,
      data: { code: 'bad-credentials', fields: { password: message } },
    })
  }
  await clearSignInAttempts(email, address)
  const user = toSessionUser(row)
  await startSession(event, useDb(), user)
  return { user }
})
