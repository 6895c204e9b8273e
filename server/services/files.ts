// The file adapter: uploaded documents in Nitro storage ("uploads", the local disk outside
// anything served publicly; object storage in production by changing the mount only).
// Types are decided from the bytes, never from the name or the browser's claim.
import { randomBytes } from 'node:crypto'
import { fileTypeFromBuffer } from 'file-type'
import { imageSize } from 'image-size'
import { UPLOAD_LIMIT_BYTES, UPLOAD_TYPES } from '../../shared/schemas/shop'
import {
  ATTACHMENT_LIMIT_BYTES,
  ATTACHMENT_RULE,
  ATTACHMENT_TYPES,
  formatBytes,
  IMAGE_MAX_PIXELS,
  IMAGE_MAX_SIDE,
  type AttachmentType,
} from '../../shared/utils/tickets'
import type { AttachmentKind } from '../../shared/utils/states'

export interface IncomingFile {
  filename?: string
  type?: string
  data: Buffer
}

/** The extension a stored file's name gets, from its sniffed type. */
const EXTENSIONS: Record<(typeof UPLOAD_TYPES)[number] | AttachmentType, string> = {
  'application/pdf': 'pdf',
  'image/png': 'png',
  'image/jpeg': 'jpg',
  'image/webp': 'webp',
  'video/mp4': 'mp4',
  'video/quicktime': 'mov',
  'video/webm': 'webm',
}
type KnownType = keyof typeof EXTENSIONS

// C0 and C1 control characters, DEL, and the bidirectional overrides and isolates that make
// `photo\u202Egnp.exe` read as `photoexe.png`.
// eslint-disable-next-line no-control-regex -- finding control characters is the point
const NAME_CONTROLS = /[\u0000-\u001f\u007f-\u009f\u200e\u200f\u202a-\u202e\u2066-\u2069]/

/**
 * The words for a file name no browser sends for a file a person picked: one with a folder
 * path (`../`, `C:\\`) or control characters. A page sends the plain base name, so only a
 * hand-made request meets this; it is refused rather than quietly cleaned, so whoever sent
 * it learns why.
 */
export function filenameProblem(name: string | undefined): string | null {
  if (!name) return null
  if (NAME_CONTROLS.test(name))
    return 'This file\'s name has control characters in it. Rename the file, then attach it again.'
  if (/[\\/]/.test(name) || /^\.\.?$/.test(name))
    return 'This file\'s name has a folder path in it. Attach the file itself, by its own name.'
  return null
}

/** A field error for an upload that is empty, too large or not a PDF or image; null when fine. */
export async function uploadProblem(
  file: IncomingFile | undefined,
  label: string,
): Promise<{ problem: string } | { mime: (typeof UPLOAD_TYPES)[number] }> {
  if (!file || !file.data.length)
    return { problem: `Attach the ${label} (PDF, PNG, JPEG or WebP).` }
  const badName = filenameProblem(file.filename)
  if (badName) return { problem: badName }
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
  if (mime !== 'application/pdf') {
    const size = imageProblem(file.data)
    if ('problem' in size) return size
  }
  return { mime }
}

/** A safe display name: the original's base name keeping letters, digits and ordinary punctuation
 *  (`PO=1234 (final), v2&3.pdf` stays readable) but no quotes, slashes, semicolons or control
 *  characters, which could break the download's Content-Disposition header; the real extension. */
export function safeFilename(
  original: string | undefined,
  mime: KnownType,
  fallback: string,
) {
  const base = (original ?? '')
    .split(/[\\/]/)
    .pop()!
    .replace(/\.[^.]*$/, '')
    .replace(/[^\w .,()=+&#@!~-]+/g, '')
    .replace(/^[\s.]+/, '')
    .trim()
    .slice(0, 80)
  return `${base || fallback}.${EXTENSIONS[mime]}`
}

/**
 * An image's size read from its header without decoding it (a small file can claim a picture
 * that would take gigabytes to decode): refused past IMAGE_MAX_SIDE on a side or
 * IMAGE_MAX_PIXELS in all.
 */
function imageProblem(data: Buffer): { problem: string } | { width: number, height: number } {
  let size: { width?: number, height?: number }
  try {
    size = imageSize(new Uint8Array(data.buffer, data.byteOffset, data.length))
  } catch {
    return { problem: 'This picture could not be read. Take or save it again, then attach it.' }
  }
  const width = size.width ?? 0
  const height = size.height ?? 0
  if (!width || !height)
    return { problem: 'This picture has no size in it, so it cannot be shown.' }
  if (width > IMAGE_MAX_SIDE || height > IMAGE_MAX_SIDE || width * height > IMAGE_MAX_PIXELS)
    return {
      problem:
        `This picture claims to be ${width} × ${height} pixels, more than Tiltwright opens (at `
        + `most ${IMAGE_MAX_SIDE} on a side and ${IMAGE_MAX_PIXELS / 1_000_000} million in all). `
        + 'Send a smaller one.',
    }
  return { width, height }
}

/** A ticket attachment that passed every check: its type and kind from the bytes, and an
 *  image's declared size. */
export interface CheckedAttachment {
  mime: AttachmentType
  kind: AttachmentKind
  width: number | null
  height: number | null
}

/**
 * Judges a ticket attachment from its bytes: one of ATTACHMENT_TYPES (whatever the name or the
 * browser says), within its kind's size limit, and an image no larger than IMAGE_MAX_SIDE on a
 * side or IMAGE_MAX_PIXELS in all, read from its header without decoding it (a small file can
 * claim a picture that would take gigabytes to decode). A problem is the words for `file`.
 */
export async function attachmentProblem(
  file: IncomingFile | undefined,
): Promise<{ problem: string } | CheckedAttachment> {
  if (!file || !file.data.length) return { problem: `Choose a file to attach. ${ATTACHMENT_RULE}` }
  const badName = filenameProblem(file.filename)
  if (badName) return { problem: badName }
  const sniffed = await fileTypeFromBuffer(file.data)
  const mime = sniffed?.mime as AttachmentType | undefined
  if (!mime || !(mime in ATTACHMENT_TYPES))
    return {
      problem:
        'This file is not a photo, video or PDF that Tiltwright accepts, whatever its name says. '
        + ATTACHMENT_RULE,
    }
  const kind: AttachmentKind = ATTACHMENT_TYPES[mime]
  const limit = ATTACHMENT_LIMIT_BYTES[kind]
  if (file.data.length > limit)
    return {
      problem:
        `This ${kind === 'pdf' ? 'PDF' : kind} is ${formatBytes(file.data.length)}; the limit is `
        + `${formatBytes(limit)}. ${ATTACHMENT_RULE}`,
    }
  if (kind !== 'image') return { mime, kind, width: null, height: null }
  const size = imageProblem(file.data)
  if ('problem' in size) return size
  const { width, height } = size
  return { mime, kind, width, height }
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
