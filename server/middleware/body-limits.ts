// Every request body passes through the limits of server/utils/body-limits.ts before any route
// reads it; the routes then read the checked bytes (h3's readBody/readMultipartFormData take
// them from event._requestBody).
const WITH_BODY = new Set(['POST', 'PUT', 'PATCH', 'DELETE'])

export default defineEventHandler(async (event) => {
  if (!WITH_BODY.has(event.method)) return
  // A request made inside the server (Nitro's local fetch) carries its body already and never
  // streams it; a stream that has ended has nothing left to read.
  const req = event.node.req as typeof event.node.req & { body?: unknown, rawBody?: unknown }
  if (
    event._requestBody
    || req.body !== undefined
    || req.rawBody !== undefined
    || req.readableEnded
  )
    return
  const type = getRequestHeader(event, 'content-type') ?? ''
  const boundary = type.startsWith('multipart/form-data')
    ? (type.match(/boundary="?([^";]+)"?/i)?.[1] ?? null)
    : null
  // A ticket attachment is one file that may be a short video: its own, larger limits.
  const attachment = boundary && event.path.split('?')[0] === ATTACHMENT_UPLOAD_PATH
  const limit = attachment
    ? BODY_LIMITS.attachmentBytes
    : boundary
      ? BODY_LIMITS.multipartBytes
      : BODY_LIMITS.bodyBytes
  const partLimit = attachment ? BODY_LIMITS.attachmentBytes : BODY_LIMITS.partBytes
  const declared = Number(getRequestHeader(event, 'content-length') || 0)
  if (declared > limit) throw tooLarge(event, limit)
  const chunked = /chunked/i.test(getRequestHeader(event, 'transfer-encoding') ?? '')
  if (!declared && !chunked) return
  if (attachment) takeAttachmentSlot(event)
  const body = await readBodyWithin(event, limit, boundary, partLimit)
  // h3 takes a Buffer here as it is (readRawBody checks Buffer.isBuffer first).
  if (body.length) event._requestBody = body as unknown as BodyInit
})
