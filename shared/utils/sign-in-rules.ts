// How sign-in guessing is slowed (server/utils/sign-in-throttle.ts counts; this decides).
export const THROTTLE = {
  /** Attempts a (account, address) pair may make back to back. */
  freeAttempts: 5,
  /** The wait after the last free attempt; it doubles with each further attempt … */
  firstDelayMs: 60_000,
  /** … up to this. */
  maxDelayMs: 15 * 60_000,
  /** A pair not seen for this long is forgotten. */
  forgetAfterMs: 24 * 3600_000,
}

/** How long a pair must wait after its `attempts`-th counted attempt. */
export function delayAfter(attempts: number): number {
  if (attempts < THROTTLE.freeAttempts) return 0
  return Math.min(
    THROTTLE.firstDelayMs * 2 ** (attempts - THROTTLE.freeAttempts),
    THROTTLE.maxDelayMs,
  )
}
