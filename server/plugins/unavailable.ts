// When MariaDB cannot be reached, an API call answers 503 with a retry hint (and a page says
// Tiltwright is briefly unavailable) instead of a bare 500.
import type { H3Error } from 'h3'

// isDatabaseDown() is in server/utils/errors.ts (unit-tested with the driver's own errors).

const RETRY_AFTER_SECONDS = 15

export default defineNitroPlugin((nitro) => {
  // Runs (synchronously) before Nitro's error handler shapes the answer from the error.
  nitro.hooks.hook('error', (error, { event }) => {
    if (!event || !isDatabaseDown(error)) return
    const e = error as H3Error
    e.statusCode = 503
    e.statusMessage = 'Service Unavailable'
    e.message = 'Tiltwright is briefly unavailable. '
      + `Please try again in ${RETRY_AFTER_SECONDS} seconds.`
    e.data = { code: 'unavailable', retryAfterSeconds: RETRY_AFTER_SECONDS }
    e.unhandled = false
    setResponseHeader(event, 'Retry-After', RETRY_AFTER_SECONDS)
  })
})
