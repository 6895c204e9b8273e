// Durable jobs: work that must happen after a change commits (an e-mail, a call to the payment
// provider, a webhook delivery, a sweep). enqueueJob() runs inside the transaction of the
// change, so a job exists exactly when its change does. runDueJobs() (Nitro's scheduled task
// `jobs:run`, nudged right after a commit) claims due rows with SKIP LOCKED, so two app
// instances never run the same job, and retries a failure with back-off. A job that keeps
// failing ends `failed` and its kind's giveUp() undoes what it must.
import { and, asc, eq, lte, min, sql } from 'drizzle-orm'
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

/** Claims one due job (or the one named), runs it and records the outcome. The job's row stays
 *  locked while it runs, so no other instance takes it; if this process dies, the lock goes
 *  with it and the job is due again at once. Read-committed, so the claim locks that row only
 *  and the job may queue new jobs meanwhile. */
async function runOne(onlyId?: number): Promise<Outcome> {
  let givenUp: { def: JobDefinition<unknown>, job: JobRow, error: string } | null = null
  const outcome = await useDb().transaction(
    async (tx) => {
      const due = and(eq(jobs.state, 'pending'), lte(jobs.nextAttemptAt, new Date()))
      const [job] = await tx
        .select()
        .from(jobs)
        .where(onlyId ? and(due, eq(jobs.id, onlyId)) : due)
        .orderBy(asc(jobs.nextAttemptAt), asc(jobs.id))
        .limit(1)
        .for('update', { skipLocked: true })
      if (!job) return 'none' as const
      const def = (await kinds())[job.kind as JobKind] as JobDefinition<unknown> | undefined
      const attempts = job.attempts + 1
      try {
        if (!def) throw new Error(`no handler for jobs of kind ${job.kind}`)
        const out = await def.run(job.payload, job)
        if (out && 'again' in out) {
          await tx
            .update(jobs)
            .set({ attempts: 0, lastError: null, nextAttemptAt: new Date(Date.now() + out.again) })
            .where(eq(jobs.id, job.id))
        } else {
          await tx
            .update(jobs)
            .set({ state: 'done', attempts, lastError: null, doneAt: new Date() })
            .where(eq(jobs.id, job.id))
        }
        return 'done' as const
      } catch (e) {
        const message = (e instanceof Error ? e.message : String(e)).slice(0, 500)
        const failed = attempts >= (def?.maxAttempts ?? JOBS.maxAttempts)
        await tx
          .update(jobs)
          .set({
            attempts,
            lastError: message,
            state: failed ? 'failed' : 'pending',
            nextAttemptAt: new Date(Date.now() + retryDelayMs(attempts)),
          })
          .where(eq(jobs.id, job.id))
        if (failed && def?.giveUp) givenUp = { def, job, error: message }
        return failed ? ('failed' as const) : ('retry' as const)
      }
    },
    { isolationLevel: 'read committed' },
  )
  const g = givenUp as { def: JobDefinition<unknown>, job: JobRow, error: string } | null
  if (g) await g.def.giveUp!(g.job.payload, g.job, g.error)
  return outcome
}

/** Runs one job now, in the caller's request (a checkout waits for its payment page), and
 *  gives its outcome: done, or the error it failed with this time. */
export async function runJobNow(id: number): Promise<{ done: boolean, error: string | null }> {
  const outcome = await runOne(id)
  if (outcome === 'done') return { done: true, error: null }
  // Not claimed: another runner holds it. Wait for its lock, then read how it ended.
  const [row] = await useDb().transaction(async tx =>
    tx
      .select({ state: jobs.state, lastError: jobs.lastError })
      .from(jobs)
      .where(eq(jobs.id, id))
      .limit(1)
      .for('update'),
  )
  if (row?.state === 'done') return { done: true, error: null }
  return { done: false, error: row?.lastError ?? 'failed' }
}

/** Gives a pending job up now (its giveUp runs), for a caller that cannot wait for retries. */
export async function giveUpJob(id: number, why: string) {
  const [res] = await useDb()
    .update(jobs)
    .set({ state: 'failed', lastError: why.slice(0, 500) })
    .where(and(eq(jobs.id, id), eq(jobs.state, 'pending')))
  if (res.affectedRows !== 1) return false
  const [job] = await useDb().select().from(jobs).where(eq(jobs.id, id)).limit(1)
  const def = (await kinds())[job!.kind as JobKind] as JobDefinition<unknown> | undefined
  await def?.giveUp?.(job!.payload, job!, why)
  return true
}

/** A retry due before the next scheduled run gets a timer of its own. */
async function nudgeForNextDue() {
  try {
    const [row] = await useDb()
      .select({ next: min(jobs.nextAttemptAt) })
      .from(jobs)
      .where(eq(jobs.state, 'pending'))
    const next = row?.next ? new Date(row.next).getTime() : null
    if (next !== null && next - Date.now() < 5000) kickJobs(Math.max(50, next - Date.now()))
  } catch {
    /* the scheduled run tries again */
  }
}
