// Slows down password guessing: too many failures for one account, or from one address,
// inside the window answer 429 until the oldest failure ages out.
import type { H3Event } from 'h3'
import { and, count, eq, gt, lt, min } from 'drizzle-orm'
import { signInFailures } from '../database/schema'

export const THROTTLE = {
  windowMs: 15 * 60_000,
  perAccount: 5,
  perAddress: 40,
}

export function requestAddress(event: H3Event): string {
  return (getRequestIP(event, { xForwardedFor: false }) ?? 'unknown').slice(0, 64)
}

export async function assertSignInAllowed(email: string, address: string) {
  const db = useDb()
  const since = new Date(Date.now() - THROTTLE.windowMs)
  for (const [column, value, limit] of [[signInFailures.email, email, THROTTLE.perAccount], [signInFailures.address, address, THROTTLE.perAddress]] as const) {
    const [row] = await db.select({ n: count(), oldest: min(signInFailures.createdAt) }).from(signInFailures)
      .where(and(eq(column, value), gt(signInFailures.createdAt, since)))
    if (row && row.n >= limit) {
      const oldest = row.oldest ? new Date(row.oldest).getTime() : Date.now()
      const retry = Math.max(1, Math.ceil((oldest + THROTTLE.windowMs - Date.now()) / 1000))
      throw tooManyRequests(`Too many failed sign-ins. Try again in ${Math.ceil(retry / 60)} minute(s), or reset your password.`, retry)
    }
  }
}

export async function recordSignInFailure(email: string, address: string) {
  const db = useDb()
  await db.insert(signInFailures).values({ email, address })
  await db.delete(signInFailures).where(lt(signInFailures.createdAt, new Date(Date.now() - 24 * 3600_000)))
}

export async function clearSignInFailures(email: string) {
  await useDb().delete(signInFailures).where(eq(signInFailures.email, email))
}
