/** The error a page throws when its data did not load: 503 while Tiltwright is briefly
 *  unavailable (the API said so), 404 otherwise (missing, or not the caller's to see). */
export function pageFailure(
  error: { statusCode?: number } | null | undefined,
  notFoundMessage: string,
) {
  const unavailable = error?.statusCode === 503
  return createError({
    statusCode: unavailable ? 503 : 404,
    statusMessage: unavailable ? 'Tiltwright is briefly unavailable' : notFoundMessage,
    fatal: true,
  })
}
