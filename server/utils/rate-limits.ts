// Per-address request limits kept in the database, so that every app instance behind a load
// balancer counts the same requests (a counter in process memory would give each instance an
// allowance of its own). A sliding-window estimate over two fixed windows: this window's
// count plus the previous window's, weighted by how much of it still lies within the last
// interval. The count is raised and read back in one transaction, so concurrent requests
// each see their own place in the count; on Galera two nodes raising one row answer a
// deadlock to the later commit, which transactionWithRetry() redoes.
import type { H3Event } from 'h3'
import { and, eq, inArray, lt, sql } from 'drizzle-orm'
import { rateLimitHits } from '../database/schema'

export interface RateLimit {
  /** The limit's name (a row key), e.g. 'planner'. */
  bucket: string
  /** Requests allowed per interval from one address. */
  limit: number
  intervalMs: number
}

/** The planner's computation is open to anyone: a limit keeps it from being a free CPU. */
export const PLANNER_RATE_LIMIT: RateLimit = {
  bucket: 'planner',
  limit: 240,
  intervalMs: 60_000,
}

let lastSweep = 0

/** Counts one request from the caller's address; answers 429 (with Retry-After) once the
 *  address has used its allowance. Sets the X-RateLimit-* headers either way. */
export async function takeRateLimit(event: H3Event, rule: RateLimit) {
  const address = requestAddress(event).slice(0, 64)
  const now = Date.now()
  const window = Math.floor(now / rule.intervalMs)
  const key = (w: number) =>
    and(
      eq(rateLimitHits.bucket, rule.bucket),
      eq(rateLimitHits.address, address),
      eq(rateLimitHits.window, w),
    )
  const db = useDb()
  // The row exists before the transaction, so the update takes a plain row lock (parallel
  // inserts of one new key inside transactions deadlock on gap locks).
  for (let i = 1; ; i++) {
    try {
      await db.insert(rateLimitHits).ignore().values({
        bucket: rule.bucket,
        address,
        window,
        expiresAt: new Date((window + 2) * rule.intervalMs),
      })
      break
    } catch (e) {
      if (i >= 5 || !isLockFailure(e)) throw e
    }
  }
  const rows = await transactionWithRetry(async (tx) => {
    await tx
      .update(rateLimitHits)
      .set({ hits: sql`${rateLimitHits.hits} + 1` })
      .where(key(window))
    return tx
      .select({ window: rateLimitHits.window, hits: rateLimitHits.hits })
      .from(rateLimitHits)
      .where(
        and(
          eq(rateLimitHits.bucket, rule.bucket),
          eq(rateLimitHits.address, address),
          inArray(rateLimitHits.window, [window - 1, window]),
        ),
      )
  })
  const current = rows.find(r => r.window === window)?.hits ?? 1
  const previous = rows.find(r => r.window === window - 1)?.hits ?? 0
  const elapsed = (now - window * rule.intervalMs) / rule.intervalMs
  const used = current + Math.floor(previous * (1 - elapsed))
  setResponseHeader(event, 'X-RateLimit-Limit', rule.limit)
  setResponseHeader(event, 'X-RateLimit-Remaining', Math.max(0, rule.limit - used))
  if (now - lastSweep > rule.intervalMs) {
    lastSweep = now
    void db
      .delete(rateLimitHits)
      .where(lt(rateLimitHits.expiresAt, new Date(now)))
      .catch(() => {
        /* the next sweep tries again */
      })
  }
  if (used > rule.limit) {
    const retryAfter = Math.ceil(((window + 1) * rule.intervalMs - now) / 1000)
    setResponseHeader(event, 'Retry-After', retryAfter)
    throw createError({
      statusCode: 429,
      statusMessage: 'Too Many Requests',
      message: `Too many requests from your address. Try again in ${retryAfter} s.`,
    })
  }
}
