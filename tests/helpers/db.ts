// Direct reads and writes on the test database, for what no route shows (the jobs queue) or
// should let a test do (set a clock back). One connection per call: tests are few and short.
import mysql from 'mysql2/promise'
import { inject } from 'vitest'

// Row values are whatever the driver gives back for the statement the test wrote.

export async function sql<T = any>(
  statement: string,
  params: unknown[] = [],
  uri: string = inject('dbUrl'),
): Promise<T[]> {
  const conn = await mysql.createConnection({ uri })
  try {
    const [rows] = await conn.query(statement, params)
    return rows as T[]
  } finally {
    await conn.end()
  }
}

/** Which jobs a test waits for: by kind, by the mail's recipient, by order, by age. */
export interface JobFilter {
  kind?: string
  to?: string
  orderId?: number
  since?: Date
}

/**
 * Waits until the matching jobs have nothing left to do: none is pending. A job being run
 * stays pending until its transaction commits, so when this returns every matching job queued
 * so far has run to its end (done, or given up). Use it instead of sleeping before asserting
 * that something happened only once. The recurring card-hold sweep is never waited for.
 */
export async function jobsSettled(filter: JobFilter = {}, timeoutMs = 30_000) {
  const conditions = ([
    ['kind = ?', filter.kind],
    [`JSON_VALUE(payload, '$.to') = ?`, filter.to],
    [`JSON_VALUE(payload, '$.orderId') = ?`, filter.orderId],
    ['created_at >= ?', filter.since],
  ] as [string, unknown][]).filter(c => c[1] !== undefined)
  const where = [`state = 'pending'`, `kind <> 'sweep-card-holds'`, ...conditions.map(c => c[0])]
  const params = conditions.map(c => c[1])
  const deadline = Date.now() + timeoutMs
  for (;;) {
    const [row] = await sql<{ n: number }>(
      `SELECT COUNT(*) AS n FROM jobs WHERE ${where.join(' AND ')}`,
      params,
    )
    if (Number(row!.n) === 0) return
    if (Date.now() > deadline)
      throw new Error(`${row!.n} job(s) still pending after ${timeoutMs} ms`)
    await new Promise(r => setTimeout(r, 100))
  }
}

/** Waits until a job of `kind` for this order has been tried at least once; returns it. */
export async function jobTried(kind: string, orderId: number, timeoutMs = 20_000) {
  const deadline = Date.now() + timeoutMs
  for (;;) {
    const [job] = await sql<{ state: string, attempts: number, lastError: string | null }>(
      `SELECT state, attempts, last_error AS lastError FROM jobs
       WHERE kind = ? AND JSON_VALUE(payload, '$.orderId') = ? AND attempts > 0
       ORDER BY id DESC LIMIT 1`,
      [kind, orderId],
    )
    if (job) return job
    if (Date.now() > deadline) throw new Error(`no ${kind} job for order ${orderId} was tried`)
    await new Promise(r => setTimeout(r, 100))
  }
}

/** Waits until the recurring card-hold sweep has run once more after this call. */
export async function sweepRunsAgain(timeoutMs = 30_000) {
  const next = async () =>
    (await sql<{ at: Date }>(
      `SELECT next_attempt_at AS at FROM jobs WHERE kind = 'sweep-card-holds' LIMIT 1`,
    ))[0]?.at.getTime() ?? 0
  const before = await next()
  const deadline = Date.now() + timeoutMs
  while ((await next()) <= before) {
    if (Date.now() > deadline) throw new Error('the card-hold sweep did not run again')
    await new Promise(r => setTimeout(r, 100))
  }
}
