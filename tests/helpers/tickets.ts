// Ticket test helpers: a school's build space with two rigs and a builder on each, tickets
// opened through the API, uploads as a page sends them, and hostile files made in the test.
import { deflateSync } from 'node:zlib'
import { expect } from 'vitest'
import type { Client } from './client'
import { board, joinAs, newCode, orderOfKits } from './build'

/** Where the server mails new tickets (runtimeConfig.supportEmail's default). */
export const SUPPORT_ADDRESS = 'support@tiltwright.test'

/**
 * A teacher's approved order of two kits: rig one with builder `one`, rig two with builder
 * `two` (both members of the same build space).
 */
export async function ticketSpace(tag: string) {
  const { admin, teacher, orderId, kit } = await orderOfKits(tag, 2)
  const rigs = (await board(teacher.client, orderId)).rigs as { id: number, serial: string }[]
  const { code } = await newCode(teacher.client, orderId)
  const one = await joinAs(code, 'Ada R.')
  const two = await joinAs(code, 'Ben K.')
  for (const [b, rig] of [[one, rigs[0]!], [two, rigs[1]!]] as const) {
    const r = await teacher.client.patch(`/api/orders/${orderId}/builders/${b.user.id}`, {
      rigId: rig.id,
    })
    expect(r.status, JSON.stringify(r.body)).toBe(200)
  }
  return { admin, teacher, orderId, kit, rigs, one, two }
}

export async function openTicket(
  client: Client,
  body: Record<string, unknown>,
): Promise<number> {
  const r = await client.post('/api/tickets', {
    subject: 'The ball will not settle',
    message: 'It rolls to the end and stays there.',
    ...body,
  })
  expect(r.status, JSON.stringify(r.body)).toBe(201)
  return r.body.id as number
}

/** POST /api/ticket-attachments with one part named `file`. */
export function upload(client: Client, data: Buffer, name: string, type = 'image/png') {
  const f = new FormData()
  f.set('file', new Blob([new Uint8Array(data)], { type }), name)
  return client.post('/api/ticket-attachments', f)
}

export async function uploaded(client: Client, data: Buffer, name: string, type?: string) {
  const r = await upload(client, data, name, type)
  expect(r.status, JSON.stringify(r.body)).toBe(201)
  return r.body as { id: number, filename: string, url: string, kind: string }
}

// PNG chunks: length, type, data, CRC-32 of type + data (the PNG specification, section 5.3).
const CRC_TABLE = Array.from({ length: 256 }, (_, n) => {
  let c = n
  for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1
  return c >>> 0
})
function crc32(bytes: Buffer) {
  let c = 0xffffffff
  for (const b of bytes) c = CRC_TABLE[(c ^ b) & 0xff]! ^ (c >>> 8)
  return (c ^ 0xffffffff) >>> 0
}
function chunk(type: string, data: Buffer) {
  const body = Buffer.concat([Buffer.from(type, 'ascii'), data])
  const len = Buffer.alloc(4)
  len.writeUInt32BE(data.length)
  const crc = Buffer.alloc(4)
  crc.writeUInt32BE(crc32(body))
  return Buffer.concat([len, body, crc])
}

/** A small, well-formed PNG whose header claims `width` × `height` pixels (8-bit greyscale):
 *  its one row of compressed data is tiny, but a decoder would allocate the whole picture. */
export function pngClaiming(width: number, height: number) {
  const ihdr = Buffer.alloc(13)
  ihdr.writeUInt32BE(width, 0)
  ihdr.writeUInt32BE(height, 4)
  ihdr[8] = 8 // bit depth
  ihdr[9] = 0 // greyscale
  return Buffer.concat([
    Buffer.from('89504e470d0a1a0a', 'hex'),
    chunk('IHDR', ihdr),
    chunk('IDAT', deflateSync(Buffer.alloc(1 + Math.min(width, 1024)))),
    chunk('IEND', Buffer.alloc(0)),
  ])
}

/** A small, complete RGB PNG (a steel-blue beam on a chalk background) that any decoder shows. */
export function validPng(width: number, height: number) {
  const ihdr = Buffer.alloc(13)
  ihdr.writeUInt32BE(width, 0)
  ihdr.writeUInt32BE(height, 4)
  ihdr[8] = 8 // bit depth
  ihdr[9] = 2 // truecolour
  const rows: Buffer[] = []
  for (let y = 0; y < height; y++) {
    const row = Buffer.alloc(1 + width * 3)
    const beam = Math.abs(y - height / 2) < height / 10
    for (let x = 0; x < width; x++)
      row.set(beam ? [0x2b, 0x59, 0x8c] : [0xf7, 0xf6, 0xf2], 1 + x * 3)
    rows.push(row)
  }
  return Buffer.concat([
    Buffer.from('89504e470d0a1a0a', 'hex'),
    chunk('IHDR', ihdr),
    chunk('IDAT', deflateSync(Buffer.concat(rows))),
    chunk('IEND', Buffer.alloc(0)),
  ])
}
