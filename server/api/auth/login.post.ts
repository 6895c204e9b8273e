import { loginSchema } from '../../../shared/schemas/auth'

export default defineEventHandler(async (event) => {
  const { email, password } = await readBodyAs(event, loginSchema)
  const address = requestAddress(event)
  try {
    await assertSignInAllowed(email, address)
  } catch (e: any) {
    if (e?.data?.retryAfterSeconds) setResponseHeader(event, 'Retry-After', Number(e.data.retryAfterSeconds))
    throw e
  }
  const row = await findUserByEmail(useDb(), email)
  // Verify against a dummy hash when there is no such account, so timing does not tell.
  const ok = await verifyPassword(row?.passwordHash ?? await dummyPasswordHash(), password)
  if (!row || !ok || row.disabledAt) {
    await recordSignInFailure(email, address)
    throw createError({ statusCode: 401, statusMessage: 'Unauthorized', message: 'That e-mail and password do not match an account.', data: { code: 'bad-credentials', fields: { password: 'That e-mail and password do not match an account.' } } })
  }
  await clearSignInFailures(email)
  const user = toSessionUser(row)
  await signIn(event, user)
  return { user }
})

