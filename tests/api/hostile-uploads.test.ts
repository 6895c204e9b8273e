// One corpus of hostile files, sent to every route that takes a file: a ticket's attachment, a
// purchase order's document and its tax-exemption certificate. Each is refused on its own field
// with words that say why, and nothing is kept: no pending attachment, no order.
import { beforeAll, describe, expect, it } from 'vitest'
import type { Client } from '../helpers/client'
import { sql } from '../helpers/db'
import { PDF_BYTES, PNG_BYTES, newTeacher, poForm, productBySlug } from '../helpers/shop'
import { pngClaiming } from '../helpers/tickets'
import { UPLOAD_LIMIT_BYTES } from '../../shared/schemas/shop'
import { ATTACHMENT_LIMIT_BYTES } from '../../shared/utils/tickets'

interface Hostile {
  what: string
  data: (limit: number) => Buffer
  name: string
  type: string
  answer: RegExp
}

const NOT_ACCEPTED = /not a photo, video or PDF|must be a PDF, PNG, JPEG or WebP/
const CORPUS: Hostile[] = [
  {
    what: 'HTML with a script, named as a picture',
    data: () => Buffer.from('<!doctype html><script>alert(document.cookie)</script>'),
    name: 'rig.png',
    type: 'image/png',
    answer: NOT_ACCEPTED,
  },
  {
    what: 'an SVG with a script, named as a picture',
    data: () =>
      Buffer.from('<svg xmlns="http://www.w3.org/2000/svg" onload="alert(1)"><script>'
        + 'alert(2)</script></svg>'),
    name: 'rig.png',
    type: 'image/png',
    answer: NOT_ACCEPTED,
  },
  {
    what: 'a PDF whose first bytes are wrong',
    data: () => Buffer.concat([Buffer.from('%PDX'), PDF_BYTES.subarray(4)]),
    name: 'scan.pdf',
    type: 'application/pdf',
    answer: NOT_ACCEPTED,
  },
  {
    what: 'a ZIP archive named as a PDF',
    data: () => Buffer.from('504b0304140000000800' + '00'.repeat(20), 'hex'),
    name: 'scan.pdf',
    type: 'application/pdf',
    answer: NOT_ACCEPTED,
  },
  {
    what: 'a file one byte over the limit',
    data: limit => Buffer.concat([PDF_BYTES, Buffer.alloc(limit + 1 - PDF_BYTES.length, 32)]),
    name: 'scan.pdf',
    type: 'application/pdf',
    answer: /larger than|the limit is/,
  },
  {
    what: 'a small PNG that claims 60000 × 60000 pixels (a decompression bomb)',
    data: () => pngClaiming(60_000, 60_000),
    name: 'photo.png',
    type: 'image/png',
    answer: /60000 × 60000 pixels/,
  },
  {
    what: 'a name that climbs out of its folder',
    data: () => PDF_BYTES,
    name: '../../../etc/cron.d/job.pdf',
    type: 'application/pdf',
    answer: /folder path/,
  },
  {
    what: 'a Windows path',
    data: () => PDF_BYTES,
    name: '..\\..\\Windows\\System32\\scan.pdf',
    type: 'application/pdf',
    answer: /folder path/,
  },
  {
    what: 'a name with terminal control characters',
    data: () => PDF_BYTES,
    name: 'scan\u0007\u001b[2J.pdf',
    type: 'application/pdf',
    answer: /control characters/,
  },
  {
    what: 'a name that reads backwards past a right-to-left override',
    data: () => PNG_BYTES,
    name: 'photo\u202Egnp.exe',
    type: 'image/png',
    answer: /control characters/,
  },
]

interface Target {
  route: string
  field: string
  limit: number
  send: (c: Client, file: { data: Buffer, name: string, type: string }) => Promise<{
    status: number
    body: any
  }>
  /** How many of what the route makes the teacher has (pending files, orders). */
  kept: (c: Client) => Promise<number>
}

let teacher: Client
let teacherId: number
let lines: { productId: number, quantity: number }[]

beforeAll(async () => {
  const t = await newTeacher('corpus')
  teacher = t.client
  teacherId = t.user.id
  lines = [{ productId: (await productBySlug('steel-balls')).id, quantity: 1 }]
})

const orders = async (c: Client) => ((await c.get('/api/orders')).body.data as unknown[]).length

const TARGETS: Target[] = [
  {
    route: 'POST /api/ticket-attachments',
    field: 'file',
    limit: ATTACHMENT_LIMIT_BYTES.pdf,
    send: (c, file) => {
      const f = new FormData()
      f.set('file', new Blob([new Uint8Array(file.data)], { type: file.type }), file.name)
      return c.post('/api/ticket-attachments', f)
    },
    kept: async () =>
      Number((await sql(
        'SELECT count(*) AS n FROM ticket_attachments WHERE uploaded_by_id = ?',
        [teacherId],
      ))[0].n),
  },
  {
    route: 'POST /api/checkout/purchase-order (the PO)',
    field: 'poFile',
    limit: UPLOAD_LIMIT_BYTES,
    send: (c, file) => c.post('/api/checkout/purchase-order', poForm({ lines, poFile: file })),
    kept: orders,
  },
  {
    route: 'POST /api/checkout/purchase-order (the certificate)',
    field: 'taxCertificate',
    limit: UPLOAD_LIMIT_BYTES,
    send: (c, file) =>
      c.post('/api/checkout/purchase-order', poForm({ lines, taxCertificate: file })),
    kept: orders,
  },
]

describe.each(TARGETS)('$route refuses the hostile corpus on `$field`', (target) => {
  it.each(CORPUS)('$what', async (hostile) => {
    const before = await target.kept(teacher)
    const r = await target.send(teacher, {
      data: hostile.data(target.limit),
      name: hostile.name,
      type: hostile.type,
    })
    expect(r.status, JSON.stringify(r.body)).toBe(422)
    expect(Object.keys(r.body.data.fields)).toEqual([target.field])
    expect(r.body.data.fields[target.field]).toMatch(hostile.answer)
    expect(await target.kept(teacher)).toBe(before)
  })

  it('takes a plain file with an ordinary name, so the refusals above are about the file',
    async () => {
      const before = await target.kept(teacher)
      const r = await target.send(teacher, {
        data: PDF_BYTES,
        name: 'scan (final), v2.pdf',
        type: 'application/pdf',
      })
      expect([200, 201], JSON.stringify(r.body)).toContain(r.status)
      expect(await target.kept(teacher)).toBe(before + 1)
    })
})
