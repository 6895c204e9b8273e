// Who is calling: the session's user, re-read from the database on every request together
// with the session row, so a revoked session, a disabled account or a changed role takes
// effect at once (server/utils/sessions.ts).
import type { H3Event } from 'h3'
import type { Role, SessionUser } from '../../shared/utils/roles'
import type { users } from '../database/schema'

export function toSessionUser(row: typeof users.$inferSelect): SessionUser {
  return {
    id: row.id,
    email: row.email,
    username: row.username,
    name: row.name,
    role: row.role,
    schoolId: row.schoolId ?? null,
    verified: !!row.verifiedAt,
  }
}

export const signedOut = () =>
  createError({
    statusCode: 401,
    statusMessage: 'Unauthorized',
    message: 'Please sign in again.',
    data: { code: 'signed-out' },
  })

/** 401 when nobody is signed in, or the session was ended, or the account has gone. */
export async function requireUser(event: H3Event): Promise<SessionUser> {
  const live = await liveSession(event)
  if (!live) {
    const { user } = await getUserSession(event)
    if (user) await clearUserSession(event)
    throw signedOut()
  }
  return toSessionUser(live.row)
}

/** The id of the caller's session row (after requireUser). */
export async function currentSessionId(event: H3Event): Promise<number> {
  const live = await liveSession(event)
  if (!live) throw signedOut()
  return live.sessionId
}

/** 401 when signed out, 403 when the role is not one of `roles`. */
export async function requireRole(event: H3Event, ...roles: Role[]): Promise<SessionUser> {
  const user = await requireUser(event)
  if (!roles.includes(user.role)) throw forbidden()
  return user
}

/** Keeps the cookie's copy of the user (name, verified flag) in step without a new session. */
export async function refreshSessionUser(event: H3Event, user: SessionUser) {
  const { loggedInAt } = await getUserSession(event)
  await setUserSession(event, { user, loggedInAt: loggedInAt ?? Date.now() })
}
