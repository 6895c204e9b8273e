// The few ways a route says no. Each sets a status, a short message and a stable data.code.
import type { z } from 'zod'
import { fieldErrorsOf, type FieldErrors } from '../../shared/utils/field-errors'

export const notFound = (what = 'That') =>
  createError({
    statusCode: 404,
    statusMessage: 'Not Found',
    message: `${what} was not found.`,
    data: { code: 'not-found' },
  })

export const forbidden = (message = 'Your role cannot do that.') =>
  createError({ statusCode: 403, statusMessage: 'Forbidden', message, data: { code: 'forbidden' } })

export const conflict = (message: string, code = 'conflict', fields?: FieldErrors) =>
  createError({ statusCode: 409, statusMessage: 'Conflict', message, data: { code, fields } })

export const invalid = (fields: FieldErrors, message = 'Some fields need attention.') =>
  createError({
    statusCode: 422,
    statusMessage: 'Unprocessable Entity',
    message,
    data: { code: 'invalid', fields },
  })

export const badRequest = (message: string, code = 'bad-request') =>
  createError({ statusCode: 400, statusMessage: 'Bad Request', message, data: { code } })

export const tooManyRequests = (message: string, retryAfterSeconds: number) =>
  createError({
    statusCode: 429,
    statusMessage: 'Too Many Requests',
    message,
    data: { code: 'rate-limited', retryAfterSeconds },
  })

/** Parse with a shared zod schema, answering 422 with one message per field. */
export function parseOrThrow<S extends z.ZodType>(schema: S, value: unknown): z.output<S> {
  const result = schema.safeParse(value)
  if (!result.success) throw invalid(fieldErrorsOf(result.error))
  return result.data
}

export async function readBodyAs<S extends z.ZodType>(
  event: Parameters<typeof readBody>[0],
  schema: S,
): Promise<z.output<S>> {
  let body: unknown
  try {
    body = await readBody(event)
  } catch {
    throw badRequest('The request body is not valid JSON.', 'bad-json')
  }
  return parseOrThrow(schema, body ?? {})
}

export function queryAs<S extends z.ZodType>(
  event: Parameters<typeof getQuery>[0],
  schema: S,
): z.output<S> {
  return parseOrThrow(schema, getQuery(event))
}

/** The path's parameters through a schema of shared/schemas/ids.ts; 404 naming `what` when
 *  they do not fit (a malformed id is as absent as an unknown one). */
export function paramsAs<S extends z.ZodType>(
  event: Parameters<typeof getRouterParams>[0],
  schema: S,
  what = 'That',
): z.output<S> {
  const r = schema.safeParse(getRouterParams(event))
  if (!r.success) throw notFound(what)
  return r.data
}

/** Runs `work`; a duplicate key becomes 409 with `data.fields[field]` = `message` (code
 *  `<field>-taken`), so every unique value is refused the same way. */
export async function uniqueOr409<T>(
  field: string,
  message: string,
  work: () => Promise<T>,
): Promise<T> {
  try {
    return await work()
  } catch (e) {
    if (isDuplicateKey(e)) throw conflict(message, `${field}-taken`, { [field]: message })
    throw e
  }
}

/** The fields of a driver error that the checks below read. */
interface DriverError {
  message?: string
  code?: string
  errno?: number
  fatal?: boolean
  sqlState?: string
  cause?: unknown
}

/** True when the error, or one of the errors it wraps (drizzle wraps the driver's), matches. */
export function someCause(error: unknown, match: (e: DriverError) => boolean, depth = 6): boolean {
  let cur = error
  for (let i = 0; i < depth && cur && typeof cur === 'object'; i++) {
    const e = cur as DriverError
    if (match(e)) return true
    cur = e.cause
  }
  return false
}

/** MariaDB's duplicate-key error, wherever drizzle wraps it. */
export function isDuplicateKey(e: unknown): boolean {
  return someCause(e, c => c.code === 'ER_DUP_ENTRY' || c.errno === 1062)
}

const CLOSED_CONNECTION = /connection is in closed state/

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

/** The database cannot be reached: the connection was refused, lost or is closed. */
export function isDatabaseDown(error: unknown): boolean {
  return someCause(
    error,
    c =>
      DOWN_CODES.has(c.code ?? '')
      || (c.fatal === true && c.sqlState !== undefined)
      // mysql2's error for a command on a closed connection has no code, only its words. It is
      // what a transaction's rollback throws when the database died mid-transaction, and the
      // error drizzle reports (the first one is lost). Matched by its words, since a page's
      // own error (Nuxt's createError) is also `fatal` without a code.
      || (c.fatal === true && CLOSED_CONNECTION.test(c.message ?? '')),
  )
}

/** A deadlock (1213) or a lock wait timeout (1205): worth another try. On Galera a commit that
 *  loses certification to another node's conflicting write answers 1213 too, at COMMIT. */
export function isLockFailure(e: unknown): boolean {
  return someCause(e, c => c.errno === 1213 || c.errno === 1205)
}
