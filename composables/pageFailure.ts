/** The error a page throws when its data did not load. Only "not found" (a missing record, or
 *  one that is not the caller's to see: the server answers both with 404) is a 404 page;
 *  anything else (the database away, a timeout, a fault) is "temporarily unavailable", 503,
 *  and the error page offers to try again. */
export function pageFailure(
  error: { statusCode?: number } | null | undefined,
  notFoundMessage: string,
) {
  const missing = error?.statusCode === 404
  return createError({
    statusCode: missing ? 404 : 503,
    statusMessage: missing ? notFoundMessage : 'Tiltwright is briefly unavailable',
    fatal: true,
  })
}
