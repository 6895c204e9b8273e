// Caps on account mail per recipient and hour, so nobody can flood an inbox through
// Tiltwright's forms. The hour's counter row is created first on its own (INSERT IGNORE), then
// incremented in the mail's own transaction, which holds that row's lock until commit:
// parallel requests count one after another, without the gap locks of an upsert.
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

/** Counts one mail of `kind` to `recipient`; false when the hour's cap is already reached. */
export async function takeMailQuota(tx: DbOrTx, kind: LimitedMail, recipient: string): Promise<boolean> {
  const hourStart = new Date(Math.floor(Date.now() / 3600_000) * 3600_000)
  const key = and(eq(mailQuota.recipient, recipient), eq(mailQuota.kind, kind), eq(mailQuota.hourStart, hourStart))
  await forgetRowsBefore(mailQuota, mailQuota.hourStart, new Date(Date.now() - 24 * 3600_000))
  await useDb().insert(mailQuota).ignore().values({ recipient, kind, hourStart, sent: 0 })
  await tx.update(mailQuota).set({ sent: sql`${mailQuota.sent} + 1` }).where(key)
  const [row] = await tx.select({ sent: mailQuota.sent }).from(mailQuota).where(key)
  return (row?.sent ?? 0) <= MAIL_LIMITS[kind]
}
