// When MariaDB cannot be reached, an API call answers 503 with a retry hint (and a page says
// Tiltwright is briefly unavailable) instead of a bare 500.
import type { H3Error } from 'h3'

const RETRY_AFTER_SECONDS = 15
const DOWN_CODES = new Set([
  'ECONNREFUSED', 'ECONNRESET', 'ETIMEDOUT', 'EPIPE', 'PROTOCOL_CONNECTION_LOST', 'ER_CON_COUNT_ERROR',
  'ER_SERVER_SHUTDOWN', 'PROTOCOL_ENQUEUE_AFTER_FATAL_ERROR', 'ER_CONNECTION_KILLED',
])

export function isDatabaseDown(error: unknown): boolean {
  let cur: any = error
  for (let i = 0; i < 6 && cur; i++) {
    if (DOWN_CODES.has(cur.code) || (cur.fatal === true && typeof cur.sqlState !== 'undefined')) return true
    cur = cur.cause
  }
  return false
}

export default defineNitroPlugin((nitro) => {
  // Runs (synchronously) before Nitro's error handler shapes the answer from the error.
  nitro.hooks.hook('error', (error, { event }) => {
    if (!event || !isDatabaseDown(error)) return
    const e = error as H3Error
    e.statusCode = 503
    e.statusMessage = 'Service Unavailable'
    e.message = `Tiltwright is briefly unavailable. Please try again in ${RETRY_AFTER_SECONDS} seconds.`
    e.data = { code: 'unavailable', retryAfterSeconds: RETRY_AFTER_SECONDS }
    e.unhandled = false
    setResponseHeader(event, 'Retry-After', RETRY_AFTER_SECONDS)
  })
})
