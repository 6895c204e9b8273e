// Slows down password guessing per account *and* address: a school behind one address is not
// locked out by someone else's typos, and nobody can lock an account for its owner elsewhere.
// Each attempt is counted before its password is checked, under a row lock, so a parallel
// burst gets at most `freeAttempts` checks; after that each further attempt waits longer
// (doubling up to `maxDelayMs`). A success or a password reset clears the count.
import type { H3Event } from 'h3'
import { and, eq } from 'drizzle-orm'
import { clientAddress, parseTrustedProxies } from '../../shared/utils/client-address'
import { delayAfter, THROTTLE, type ThrottleRules } from '../../shared/utils/sign-in-rules'
import { signInThrottles } from '../database/schema'

/**
 * The client's address: X-Forwarded-For only from a proxy named in runtimeConfig.trustedProxies.
 */
export function requestAddress(event: H3Event): string {
  const trusted = parseTrustedProxies(String(useRuntimeConfig().trustedProxies ?? ''))
  return clientAddress(
    event.node.req.socket.remoteAddress,
    getRequestHeader(event, 'x-forwarded-for'),
    trusted,
  )
}

const pair = (email: string, address: string) =>
  and(eq(signInThrottles.email, email), eq(signInThrottles.address, address))

const signInWait = (when: string) =>
  `Too many failed sign-ins from here. Try again in ${when}, or reset your password.`

/**
 * Counts one attempt for the pair, or answers 429 (with Retry-After) while it must wait. `email`
 * is the sign-in name (an address or a username), or a fixed key such as JOIN_CODE_KEY for
 * guesses that belong to no account.
 */
export async function claimSignInAttempt(
  event: H3Event,
  email: string,
  address: string,
  rules: ThrottleRules = THROTTLE,
  waitMessage: (when: string) => string = signInWait,
) {
  const db = useDb()
  // The row exists before the locking read, so the lock is a plain row lock (no gap-lock
  // deadlocks).
  await db.insert(signInThrottles).ignore().values({ email, address })
  const waitMs = await transactionWithRetry(async (tx) => {
    const [row] = await tx.select().from(signInThrottles).where(pair(email, address)).for('update')
    const now = Date.now()
    const wait = row ? row.nextAttemptAt.getTime() - now : 0
    if (wait > 0) return wait
    const fresh = !row || now - row.updatedAt.getTime() > rules.forgetAfterMs
    const attempts = (fresh ? 0 : row.attempts) + 1
    const nextAttemptAt = new Date(now + delayAfter(attempts, rules))
    await tx
      .update(signInThrottles)
      .set({ attempts, nextAttemptAt, updatedAt: new Date(now) })
      .where(pair(email, address))
    return 0
  })
  if (waitMs > 0) {
    const retry = Math.ceil(waitMs / 1000)
    setResponseHeader(event, 'Retry-After', retry)
    const when = retry < 90 ? `${retry} seconds` : `${Math.ceil(retry / 60)} minutes`
    throw tooManyRequests(waitMessage(when), retry)
  }
}

/** An attempt that turned out right is given back (join codes: only wrong ones count). */
export async function refundSignInAttempt(
  email: string,
  address: string,
  rules: ThrottleRules = THROTTLE,
) {
  await transactionWithRetry(async (tx) => {
    const [row] = await tx.select().from(signInThrottles).where(pair(email, address)).for('update')
    if (!row || row.attempts === 0) return
    const attempts = row.attempts - 1
    await tx
      .update(signInThrottles)
      .set({ attempts, nextAttemptAt: new Date(Date.now() + delayAfter(attempts, rules)) })
      .where(pair(email, address))
  })
}

/** The right password: the pair starts afresh. */
export async function clearSignInAttempts(email: string, address: string) {
  await useDb().delete(signInThrottles).where(pair(email, address))
  await forgetRowsBefore(
    signInThrottles,
    signInThrottles.updatedAt,
    new Date(Date.now() - THROTTLE.forgetAfterMs),
  )
}

/** A password reset lets the owner in from anywhere. */
export async function clearSignInThrottles(tx: DbOrTx, email: string) {
  await tx.delete(signInThrottles).where(eq(signInThrottles.email, email))
}
