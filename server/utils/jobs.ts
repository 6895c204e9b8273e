// Durable jobs: work that must happen after a change commits (an e-mail, a call to the payment
// provider, a webhook delivery, a sweep). enqueueJob() runs inside the transaction of the
// change, so a job exists exactly when its change does. runDueJobs() (Nitro's scheduled task
// `jobs:run`, nudged right after a commit) claims a due row with a committed lease, so two app
// instances (even on two Galera nodes) never run the same job, and retries a failure with
// back-off. A job that keeps failing ends `failed` and its kind's giveUp() undoes what it must.
import { hostname } from 'node:os'
import { randomBytes } from 'node:crypto'
import { and, asc, eq, gte, isNull, lt, lte, min, or, sql } from 'drizzle-orm'
import { jobs } from '../database/schema'
import type { JobKind } from '../jobs'

// The kinds are loaded on first use: they import the order engine, which queues jobs here.
const kinds = async () => (await import('../jobs')).jobKinds

export type JobRow = typeof jobs.$inferSelect

/** What a kind of job does. run() throws to be retried; it may ask to run again later. */
export interface JobDefinition<P> {
  // A job with nothing to ask returns nothing (void).
  // eslint-disable-next-line @typescript-eslint/no-invalid-void-type
  run: (payload: P, job: JobRow) => Promise<void | { again: number }>
  /** Attempts before the job is given up (default JOBS.maxAttempts). */
  maxAttempts?: number
  /** Called once when the job is given up, to undo or report. */
  giveUp?: (payload: P, job: JobRow, error: string) => Promise<void>
}

export const JOBS = {
  maxAttempts: 12,
  baseDelayMs: 15_000,
  maxDelayMs: 3600_000,
  batch: 20,
}

export async function enqueueJob(
  tx: DbOrTx,
  kind: JobKind,
  payload: Record<string, unknown>,
  opts: { uniqueKey?: string, delayMs?: number, runHere?: boolean } = {},
): Promise<number | null> {
  const values = {
    kind,
    payload,
    uniqueKey: opts.uniqueKey ?? null,
    nextAttemptAt: new Date(Date.now() + (opts.delayMs ?? 0)),
  }
  if (opts.uniqueKey) {
    // A job that must exist once: a second enqueue of the same key changes nothing.
    await tx
      .insert(jobs)
      .values(values)
      .onDuplicateKeyUpdate({ set: { uniqueKey: sql`unique_key` } })
    const [row] = await tx
      .select({ id: jobs.id })
      .from(jobs)
      .where(eq(jobs.uniqueKey, opts.uniqueKey))
      .limit(1)
    if (!opts.runHere) kickJobs()
    return row?.id ?? null
  }
  const [row] = await tx.insert(jobs).values(values).$returningId()
  if (!opts.runHere) kickJobs()
  return row?.id ?? null
}

/** Exponential back-off from runtimeConfig.outboxRetryBaseMs (15 s unless configured). */
export function retryDelayMs(attempts: number) {
  const base = Number(useRuntimeConfig().outboxRetryBaseMs) || JOBS.baseDelayMs
  return Math.min(JOBS.maxDelayMs, base * 2 ** Math.max(0, attempts - 1))
}

let running: Promise<number> | null = null
let rerun = false
let timer: ReturnType<typeof setTimeout> | null = null
let timerAt = 0

/** Ask for a run soon (after the current transaction has had time to commit). */
export function kickJobs(delayMs = 50) {
  const at = Date.now() + delayMs
  if (timer && timerAt <= at) return
  if (timer) clearTimeout(timer)
  timerAt = at
  timer = setTimeout(() => {
    timer = null
    void runDueJobs().catch(e => console.error('[jobs]', e))
  }, delayMs)
  timer.unref?.()
}

export function stopJobTimer() {
  if (timer) clearTimeout(timer)
  timer = null
}

/** Runs every due job; returns how many finished. One run at a time per process. */
export async function runDueJobs(): Promise<number> {
  if (running) {
    rerun = true
    return running
  }
  running = drain().finally(() => {
    running = null
    if (rerun) {
      rerun = false
      kickJobs()
    } else void nudgeForNextDue()
  })
  return running
}

