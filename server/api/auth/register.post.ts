// A teacher opens an account for their school. The answer is the same whether or not the
// address already has an account (its owner gets a "you already have an account" mail
// instead), so the form cannot be used to find out who has one. The page then signs in with
// the password just chosen; the confirmation link arrives by e-mail.
import { registerSchema } from '../../../shared/schemas/auth'
import { schools, users } from '../../database/schema'
import type { MessageReply } from '../../../shared/types/common'

export const REGISTERED_MESSAGE
  = 'Thank you. We sent a message to that address: open it to confirm the address.'

export default defineEventHandler(async (event): Promise<MessageReply> => {
  const input = await readBodyAs(event, registerSchema)
  // Hash before looking, so a known address costs the same time as a new one.
  const passwordHash = await hashPassword(input.password)
  await transactionWithRetry(async (tx) => {
    const known = await findUserByEmail(tx, input.email)
    if (known) {
      await sendAccountExists(tx, known)
      return
    }
    const [school] = await tx.insert(schools).values(input.school).$returningId()
    const [user] = await tx
      .insert(users)
      .values({
        email: input.email,
        name: input.name,
        passwordHash,
        role: 'teacher',
        schoolId: school!.id,
      })
      .$returningId()
    await sendVerification(tx, { id: user!.id, name: input.name, email: input.email })
    await audit(tx, {
      actorId: user!.id,
      action: 'account.registered',
      subjectType: 'user',
      subjectId: user!.id,
    })
  })
    .catch((e) => {
      // Two registrations of one new address at once: the loser is told nothing different either.
      if (!isDuplicateKey(e)) throw e
    })
  setResponseStatus(event, 201)
  return { message: REGISTERED_MESSAGE }
})
