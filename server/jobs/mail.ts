// The `mail` job: one e-mail, sent over SMTP by the mail adapter. Attachments are either
// stored bytes or a document to render at send time (a quote, an order's invoice, receipt or
// packing list), so no PDF is rendered inside the transaction that queued the mail.
import { eq } from 'drizzle-orm'
import { quotes } from '../database/schema'
import type { RenderedMail } from '../emails/layout'
import { useMailTransport } from '../services/mail'
import type { JobDefinition } from '../utils/jobs'
import type { OrderDocumentKind } from '../../shared/utils/states'

export type MailAttachment
  = | { filename: string, contentType: string, contentBase64: string }
    | { document: 'quote', quoteId: number }
    | { document: OrderDocumentKind, orderId: number }

export interface MailPayload {
  kind: string
  to: string
  subject: string
  text: string
  html: string | null
  attachments: MailAttachment[]
}

async function renderAttachment(a: MailAttachment) {
  if ('contentBase64' in a) {
    return {
      filename: a.filename,
      contentType: a.contentType,
      content: Buffer.from(a.contentBase64, 'base64'),
    }
  }
  const db = useDb()
  if (a.document === 'quote') {
    const [q] = await db.select().from(quotes).where(eq(quotes.id, a.quoteId)).limit(1)
    if (!q) throw new Error(`quote ${a.quoteId} is gone`)
    return {
      filename: `Tiltwright-quote-${q.number}.pdf`,
      contentType: 'application/pdf',
      content: await renderQuotePdf(db, q),
    }
  }
  const order = await loadOrder(db, a.orderId)
  const doc = order ? await renderOrderDocument(db, order, a.document) : null
  if (!doc) throw new Error(`order ${a.orderId} has no ${a.document}`)
  return { filename: doc.filename, contentType: 'application/pdf', content: doc.pdf }
}

export const mailJob: JobDefinition<MailPayload> = {
  async run(p) {
    const attachments = await Promise.all((p.attachments ?? []).map(renderAttachment))
    await useMailTransport().send({
      to: p.to,
      subject: p.subject,
      text: p.text,
      html: p.html,
      attachments,
    })
  },
}

/** Queues an e-mail inside the transaction of the change that causes it. Attachments are
 *  bytes, or documents named to be rendered when the mail is sent. */
export async function queueMail(
  tx: DbOrTx,
  kind: string,
  to: string,
  mail: RenderedMail,
  attachments: ({ filename: string, contentType: string, content: Buffer } | MailAttachment)[] = [],
) {
  const stored: MailAttachment[] = attachments.map(a =>
    'content' in a
      ? {
          filename: a.filename,
          contentType: a.contentType,
          contentBase64: a.content.toString('base64'),
        }
      : a,
  )
  const payload: MailPayload = {
    kind,
    to,
    subject: mail.subject,
    text: mail.text,
    html: mail.html,
    attachments: stored,
  }
  return enqueueJob(tx, 'mail', payload as unknown as Record<string, unknown>)
}
