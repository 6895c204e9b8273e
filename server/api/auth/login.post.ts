// Teachers and staff sign in with their e-mail address, builders with their username. The
// throttle counts per sign-in name and address either way.
import { loginSchema } from '../../../shared/schemas/auth'
import type { UserReply } from '../../../shared/types/account'

export const BAD_CREDENTIALS = 'That sign-in name and password do not match an account.'

export default defineEventHandler(async (event): Promise<UserReply> => {
  const { email, username, password } = await readBodyAs(event, loginSchema)
  // The schema asks for one of the two; an e-mail address wins when both are sent.
  const name = email ?? username!
  const address = requestAddress(event)
  await claimSignInAttempt(event, name, address)
  const row = email
    ? await findUserByEmail(useDb(), email)
    : await findUserByUsername(useDb(), name)
  // Verify against a dummy hash when there is no such account, so timing does not tell.
  const ok = await verifyPassword(row?.passwordHash ?? (await dummyPasswordHash()), password)
  if (!row || !ok || row.disabledAt) {
    throw createError({
      statusCode: 401,
      statusMessage: 'Unauthorized',
      message: BAD_CREDENTIALS,
      data: { code: 'bad-credentials', fields: { password: BAD_CREDENTIALS } },
    })
  }
  await clearSignInAttempts(name, address)
  const user = toSessionUser(row)
  await startSession(event, useDb(), user)
  return { user }
})
