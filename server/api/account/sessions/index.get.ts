// The browsers signed in to this account, newest activity first.
import type { SessionsReply } from '../../../../shared/types/account'

export default defineEventHandler(async (event): Promise<SessionsReply> => {
  const user = await requireUser(event)
  const data = await listSessions(user.id, await currentSessionId(event))
  return {
    data: data.map(s => ({
      ...s,
      signedInAt: s.signedInAt.toISOString(),
      lastSeenAt: s.lastSeenAt.toISOString(),
    })),
  }
})
