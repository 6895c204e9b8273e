// Revocable sessions. The sealed cookie carries a random id; the user_sessions row with its
// hash must exist and be unrevoked for the cookie to count, so signing out, a password change,
// a reset or "sign out everywhere" ends a session at once, wherever its cookie was copied to.
import { createHash, randomBytes } from 'node:crypto'
import type { H3Event } from 'h3'
import { and, desc, eq, isNull, ne } from 'drizzle-orm'
import type { SessionUser } from '../../shared/utils/roles'
import { userSessions, users } from '../database/schema'

const hashOf = (sid: string) => createHash('sha256').update(sid).digest('hex')
/** lastSeenAt is written at most this often per session, not on every request. */
const TOUCH_EVERY_MS = 5 * 60_000
/** A session unused for as long as the cookie lives (runtimeConfig.session.maxAge) is over. */
const idleLimitMs = () => Number(useRuntimeConfig().session.maxAge ?? 14 * 86_400) * 1000

/** "Firefox on Windows": the browser family and system only, never the full user-agent string. */
export function deviceLabel(userAgent: string | undefined): string {
  const ua = userAgent ?? ''
  const browser = /Edg\//.test(ua)
    ? 'Edge'
    : /Firefox\//.test(ua)
      ? 'Firefox'
      : /Chrom(e|ium)\//.test(ua)
        ? 'Chrome'
        : /Safari\//.test(ua)
          ? 'Safari'
          : 'A browser'
  const system = /Android/.test(ua)
    ? 'Android'
    : /iPhone|iPad/.test(ua)
      ? 'iOS'
      : /Windows/.test(ua)
        ? 'Windows'
        : /Mac OS X/.test(ua)
          ? 'macOS'
          : /CrOS/.test(ua)
            ? 'ChromeOS'
            : /Linux/.test(ua)
              ? 'Linux'
              : ''
  return system ? `${browser} on ${system}` : browser
}

/** Opens a new session for the user on this browser and sets its cookie. */
export async function startSession(event: H3Event, tx: DbOrTx, user: SessionUser) {
  const sid = randomBytes(32).toString('base64url')
  const device = deviceLabel(getRequestHeader(event, 'user-agent'))
  await tx.insert(userSessions).values({ userId: user.id, tokenHash: hashOf(sid), device })
  await tx.update(users).set({ lastSignInAt: new Date() }).where(eq(users.id, user.id))
  await forgetRowsBefore(
    userSessions,
    userSessions.lastSeenAt,
    new Date(Date.now() - idleLimitMs()),
    tx,
  )
  await replaceUserSession(event, { user, loggedInAt: Date.now(), secure: { sid } })
}

export interface LiveSession {
  sessionId: number
  row: typeof users.$inferSelect
}

/** Whether the request carries a session cookie at all. Without one there is nothing to read,
 *  and asking nuxt-auth-utils anyway would make (and seal, and set) an empty session. */
export function hasSessionCookie(event: H3Event): boolean {
  return /(^|;\s*)nuxt-session=/.test(getRequestHeader(event, 'cookie') ?? '')
}

/** The unrevoked session named by this request's cookie and its (enabled) user, or null. */
export async function liveSession(event: H3Event): Promise<LiveSession | null> {
  const cached = event.context.tiltwrightSession as LiveSession | null | undefined
  if (cached !== undefined) return cached
  if (!hasSessionCookie(event)) return (event.context.tiltwrightSession = null)
  const session = await getUserSession(event)
  const sid = session.secure?.sid
  let found: LiveSession | null = null
  if (sid) {
    const [hit] = await useDb()
      .select({ s: userSessions, u: users })
      .from(userSessions)
      .innerJoin(users, eq(users.id, userSessions.userId))
      .where(and(eq(userSessions.tokenHash, hashOf(sid)), isNull(userSessions.revokedAt)))
      .limit(1)
    if (hit && !hit.u.disabledAt && Date.now() - hit.s.lastSeenAt.getTime() < idleLimitMs()) {
      found = { sessionId: hit.s.id, row: hit.u }
      if (Date.now() - hit.s.lastSeenAt.getTime() > TOUCH_EVERY_MS) {
        await useDb()
          .update(userSessions)
          .set({ lastSeenAt: new Date() })
          .where(eq(userSessions.id, hit.s.id))
      }
    }
  }
  event.context.tiltwrightSession = found
  return found
}

/** Ends sessions of a user: all of them, or all but `exceptId` (the one making the change). */
export async function revokeSessions(tx: DbOrTx, userId: number, exceptId?: number) {
  const open = and(eq(userSessions.userId, userId), isNull(userSessions.revokedAt))
  await tx
    .update(userSessions)
    .set({ revokedAt: new Date() })
    .where(exceptId === undefined ? open : and(open, ne(userSessions.id, exceptId)))
}

/** Ends the session whose cookie carries `sid` (the 'clear' hook in server/plugins/sessions.ts). */
export async function revokeSessionBySid(sid: string) {
  await useDb()
    .update(userSessions)
    .set({ revokedAt: new Date() })
    .where(eq(userSessions.tokenHash, hashOf(sid)))
}

/** Ends this request's session (if any) and clears its cookie. */
export async function endSession(event: H3Event) {
  event.context.tiltwrightSession = null
  await clearUserSession(event)
}

export async function listSessions(userId: number, currentId: number) {
  const rows = await useDb()
    .select()
    .from(userSessions)
    .where(and(eq(userSessions.userId, userId), isNull(userSessions.revokedAt)))
    .orderBy(desc(userSessions.lastSeenAt))
    .limit(50)
  return rows.map(r => ({
    id: r.id,
    device: r.device,
    signedInAt: r.createdAt,
    lastSeenAt: r.lastSeenAt,
    current: r.id === currentId,
  }))
}
