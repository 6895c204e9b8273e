import { eq } from 'drizzle-orm'
import { resetPasswordSchema } from '../../../shared/schemas/auth'
import { users } from '../../database/schema'
import { passwordChangedMail } from '../../emails/account'

export default defineEventHandler(async (event) => {
  const { token, password } = await readBodyAs(event, resetPasswordSchema)
  const passwordHash = await hashPassword(password)
  const db = useDb()
  const row = await db.transaction(async (tx) => {
    const id = await consumeToken(tx, token, 'reset-password')
    if (id === null) return null
    // Reading the link proves the address, so a reset also verifies it.
    await tx.update(users).set({ passwordHash, verifiedAt: new Date() }).where(eq(users.id, id))
    const [u] = await tx.select().from(users).where(eq(users.id, id)).limit(1)
    await enqueueMail(tx, 'password-changed', u!.email, passwordChangedMail(u!.name))
    await audit(tx, { actorId: id, action: 'account.password-reset', subjectType: 'user', subjectId: id })
    return u!
  })
  if (!row) throw badRequest('This reset link has expired or was already used. Ask for a new one.', 'token-invalid')
  await clearSignInFailures(row.email)
  await signIn(event, toSessionUser(row))
  return { ok: true }
})
