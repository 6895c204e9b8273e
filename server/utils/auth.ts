// Who is calling: the session's user, re-read from the database so that a disabled
// account or a changed role takes effect at once.
import type { H3Event } from 'h3'
import { eq } from 'drizzle-orm'
import type { Role, SessionUser } from '../../shared/utils/roles'
import { users } from '../database/schema'

export function toSessionUser(row: typeof users.$inferSelect): SessionUser {
  return { id: row.id, email: row.email, name: row.name, role: row.role, schoolId: row.schoolId ?? null, verified: !!row.verifiedAt }
}

/** 401 when nobody is signed in (or the account has gone); the current user otherwise. */
export async function requireUser(event: H3Event): Promise<SessionUser> {
  const session = await requireUserSession(event)
  const cached = event.context.tiltwrightUser as SessionUser | undefined
  if (cached) return cached
  const [row] = await useDb().select().from(users).where(eq(users.id, session.user.id)).limit(1)
  if (!row || row.disabledAt) {
    await clearUserSession(event)
    throw createError({ statusCode: 401, statusMessage: 'Unauthorized', message: 'Please sign in again.', data: { code: 'signed-out' } })
  }
  const user = toSessionUser(row)
  event.context.tiltwrightUser = user
  return user
}

/** 401 when signed out, 403 when the role is not one of `roles`. */
export async function requireRole(event: H3Event, ...roles: Role[]): Promise<SessionUser> {
  const user = await requireUser(event)
  if (!roles.includes(user.role)) throw forbidden()
  return user
}

export async function signIn(event: H3Event, user: SessionUser) {
  await replaceUserSession(event, { user, loggedInAt: Date.now() })
}
