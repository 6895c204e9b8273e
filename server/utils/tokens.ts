// Single-use expiring tokens. The raw token goes only into the e-mailed link; the table
// keeps its SHA-256, so a leaked table cannot be replayed.
import { createHash, randomBytes } from 'node:crypto'
import { and, eq, gt, isNull } from 'drizzle-orm'
import { authTokens } from '../database/schema'
import { hoursToMs, LINK_LIFETIME_HOURS } from '../../shared/utils/lifetimes'

type Purpose = (typeof authTokens.$inferSelect)['purpose']

const hash = (raw: string) => createHash('sha256').update(raw).digest('hex')

export const TOKEN_LIFETIME_MS: Record<Purpose, number> = {
  'verify-email': hoursToMs(LINK_LIFETIME_HOURS.confirmation),
  'reset-password': hoursToMs(LINK_LIFETIME_HOURS.reset),
}

/** lifetimeMs overrides the purpose's default (a staff invitation lives longer than a reset). */
export async function issueToken(
  tx: DbOrTx,
  userId: number,
  purpose: Purpose,
  lifetimeMs = TOKEN_LIFETIME_MS[purpose],
): Promise<string> {
  const raw = randomBytes(32).toString('base64url')
  await tx
    .insert(authTokens)
    .values({ userId, purpose, tokenHash: hash(raw), expiresAt: new Date(Date.now() + lifetimeMs) })
  return raw
}

/** Marks the token used and returns its user id, or null when it is unknown, used or expired. */
export async function consumeToken(
  tx: DbOrTx,
  raw: string,
  purpose: Purpose,
): Promise<number | null> {
  const [row] = await tx
    .select()
    .from(authTokens)
    .where(
      and(
        eq(authTokens.tokenHash, hash(raw)),
        eq(authTokens.purpose, purpose),
        isNull(authTokens.usedAt),
        gt(authTokens.expiresAt, new Date()),
      ),
    )
    .limit(1)
  if (!row) return null
  const [res] = await tx
    .update(authTokens)
    .set({ usedAt: new Date() })
    .where(and(eq(authTokens.id, row.id), isNull(authTokens.usedAt)))
  return res.affectedRows === 1 ? row.userId : null
}
