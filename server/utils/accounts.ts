// Account queries that several auth routes share.
import { eq } from 'drizzle-orm'
import { users } from '../database/schema'
import { passwordResetMail, verificationMail } from '../emails/account'

export async function findUserByEmail(tx: DbOrTx, email: string) {
  const [row] = await tx.select().from(users).where(eq(users.email, email)).limit(1)
  return row
}

export function appUrl(path: string) {
  return new URL(path, useRuntimeConfig().publicUrl).toString()
}

export async function sendVerification(tx: DbOrTx, user: { id: number; name: string; email: string }) {
  const token = await issueToken(tx, user.id, 'verify-email')
  await enqueueMail(tx, 'verify-email', user.email, verificationMail(user.name, appUrl(`/verify-email?token=${token}`)))
}

export async function sendPasswordReset(tx: DbOrTx, user: { id: number; name: string; email: string }) {
  const token = await issueToken(tx, user.id, 'reset-password')
  await enqueueMail(tx, 'reset-password', user.email, passwordResetMail(user.name, appUrl(`/reset-password/${token}`)))
}

let dummy: Promise<string> | undefined
/** A real hash of a throwaway password, so unknown accounts cost the same time to reject. */
export function dummyPasswordHash() {
  dummy ??= hashPassword('no account has this password')
  return dummy
}
