// Ends this browser's session: its row is revoked, so a copy of the cookie stops working too.
import type { OkReply } from '../../../shared/types/common'

export default defineEventHandler(async (event): Promise<OkReply> => {
  await endSession(event)
  return { ok: true }
})