async function drain(): Promise<number> {
  let finished = 0
  for (let i = 0; i < JOBS.batch * 10; i++) {
    const outcome = await runOne()
    if (outcome === 'none') return finished
    if (outcome === 'done') finished++
  }
  return finished
}

type Outcome = 'none' | 'done' | 'retry' | 'failed'

// Each claim is named by a token of its own, so finishing can check that this claim (not an
// earlier one of the same process) still holds the job.
const runnerTag = `${hostname().slice(0, 20)}:${process.pid}`
const newClaim = () => `${runnerTag}:${randomBytes(6).toString('hex')}`

/** How long a claim holds a job before another runner may take it (renewed while it runs). */
export function jobLeaseMs() {
  return Number(useRuntimeConfig().jobLeaseMs) || 30_000
}

/** A job no live runner holds: never claimed, finished, or its runner's lease ran out. */
const unheld = (now: Date) => or(isNull(jobs.leaseUntil), lt(jobs.leaseUntil, now))

/** Claims one due job (or the one named) with a committed lease: a single-row UPDATE, committed
 *  before the job runs. Two runners on two Galera nodes may both see the job free, but only one
 *  UPDATE commits (the other loses certification: a deadlock error, or no row changed); a row
 *  lock would not do, since row locks are local to a node. */
async function claim(onlyId?: number): Promise<{ job: JobRow, token: string } | null> {
  for (let round = 0; round < 5; round++) {
    const now = new Date()
    const due = and(eq(jobs.state, 'pending'), lte(jobs.nextAttemptAt, now), unheld(now))
    const candidates = await useDb()
      .select({ id: jobs.id })
      .from(jobs)
      .where(onlyId ? and(due, eq(jobs.id, onlyId)) : due)
      .orderBy(asc(jobs.nextAttemptAt), asc(jobs.id))
      .limit(onlyId ? 1 : 10)
    if (!candidates.length) return null
    for (const { id } of candidates) {
      const token = newClaim()
      try {
        const [res] = await useDb()
          .update(jobs)
          .set({ claimedBy: token, leaseUntil: new Date(Date.now() + jobLeaseMs()) })
          .where(and(eq(jobs.id, id), due))
        if (res.affectedRows !== 1) continue
      } catch (e) {
        if (isLockFailure(e)) continue
        throw e
      }
      const [job] = await useDb().select().from(jobs).where(eq(jobs.id, id)).limit(1)
      if (job?.claimedBy === token) return { job, token }
    }
  }
  return null
}

/** Records how a claimed job ended, if the claim still holds (a runner that outlived its
 *  lease must not overwrite the outcome of the runner that took the job over). */
async function finish(id: number, token: string, set: Partial<typeof jobs.$inferInsert>) {
  for (let i = 1; ; i++) {
    try {
      const [res] = await useDb()
        .update(jobs)
        .set({ ...set, leaseUntil: null })
        .where(and(eq(jobs.id, id), eq(jobs.claimedBy, token)))
      if (res.affectedRows !== 1)
        console.warn(`[jobs] job ${id} outlived its lease; another runner took it over`)
      return
    } catch (e) {
      if (i >= 5 || !isLockFailure(e)) throw e
    }
  }
}

/** Claims one due job (or the one named), runs it and records the outcome. The claim is a
 *  lease renewed while the job runs: no other instance takes the job meanwhile, and if this
 *  process dies the lease runs out and the job is due again (after at most jobLeaseMs). The
 *  job runs outside any transaction of the queue, so it may queue and change jobs freely. */
