// A teacher opens an account for their school. The account is signed in at once; the
// verification link arrives by e-mail.
import { eq } from 'drizzle-orm'
import { registerSchema } from '../../../shared/schemas/auth'
import { schools, users } from '../../database/schema'

export default defineEventHandler(async (event) => {
  const input = await readBodyAs(event, registerSchema)
  const passwordHash = await hashPassword(input.password)
  const db = useDb()
  let userId: number
  try {
    userId = await db.transaction(async (tx) => {
      const [school] = await tx.insert(schools).values(input.school).$returningId()
      const [user] = await tx.insert(users).values({ email: input.email, name: input.name, passwordHash, role: 'teacher', schoolId: school!.id }).$returningId()
      await sendVerification(tx, { id: user!.id, name: input.name, email: input.email })
      await audit(tx, { actorId: user!.id, action: 'account.registered', subjectType: 'user', subjectId: user!.id })
      return user!.id
    })
  } catch (e) {
    if (isDuplicateKey(e)) throw conflict('An account with this e-mail address already exists. Sign in, or reset your password.', 'email-taken', { email: 'An account with this e-mail address already exists.' })
    throw e
  }
  const [row] = await db.select().from(users).where(eq(users.id, userId)).limit(1)
  const user = toSessionUser(row!)
  await signIn(event, user)
  setResponseStatus(event, 201)
  return { user }
})
