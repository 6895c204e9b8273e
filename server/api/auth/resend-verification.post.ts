// "Send it again" from the e-mail banner: sends only while the address is unconfirmed, and
// says honestly whether a mail went out (the hourly cap may hold it back).
import type { ResendVerificationReply } from '../../../shared/types/account'

export default defineEventHandler(async (event): Promise<ResendVerificationReply> => {
  const user = await requireUser(event)
  if (user.verified) return { sent: false, verified: true }
  const sent = await transactionWithRetry(tx => sendVerification(tx, user))
  return { sent, verified: false }
})
