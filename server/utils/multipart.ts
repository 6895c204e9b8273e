// A multipart/form-data reader that keeps file names as sent. h3's readMultipartFormData splits
// each Content-Disposition parameter on every "=", so `filename="PO=1234.pdf"` comes back with
// no file name at all (and the file looks missing). Same result shape as h3's.
import type { H3Event, MultiPartData } from 'h3'

const PARAM = /;\s*([A-Za-z*]+)\s*=\s*(?:"((?:[^"\\]|\\.)*)"|([^;]*))/g

/** The parameters of a Content-Disposition header: `form-data; name="a"; filename="b=c.pdf"`. */
export function dispositionParams(header: string): Record<string, string> {
  const out: Record<string, string> = {}
  for (const m of header.matchAll(PARAM)) {
    // Only `\"` and `\\` are unescaped: browsers send a Windows path's backslashes as they
    // are, and dropping them would turn `..\..\x.png` into a harmless-looking `....x.png`.
    const value = m[2] !== undefined ? m[2].replace(/\\(["\\])/g, '$1') : m[3]!.trim()
    out[m[1]!.toLowerCase()] = value
  }
  return out
}

export function parseMultipart(body: Buffer, boundary: string): MultiPartData[] {
  const delimiter = Buffer.from(`--${boundary}`)
  const parts: MultiPartData[] = []
  let at = body.indexOf(delimiter)
  while (at !== -1) {
    const start = at + delimiter.length
    if (body.subarray(start, start + 2).toString() === '--') break
    const next = body.indexOf(delimiter, start)
    if (next === -1) break
    // A part is CRLF, its headers, a blank line, its bytes, then CRLF before the next delimiter.
    const part = body.subarray(start + 2, next - 2)
    const split = part.indexOf('\r\n\r\n')
    if (split !== -1) {
      const headers = part.subarray(0, split).toString('utf8').split('\r\n')
      const header = (name: string) =>
        headers
          .find(h => h.toLowerCase().startsWith(`${name}:`))
          ?.slice(name.length + 1)
          .trim()
      const params = dispositionParams(
        `;${(header('content-disposition') ?? '').replace(/^[^;]*/, '')}`,
      )
      const type = header('content-type')
      parts.push({
        data: Buffer.from(part.subarray(split + 4)),
        ...(params.name !== undefined ? { name: params.name } : {}),
        ...(params.filename !== undefined ? { filename: params.filename } : {}),
        ...(type ? { type } : {}),
      })
    }
    at = next
  }
  return parts
}

/** The parts of a multipart/form-data request, or undefined when it is not one. */
export async function readMultipartParts(event: H3Event): Promise<MultiPartData[] | undefined> {
  const boundary = (getRequestHeader(event, 'content-type') ?? '').match(
    /^multipart\/form-data;.*boundary="?([^";]+)"?/i,
  )?.[1]
  if (!boundary) return undefined
  const body = await readRawBody(event, false)
  return body ? parseMultipart(Buffer.from(body), boundary) : []
}
