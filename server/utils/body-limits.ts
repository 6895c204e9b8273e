// Request size limits, enforced while the body streams in (server/middleware/body-limits.ts):
// a declared Content-Length over the limit is refused before reading, and a chunked body is
// refused with 413 the moment it passes the limit, so nothing past the limit is ever kept.
import type { H3Event } from 'h3'
import { UPLOAD_LIMIT_BYTES } from '../../shared/schemas/shop'
import { ATTACHMENT_MAX_BYTES } from '../../shared/utils/tickets'

export const BODY_LIMITS = {
  /** JSON, form and any other non-multipart body. */
  bodyBytes: 2_000_000,
  /** A whole multipart request (a purchase order and a tax certificate with their fields). */
  multipartBytes: 12_000_000,
  /** One part of a multipart request: one file plus its part headers. */
  partBytes: UPLOAD_LIMIT_BYTES + 16_384,
  /** A ticket attachment's upload (POST /api/ticket-attachments): one file, up to the largest
   *  kind's limit (a short video); the route then holds each kind to its own limit. */
  attachmentBytes: ATTACHMENT_MAX_BYTES + 65_536,
}

/** The paths whose multipart bodies may be as large as one ticket attachment. */
export const ATTACHMENT_UPLOAD_PATH = '/api/ticket-attachments'

/** Ticket attachments being received at once, server-wide: each may hold up to
 *  `attachmentBytes` in memory, so a burst cannot pile up buffers. */
export const ATTACHMENT_UPLOADS_IN_FLIGHT = 4
let attachmentUploads = 0

/**
 * Takes one of the attachment upload slots for this request (given back when its response
 * ends, however it ends); 429 without reading the body when all are taken.
 */
export function takeAttachmentSlot(event: H3Event) {
  if (attachmentUploads >= ATTACHMENT_UPLOADS_IN_FLIGHT) {
    dropRestOfBody(event)
    setResponseHeader(event, 'Retry-After', 5)
    throw createError({
      statusCode: 429,
      statusMessage: 'Too Many Requests',
      message: 'Tiltwright is receiving several files right now. Try again in a moment.',
      data: { code: 'uploads-busy', retryAfterSeconds: 5 },
    })
  }
  attachmentUploads++
  let given = false
  const give = () => {
    if (given) return
    given = true
    attachmentUploads--
  }
  event.node.res.once('close', give)
  event.node.res.once('finish', give)
}

/** How long the rest of a refused body may keep arriving (read and dropped, never kept) after the
 *  413 has gone out. Closing at once would reset the connection under the client before it has
 *  read the answer; this lets it read the 413, then cuts off a sender that does not stop. */
const DRAIN_AFTER_REFUSAL_MS = 3000

/** Drops whatever of a refused body is still arriving, and cuts off a sender that keeps on. */
function dropRestOfBody(event: H3Event) {
  const { req, res } = event.node
  req.removeAllListeners('data')
  req.resume()
  res.once('finish', () => {
    setTimeout(() => {
      if (!req.complete) req.socket.destroy()
    }, DRAIN_AFTER_REFUSAL_MS).unref()
  })
}

export function tooLarge(event: H3Event, limit: number) {
  dropRestOfBody(event)
  const mb = Math.round((limit / 1_000_000) * 10) / 10
  return createError({
    statusCode: 413,
    statusMessage: 'Payload Too Large',
    message: `That is more than this form accepts (${mb} MB).`,
    data: { code: 'too-large', limitBytes: limit },
  })
}

/**
 * Counts the bytes between multipart boundaries as they pass; calls `over` when a part is too big.
 */
function partWatcher(boundary: string, maxPart: number) {
  const delimiter = Buffer.from(`--${boundary}`)
  let carry = Buffer.alloc(0)
  let seen = 0 // bytes of the stream before `carry`
  let partStart = 0
  return (chunk: Buffer): boolean => {
    const window = Buffer.concat([carry, chunk])
    for (let i = window.indexOf(delimiter); i !== -1; i = window.indexOf(delimiter, i + 1)) {
      partStart = Math.max(partStart, seen + i + delimiter.length)
    }
    const keep = Math.min(window.length, delimiter.length - 1)
    seen += window.length - keep
    carry = Buffer.from(window.subarray(window.length - keep))
    return seen + carry.length - partStart <= maxPart
  }
}

/** Reads the body with the limits above; rejects with 413 as soon as one is passed. */
export function readBodyWithin(
  event: H3Event,
  limit: number,
  boundary: string | null,
  partLimit: number = BODY_LIMITS.partBytes,
): Promise<Buffer> {
  const req = event.node.req
  const partOk = boundary ? partWatcher(boundary, partLimit) : () => true
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = []
    let total = 0
    const refuse = (passed: number) => {
      chunks.length = 0
      reject(tooLarge(event, passed))
    }
    const onData = (chunk: Buffer) => {
      total += chunk.length
      if (total > limit) return refuse(limit)
      if (!partOk(chunk)) return refuse(partLimit)
      chunks.push(chunk)
    }
    req.on('data', onData)
    req.once('end', () => resolve(Buffer.concat(chunks, total)))
    req.once('error', reject)
  })
}