async function runOne(onlyId?: number): Promise<Outcome> {
  const claimed = await claim(onlyId)
  if (!claimed) return 'none'
  const { job, token } = claimed
  const renew = setInterval(() => {
    void useDb()
      .update(jobs)
      .set({ leaseUntil: new Date(Date.now() + jobLeaseMs()) })
      .where(and(eq(jobs.id, job.id), eq(jobs.claimedBy, token)))
      .catch(e => console.error('[jobs] renewing a lease failed', e))
  }, Math.max(100, jobLeaseMs() / 3))
  renew.unref?.()
  const def = (await kinds())[job.kind as JobKind] as JobDefinition<unknown> | undefined
  const attempts = job.attempts + 1
  let outcome: Outcome
  let givenUp: string | null = null
  try {
    if (!def) throw new Error(`no handler for jobs of kind ${job.kind}`)
    const out = await def.run(job.payload, job)
    clearInterval(renew)
    if (out && 'again' in out) {
      await finish(job.id, token, {
        attempts: 0,
        lastError: null,
        nextAttemptAt: new Date(Date.now() + out.again),
      })
    } else {
      await finish(job.id, token, { state: 'done', attempts, lastError: null, doneAt: new Date() })
    }
    outcome = 'done'
  } catch (e) {
    clearInterval(renew)
    const message = (e instanceof Error ? e.message : String(e)).slice(0, 500)
    const failed = attempts >= (def?.maxAttempts ?? JOBS.maxAttempts)
    await finish(job.id, token, {
      attempts,
      lastError: message,
      state: failed ? 'failed' : 'pending',
      nextAttemptAt: new Date(Date.now() + retryDelayMs(attempts)),
    })
    if (failed && def?.giveUp) givenUp = message
    outcome = failed ? 'failed' : 'retry'
  }
  if (givenUp !== null) await def!.giveUp!(job.payload, job, givenUp)
  return outcome
}

/** Runs one job now, in the caller's request (a checkout waits for its payment page), and
 *  gives its outcome: done, or the error it failed with this time. */
export async function runJobNow(id: number): Promise<{ done: boolean, error: string | null }> {
  const outcome = await runOne(id)
  if (outcome === 'done') return { done: true, error: null }
  // Not claimed: another runner holds it. Wait for its lease to end, then read how it ended.
  const deadline = Date.now() + jobLeaseMs() + 5000
  for (;;) {
    const [row] = await useDb()
      .select({ state: jobs.state, lastError: jobs.lastError, leaseUntil: jobs.leaseUntil })
      .from(jobs)
      .where(eq(jobs.id, id))
      .limit(1)
    if (row?.state === 'done') return { done: true, error: null }
    const held = row?.leaseUntil && row.leaseUntil.getTime() > Date.now()
    if (!row || !held || Date.now() > deadline)
      return { done: false, error: row?.lastError ?? 'failed' }
    await new Promise(r => setTimeout(r, 50))
  }
}

/** Gives a pending job up now (its giveUp runs), for a caller that cannot wait for retries.
 *  A job another runner holds is left to it. */
export async function giveUpJob(id: number, why: string) {
  const [res] = await useDb()
    .update(jobs)
    .set({ state: 'failed', lastError: why.slice(0, 500) })
    .where(and(eq(jobs.id, id), eq(jobs.state, 'pending'), unheld(new Date())))
  if (res.affectedRows !== 1) return false
  const [job] = await useDb().select().from(jobs).where(eq(jobs.id, id)).limit(1)
  const def = (await kinds())[job!.kind as JobKind] as JobDefinition<unknown> | undefined
  await def?.giveUp?.(job!.payload, job!, why)
  return true
}

/** A retry due before the next scheduled run gets a timer of its own. A job another runner
 *  holds is due, for this runner, when its lease runs out. */
async function nudgeForNextDue() {
  try {
    const now = new Date()
    const pending = eq(jobs.state, 'pending')
    const [free] = await useDb()
      .select({ next: min(jobs.nextAttemptAt) })
      .from(jobs)
      .where(and(pending, unheld(now)))
    const [held] = await useDb()
      .select({ next: min(jobs.leaseUntil) })
      .from(jobs)
      .where(and(pending, gte(jobs.leaseUntil, now)))
    const times = [free?.next, held?.next].filter(t => t).map(t => new Date(t!).getTime())
    const next = times.length ? Math.min(...times) : null
    if (next !== null && next - Date.now() < 5000) kickJobs(Math.max(50, next - Date.now()))
  } catch {
    /* the scheduled run tries again */
  }
}
