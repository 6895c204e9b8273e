// How long Tiltwright's single-use links and card holds last, declared once: the server issues
// tokens and sweeps holds by these numbers, and pages, e-mails and documents say them in words
// with `hoursInWords`, so the two never disagree.

/** Hours a link sent by e-mail stays good (it also stops working once used). */
export const LINK_LIFETIME_HOURS = {
  /** Confirming a new account's e-mail address. */
  confirmation: 72,
  /** Choosing a new password after "Forgotten your password?". */
  reset: 1,
  /** A new staff member choosing a first password. */
  invitation: 72,
} as const

/** Hours an unpaid card order holds its stock before it is cancelled (runtimeConfig default). */
export const CARD_HOLD_HOURS = 48

export const hoursToMs = (hours: number) => hours * 3600_000

/** "1 hour", "48 hours", "3 days": whole days from 72 hours on, hours below that. */
export function hoursInWords(hours: number): string {
  if (hours >= 72 && hours % 24 === 0) return `${hours / 24} days`
  return hours === 1 ? '1 hour' : `${hours} hours`
}
