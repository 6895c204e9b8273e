// Caps on account mail per recipient and hour, so nobody can flood an inbox through
// Tiltwright's forms. Counted with an upsert in the mail's own transaction (one connection: a
// second one from inside a transaction could starve the pool under a flood). The caller holds
// the recipient's user row locked (or has just inserted it), so two counts for one recipient
// never race on the same new key; the counter row then stays locked until commit.
import { and, eq, sql } from 'drizzle-orm'
import { mailQuota } from '../database/schema'

/** Mails of each kind one recipient may get per clock hour. */
export const MAIL_LIMITS = {
  'verify-email': 3,
  'reset-password': 3,
  'staff-invitation': 3,
  'account-exists': 2,
} as const

export type LimitedMail = keyof typeof MAIL_LIMITS

/** Counts one mail of `kind` to `recipient`; false when the hour's cap is already reached.
 *  Call it with the recipient's user row locked in `tx` (lockUser) or just inserted. */
export async function takeMailQuota(
  tx: DbOrTx,
  kind: LimitedMail,
  recipient: string,
): Promise<boolean> {
  const hourStart = new Date(Math.floor(Date.now() / 3600_000) * 3600_000)
  const key = and(
    eq(mailQuota.recipient, recipient),
    eq(mailQuota.kind, kind),
    eq(mailQuota.hourStart, hourStart),
  )
  await tx
    .insert(mailQuota)
    .values({ recipient, kind, hourStart, sent: 1 })
    .onDuplicateKeyUpdate({ set: { sent: sql`${mailQuota.sent} + 1` } })
  // Yesterday's counters go in the background; this transaction does not wait for them.
  void forgetRowsBefore(mailQuota, mailQuota.hourStart, new Date(Date.now() - 24 * 3600_000)).catch(
    () => {},
  )
  const [row] = await tx.select({ sent: mailQuota.sent }).from(mailQuota).where(key)
  return (row?.sent ?? 0) <= MAIL_LIMITS[kind]
}
