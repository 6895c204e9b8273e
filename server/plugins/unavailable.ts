// When MariaDB cannot be reached, an API call answers 503 with a retry hint (and a page says
// Tiltwright is briefly unavailable) instead of a bare 500.
import type { H3Error } from 'h3'

const RETRY_AFTER_SECONDS = 15
const DOWN_CODES = new Set([
  'ECONNREFUSED',
  'ECONNRESET',
  'ETIMEDOUT',
  'EPIPE',
  'PROTOCOL_CONNECTION_LOST',
  'ER_CON_COUNT_ERROR',
  'ER_SERVER_SHUTDOWN',
  'PROTOCOL_ENQUEUE_AFTER_FATAL_ERROR',
  'ER_CONNECTION_KILLED',
])

export function isDatabaseDown(error: unknown): boolean {
  return someCause(
    error,
    c =>
      DOWN_CODES.has(c.code ?? '')
      || (c.fatal === true && c.sqlState !== undefined)
      // A pooled connection whose server died mid-transaction (a Galera node killed): the
      // driver refuses the ROLLBACK with a fatal error that carries no code.
      || (c.fatal === true && /connection is in closed state/.test(c.message ?? '')),
  )
}

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
