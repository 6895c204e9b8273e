// The e-mail outbox. enqueueMail() runs inside the transaction of the change that causes
// the mail, so a mail exists exactly when its change does; deliverDueMail() sends it
// later with retries, so an SMTP outage delays mail but loses none.
import { and, asc, eq, lte, sql } from 'drizzle-orm'
import { emailOutbox, type OutboxAttachment } from '../database/schema'
import type { RenderedMail } from '../emails/layout'
import { useMailTransport } from '../services/mail'

// (Object literals of exported consts stay multi-line: Nitro's auto-import scanner
// otherwise misses the export that follows them.)
export const OUTBOX = {
  maxAttempts: 12,
  baseDelayMs: 15_000,
  maxDelayMs: 3600_000,
  batch: 20,
}

export async function enqueueMail(tx: DbOrTx, kind: string, to: string, mail: RenderedMail, attachments: { filename: string; contentType: string; content: Buffer }[] = []) {
  const stored: OutboxAttachment[] = attachments.map((a) => ({ filename: a.filename, contentType: a.contentType, contentBase64: a.content.toString('base64') }))
  await tx.insert(emailOutbox).values({ kind, toAddress: to, subject: mail.subject, textBody: mail.text, htmlBody: mail.html, attachments: stored })
  scheduleOutboxRun()
}

/** Exponential back-off from runtimeConfig.outboxRetryBaseMs (15 s unless configured). */
export function retryDelayMs(attempts: number) {
  const base = Number(useRuntimeConfig().outboxRetryBaseMs) || OUTBOX.baseDelayMs
  return Math.min(OUTBOX.maxDelayMs, base * 2 ** Math.max(0, attempts - 1))
}

let running: Promise<number> | null = null
let rerun = false
let timer: ReturnType<typeof setTimeout> | null = null

/** Ask for a delivery run soon (after the current transaction has had time to commit). */
export function scheduleOutboxRun(delayMs = 50) {
  if (timer) return
  timer = setTimeout(() => { timer = null; void runOutbox() }, delayMs)
}

export async function runOutbox(): Promise<number> {
  if (running) { rerun = true; return running }
  running = deliverDueMail().finally(() => {
    running = null
    if (rerun) { rerun = false; scheduleOutboxRun() }
  })
  return running
}

/** Sends what is due; returns how many were sent. Rows are claimed with SKIP LOCKED so two
 *  server processes never send the same mail twice. */
async function deliverDueMail(): Promise<number> {
  const db = useDb()
  const transport = useMailTransport()
  let sent = 0
  for (;;) {
    const claimed = await db.transaction(async (tx) => {
      const rows = await tx.select().from(emailOutbox)
        .where(and(eq(emailOutbox.status, 'pending'), lte(emailOutbox.nextAttemptAt, new Date())))
        .orderBy(asc(emailOutbox.id)).limit(OUTBOX.batch).for('update', { skipLocked: true })
      if (!rows.length) return rows
      // Push them out of reach for a minute while this process sends them.
      await tx.update(emailOutbox).set({ nextAttemptAt: new Date(Date.now() + 60_000) })
        .where(sql`${emailOutbox.id} in (${sql.join(rows.map((r) => sql`${r.id}`), sql`, `)})`)
      return rows
    })
    if (!claimed.length) return sent
    for (const row of claimed) {
      try {
        await transport.send({
          to: row.toAddress, subject: row.subject, text: row.textBody, html: row.htmlBody,
          attachments: (row.attachments ?? []).map((a) => ({ filename: a.filename, contentType: a.contentType, content: Buffer.from(a.contentBase64, 'base64') })),
        })
        await db.update(emailOutbox).set({ status: 'sent', sentAt: new Date(), attempts: row.attempts + 1, lastError: null }).where(eq(emailOutbox.id, row.id))
        sent++
      } catch (e) {
        const attempts = row.attempts + 1
        const message = (e instanceof Error ? e.message : String(e)).slice(0, 500)
        await db.update(emailOutbox).set({
          attempts, lastError: message,
          status: attempts >= OUTBOX.maxAttempts ? 'failed' : 'pending',
          nextAttemptAt: new Date(Date.now() + retryDelayMs(attempts)),
        }).where(eq(emailOutbox.id, row.id))
      }
    }
    if (claimed.length < OUTBOX.batch) return sent
  }
}
