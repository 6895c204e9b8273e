import { eq } from 'drizzle-orm'
import { verifyEmailSchema } from '../../../shared/schemas/auth'
import { users } from '../../database/schema'

export default defineEventHandler(async (event) => {
  const { token } = await readBodyAs(event, verifyEmailSchema)
  const db = useDb()
  const userId = await db.transaction(async (tx) => {
    const id = await consumeToken(tx, token, 'verify-email')
    if (id === null) return null
    await tx.update(users).set({ verifiedAt: new Date() }).where(eq(users.id, id))
    await audit(tx, { actorId: id, action: 'account.verified', subjectType: 'user', subjectId: id })
    return id
  })
  if (userId === null) throw badRequest('This confirmation link has expired or was already used. Sign in and ask for a new one.', 'token-invalid')
  const [row] = await db.select().from(users).where(eq(users.id, userId)).limit(1)
  const { user: current } = await getUserSession(event)
  if (current?.id === userId) await signIn(event, toSessionUser(row!))
  return { verified: true }
})
