// Account queries and mails that several auth routes share.
import { and, eq, gt, isNull } from 'drizzle-orm'
import { authTokens, users } from '../database/schema'
import { accountExistsMail, passwordResetMail, verificationMail } from '../emails/account'

/** A second reset mail within this time of the last is not sent. */
export const RESET_RESEND_GAP_MS = 60_000

export async function findUserByEmail(tx: DbOrTx, email: string) {
  const [row] = await tx.select().from(users).where(eq(users.email, email)).limit(1)
  return row
}

/** A builder's sign-in name finds their account (usernames are stored in lower case). */
export async function findUserByUsername(tx: DbOrTx, username: string) {
  const [row] = await tx.select().from(users).where(eq(users.username, username)).limit(1)
  return row
}

/**
 * The address to write to. Teachers and staff always have one; a builder who joined with a
 * code has none, and nothing mails them: reaching this for such an account is a bug.
 */
export function mailAddressOf(user: { id?: number, email: string | null }): string {
  if (!user.email)
    throw new Error(`Account ${user.id ?? '?'} has no e-mail address: builders get no mail.`)
  return user.email
}

export function appUrl(path: string) {
  return new URL(path, useRuntimeConfig().publicUrl).toString()
}

type MailUser = { id: number, name: string, email: string | null }

/** Locks the user's row for the rest of the transaction: one account mail at a time per person. */
export async function lockUser(tx: DbOrTx, userId: number) {
  await tx.select({ id: users.id }).from(users).where(eq(users.id, userId)).for('update')
}

/**
 * Sends a confirmation link unless the hour's cap for this address is reached; says whether it did.
 */
export async function sendVerification(tx: DbOrTx, user: MailUser): Promise<boolean> {
  await lockUser(tx, user.id)
  const to = mailAddressOf(user)
  if (!(await takeMailQuota(tx, 'verify-email', to))) return false
  const token = await issueToken(tx, user.id, 'verify-email')
  await enqueueMail(
    tx,
    'verify-email',
    to,
    verificationMail(user.name, appUrl(`/verify-email?token=${token}`)),
  )
  return true
}

/** Sends a reset link, except within a minute of the last one or past the hour's cap. Locks the
 *  user's row first, so two requests at once cannot both pass the one-minute check. */
export async function sendPasswordReset(tx: DbOrTx, user: MailUser): Promise<boolean> {
  await lockUser(tx, user.id)
  const [recent] = await tx
    .select({ id: authTokens.id })
    .from(authTokens)
    .where(
      and(
        eq(authTokens.userId, user.id),
        eq(authTokens.purpose, 'reset-password'),
        gt(authTokens.createdAt, new Date(Date.now() - RESET_RESEND_GAP_MS)),
      ),
    )
    .limit(1)
  const to = mailAddressOf(user)
  if (recent || !(await takeMailQuota(tx, 'reset-password', to))) return false
  const token = await issueToken(tx, user.id, 'reset-password')
  await enqueueMail(
    tx,
    'reset-password',
    to,
    passwordResetMail(user.name, appUrl(`/reset-password/${token}`)),
  )
  return true
}

/**
 * Someone tried to register an address that already has an account: tell its owner, not the form.
 */
export async function sendAccountExists(tx: DbOrTx, user: MailUser) {
  await lockUser(tx, user.id)
  const to = mailAddressOf(user)
  if (!(await takeMailQuota(tx, 'account-exists', to))) return
  await enqueueMail(
    tx,
    'account-exists',
    to,
    accountExistsMail(user.name, appUrl('/login'), appUrl('/forgot-password')),
  )
}

/** Using one reset link spends every other unused one of the account. */
export async function spendResetLinks(tx: DbOrTx, userId: number) {
  await tx
    .update(authTokens)
    .set({ usedAt: new Date() })
    .where(
      and(
        eq(authTokens.userId, userId),
        eq(authTokens.purpose, 'reset-password'),
        isNull(authTokens.usedAt),
      ),
    )
}

let dummy: Promise<string> | undefined
/** A real hash of a throwaway password, so unknown accounts cost the same time to reject. */
export function dummyPasswordHash() {
  dummy ??= hashPassword('no account has this password')
  return dummy
}

/** Runs `work` and answers no sooner than `floorMs` after the start, so a reply's timing does not
 *  tell whether an account exists (the work for a known address takes longer). */
export async function withTimingFloor<T>(floorMs: number, work: () => Promise<T>): Promise<T> {
  const started = Date.now()
  try {
    return await work()
  } finally {
    const left = floorMs - (Date.now() - started)
    if (left > 0) await new Promise(r => setTimeout(r, left))
  }
}
