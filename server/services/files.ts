// The file adapter: uploaded documents in Nitro storage ("uploads", the local disk outside
// anything served publicly; object storage in production by changing the mount only).
// Types are decided from the bytes, never from the name or the browser's claim.
import { randomBytes } from 'node:crypto'
import { fileTypeFromBuffer } from 'file-type'
import { UPLOAD_LIMIT_BYTES, UPLOAD_TYPES } from '../../shared/schemas/shop'

export interface IncomingFile {
  filename?: string
  type?: string
  data: Buffer
}

const EXTENSIONS: Record<(typeof UPLOAD_TYPES)[number], string> = {
  'application/pdf': 'pdf',
  'image/png': 'png',
  'image/jpeg': 'jpg',
  'image/webp': 'webp',
}

/** A field error for an upload that is empty, too large or not a PDF or image; null when fine. */
export async function uploadProblem(
  file: IncomingFile | undefined,
  label: string,
): Promise<{ problem: string } | { mime: (typeof UPLOAD_TYPES)[number] }> {
  if (!file || !file.data.length)
    return { problem: `Attach the ${label} (PDF, PNG, JPEG or WebP).` }
  if (file.data.length > UPLOAD_LIMIT_BYTES)
    return { problem: `The ${label} is larger than ${UPLOAD_LIMIT_BYTES / 1024 / 1024} MB.` }
  const sniffed = await fileTypeFromBuffer(file.data)
  const mime = sniffed?.mime as (typeof UPLOAD_TYPES)[number] | undefined
  if (!mime || !UPLOAD_TYPES.includes(mime))
    return {
      problem:
        `The ${label} must be a PDF, PNG, JPEG or WebP file; this one is not, whatever its `
        + `name says.`,
    }
  return { mime }
}

/** A safe display name: the original's base name keeping letters, digits and ordinary punctuation
 *  (`PO=1234 (final), v2&3.pdf` stays readable) but no quotes, slashes, semicolons or control
 *  characters, which could break the download's Content-Disposition header; the real extension. */
export function safeFilename(
  original: string | undefined,
  mime: (typeof UPLOAD_TYPES)[number],
  fallback: string,
) {
  const base = (original ?? '')
    .split(/[\\/]/)
    .pop()!
    .replace(/\.[^.]*$/, '')
    .replace(/[^\w .,()=+&#@!~-]+/g, '')
    .trim()
    .slice(0, 80)
  return `${base || fallback}.${EXTENSIONS[mime]}`
}

function uploads() {
  return useStorage('uploads')
}

export async function storeFile(prefix: string, data: Buffer): Promise<string> {
  const key = `${prefix}:${new Date().toISOString().slice(0, 7)}:${randomBytes(16).toString('hex')}`
  await uploads().setItemRaw(key, data)
  return key
}

export async function readStoredFile(key: string): Promise<Buffer | null> {
  const raw = await uploads().getItemRaw(key)
  if (!raw) return null
  return Buffer.isBuffer(raw) ? raw : Buffer.from(raw as Uint8Array)
}

export async function removeStoredFile(key: string) {
  await uploads().removeItem(key)
}
