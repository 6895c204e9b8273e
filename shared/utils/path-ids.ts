// Ids in paths are plain decimal (server/middleware/request-guards.ts).

/** A path segment that Number() would accept but that is not a plain decimal id. */
export function isDisguisedNumber(segment: string): boolean {
  let s: string
  try {
    s = decodeURIComponent(segment)
  } catch {
    return false
  }
  return s.trim() !== '' && Number.isFinite(Number(s)) && !/^[1-9]\d*$/.test(s)
}
