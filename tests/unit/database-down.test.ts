// Which errors read as "the database is down" (answered 503 by server/plugins/unavailable.ts),
// made by the real driver against a port nothing listens on, and wrapped as drizzle wraps them.
import mysql from 'mysql2'
import { DrizzleQueryError } from 'drizzle-orm'
import { describe, expect, it } from 'vitest'
import { isDatabaseDown } from '../../server/utils/errors'

/** The driver's errors for a query on a connection that cannot connect, then for the next
 *  query on it (the connection is closed by then), as a rollback after a crash meets it. */
async function driverErrors() {
  // Port 1 (tcpmux) is not served on a test machine: the connection is refused at once.
  const conn = mysql.createConnection({ host: '127.0.0.1', port: 1 })
  conn.on('error', () => {})
  const refused = await conn.promise().query('SELECT 1').then(() => null, (e: Error) => e)
  const closed = await conn.promise().query('ROLLBACK').then(() => null, (e: Error) => e)
  return { refused: refused!, closed: closed! }
}

describe('isDatabaseDown', () => {
  it('knows a refused connection and a closed one, also wrapped by drizzle', async () => {
    const { refused, closed } = await driverErrors()
    expect((refused as { code?: string }).code).toBe('ECONNREFUSED')
    expect(closed.message).toMatch(/closed state/)
    expect(isDatabaseDown(refused)).toBe(true)
    expect(isDatabaseDown(closed)).toBe(true)
    // The rollback's error is what drizzle throws when MariaDB died mid-transaction.
    expect(isDatabaseDown(new DrizzleQueryError('rollback', [], closed))).toBe(true)
    expect(isDatabaseDown(new DrizzleQueryError('select 1', [], refused))).toBe(true)
  })

  it('leaves errors of a working database and plain errors alone', () => {
    const duplicate = Object.assign(new Error('Duplicate entry'), {
      code: 'ER_DUP_ENTRY',
      errno: 1062,
      sqlState: '23000',
      fatal: false,
    })
    expect(isDatabaseDown(new DrizzleQueryError('insert', [], duplicate))).toBe(false)
    expect(isDatabaseDown(new Error('boom'))).toBe(false)
    expect(isDatabaseDown(Object.assign(new Error('no code'), { fatal: false }))).toBe(false)
    expect(isDatabaseDown(null)).toBe(false)
    // A page's failure (Nuxt's createError, as pageFailure() makes it) is fatal without a code.
    const page = Object.assign(new Error('Tiltwright is briefly unavailable'), {
      statusCode: 503,
      fatal: true,
      cause: { statusCode: 503, statusMessage: 'Tiltwright is briefly unavailable', fatal: true },
    })
    expect(isDatabaseDown(page)).toBe(false)
  })
})
