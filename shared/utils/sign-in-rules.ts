// How sign-in guessing is slowed (server/utils/sign-in-throttle.ts counts; this decides).
export interface ThrottleRules {
  freeAttempts: number
  firstDelayMs: number
  maxDelayMs: number
  forgetAfterMs: number
}

export const THROTTLE: ThrottleRules = {
  /** Attempts a (account, address) pair may make back to back. */
  freeAttempts: 5,
  /** The wait after the last free attempt; it doubles with each further attempt … */
  firstDelayMs: 60_000,
  /** … up to this. */
  maxDelayMs: 15 * 60_000,
  /** A pair not seen for this long is forgotten. */
  forgetAfterMs: 24 * 3600_000,
}

/**
 * Join codes tried from one address (POST /api/join/check and /api/join together). A class
 * joins from behind one address, so only wrong codes count (a code that works is given back)
 * and the count starts afresh after an hour without a try.
 */
export const JOIN_THROTTLE: ThrottleRules = {
  freeAttempts: 20,
  firstDelayMs: 60_000,
  maxDelayMs: 15 * 60_000,
  forgetAfterMs: 3600_000,
}

/** How long a pair must wait after its `attempts`-th counted attempt. */
export function delayAfter(attempts: number, rules: ThrottleRules = THROTTLE): number {
  if (attempts < rules.freeAttempts) return 0
  return Math.min(rules.firstDelayMs * 2 ** (attempts - rules.freeAttempts), rules.maxDelayMs)
}
