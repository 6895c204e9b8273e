// Always answers the same, whether or not the address has an account, so the form
// cannot be used to find out who has one.
import { forgotPasswordSchema } from '../../../shared/schemas/auth'

export default defineEventHandler(async (event) => {
  const { email } = await readBodyAs(event, forgotPasswordSchema)
  await useDb().transaction(async (tx) => {
    const user = await findUserByEmail(tx, email)
    if (user && !user.disabledAt) await sendPasswordReset(tx, user)
  })
  setResponseStatus(event, 202)
  return { message: 'If an account uses that address, a reset link is on its way. It expires in 1 hour.' }
})
