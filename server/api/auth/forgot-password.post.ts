// Always answers the same, and no sooner than a fixed time, whether or not the address has
// an account, so neither the words nor the timing tell who has one.
import { forgotPasswordSchema } from '../../../shared/schemas/auth'
import { hoursInWords, LINK_LIFETIME_HOURS } from '../../../shared/utils/lifetimes'
import type { MessageReply } from '../../../shared/types/common'

/** Longer than the slowest known-address path (a locked row, the quota, a token and a mail). */
export const FORGOT_PASSWORD_FLOOR_MS = 600

export default defineEventHandler(async (event): Promise<MessageReply> => {
  const { email } = await readBodyAs(event, forgotPasswordSchema)
  await withTimingFloor(FORGOT_PASSWORD_FLOOR_MS, () =>
    transactionWithRetry(async (tx) => {
      const user = await findUserByEmail(tx, email)
      if (user && !user.disabledAt) await sendPasswordReset(tx, user)
    }),
  )
  setResponseStatus(event, 202)
  return {
    message: 'If an account uses that address, a reset link is on its way. It expires in '
      + `${hoursInWords(LINK_LIFETIME_HOURS.reset)}.`,
  }
})
