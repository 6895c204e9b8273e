// Demo tickets on the demo build space (scripts/demo-build.ts): one in each state, with a photo
// and a PDF, a tuning sheet, an internal note, a stock reply used, and a replacement shipment
// of a servo sent free from a ticket, as support's help queue and the teacher's pages show them.
import { randomBytes } from 'node:crypto'
import { mkdir, writeFile } from 'node:fs/promises'
import { dirname, join, resolve } from 'node:path'
import { deflateSync } from 'node:zlib'
import { and, asc, eq } from 'drizzle-orm'
import * as schema from '../server/database/schema'
import type { SeedTx } from './demo-build'

const HOUR = 3_600_000
const DAY = 24 * HOUR

export interface DemoTicketPeople {
  teacher: { id: number, name: string }
  builder: { id: number, name: string }
  support: { id: number, name: string }
  admin: { id: number, name: string }
}

// A 64 × 48 picture of a beam on a chalk background, made here so the demo carries no binary.
function demoPhoto(): Buffer {
  const w = 64
  const h = 48
  const rows: number[] = []
  for (let y = 0; y < h; y++) {
    rows.push(0)
    for (let x = 0; x < w; x++) {
      const beam = Math.abs(y - 30 + Math.round((x - 32) / 8)) < 2
      const ball = (x - 40) ** 2 + (y - 24) ** 2 < 16
      rows.push(...(ball ? [90, 96, 110] : beam ? [31, 72, 110] : [247, 244, 236]))
    }
  }
  const table = Array.from({ length: 256 }, (_, n) => {
    let c = n
    for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1
    return c >>> 0
  })
  const crc = (b: Buffer) => {
    let c = 0xffffffff
    for (const x of b) c = table[(c ^ x) & 0xff]! ^ (c >>> 8)
    return (c ^ 0xffffffff) >>> 0
  }
  const chunk = (type: string, data: Buffer) => {
    const body = Buffer.concat([Buffer.from(type), data])
    const out = Buffer.alloc(12 + data.length)
    out.writeUInt32BE(data.length, 0)
    body.copy(out, 4)
    out.writeUInt32BE(crc(body), 8 + data.length)
    return out
  }
  const ihdr = Buffer.alloc(13)
  ihdr.writeUInt32BE(w, 0)
  ihdr.writeUInt32BE(h, 4)
  ihdr[8] = 8
  ihdr[9] = 2
  return Buffer.concat([
    Buffer.from('89504e470d0a1a0a', 'hex'),
    chunk('IHDR', ihdr),
    chunk('IDAT', deflateSync(Buffer.from(rows))),
    chunk('IEND', Buffer.alloc(0)),
  ])
}

const DEMO_PDF = Buffer.from(
  '%PDF-1.4\n1 0 obj<</Type/Catalog/Pages 2 0 R>>endobj\n2 0 obj<</Type/Pages/Kids[]/Count '
  + '0>>endobj\ntrailer<</Root 1 0 R>>\n%%EOF\n',
)

/** Writes a file where the app's `uploads` storage (the fs driver) reads the key. */
async function storeDemoFile(data: Buffer, uploadDir?: string): Promise<string> {
  const key = `ticket:demo:${randomBytes(16).toString('hex')}`
  const base = uploadDir || process.env.TILTWRIGHT_UPLOAD_DIR || resolve('data/uploads')
  const path = join(base, ...key.split(':'))
  await mkdir(dirname(path), { recursive: true })
  await writeFile(path, data)
  return key
}

export async function seedDemoTickets(
  tx: SeedTx,
  space: { orderId: number, number: string, rigIds: number[] },
  people: DemoTicketPeople,
  uploadDir?: string,
  now = new Date(),
) {
  const at = (ago: number) => new Date(now.getTime() - ago)
  const [order] = await tx.select().from(schema.orders).where(eq(schema.orders.id, space.orderId))
  const [membership] = await tx
    .select()
    .from(schema.buildMembers)
    .where(eq(schema.buildMembers.userId, people.builder.id))
  const builderRig = membership?.rigId ?? space.rigIds[0]!
  const otherRig = space.rigIds.find(id => id !== builderRig)!
  const [sheet] = await tx
    .select({ id: schema.tuningSheets.id })
    .from(schema.tuningSheets)
    .where(eq(schema.tuningSheets.rigId, builderRig))
    .orderBy(asc(schema.tuningSheets.createdAt))
    .limit(1)

  const [rails, level] = await Promise.all(
    [
      {
        title: 'Clean the rails, then test the sensing',
        body:
          'Thanks for the clear description. A ball that is not sensed at one end is nearly '
          + 'always the contact between ball and rails: wipe both rails along their whole length '
          + 'with a dry cloth, make sure the ball is plain steel (not coated), then roll it slowly '
          + 'from end to end while the live reading is on. Unplug the servo while you do this, '
          + 'so the beam cannot move under your fingers.',
      },
      {
        title: 'Level the beam before retuning',
        body:
          'Before changing any gain, level the beam: power off, set the servo to its centre, and '
          + 'adjust the pushrod until the beam sits flat. Keep fingers clear of the lever arm '
          + 'whenever the controller is powered, and follow your school\'s workshop rules.',
      },
    ].map(async (r) => {
      const [row] = await tx
        .insert(schema.stockReplies)
        .values({ ...r, createdById: people.support.id, createdAt: at(30 * DAY) })
        .$returningId()
      return row!.id
    }),
  )

  const ticket = async (t: {
    rigId: number | null
    subject: string
    status: 'needs reply' | 'awaiting builder' | 'resolved'
    priority: 'low' | 'normal' | 'urgent'
    assigneeId: number | null
    openedById: number
    ago: number
    changedAgo: number
  }) => {
    const [row] = await tx
      .insert(schema.tickets)
      .values({
        schoolId: order!.schoolId,
        orderId: space.orderId,
        rigId: t.rigId,
        subject: t.subject,
        status: t.status,
        priority: t.priority,
        assigneeId: t.assigneeId,
        openedById: t.openedById,
        createdAt: at(t.ago),
        lastMessageAt: at(t.changedAgo),
        statusChangedAt: at(t.changedAgo),
        resolvedAt: t.status === 'resolved' ? at(t.changedAgo) : null,
      })
      .$returningId()
    return row!.id
  }
  const message = async (
    ticketId: number,
    m: {
      by: number
      body: string
      ago: number
      internal?: boolean
      sheetId?: number | null
      stockReplyId?: number
      files?: { data: Buffer, filename: string, kind: 'image' | 'pdf', type: string }[]
    },
  ) => {
    const [row] = await tx
      .insert(schema.ticketMessages)
      .values({
        ticketId,
        authorId: m.by,
        internal: m.internal ?? false,
        body: m.body,
        sheetId: m.sheetId ?? null,
        stockReplyId: m.stockReplyId ?? null,
        createdAt: at(m.ago),
      })
      .$returningId()
    for (const f of m.files ?? []) {
      await tx.insert(schema.ticketAttachments).values({
        ticketId,
        messageId: row!.id,
        kind: f.kind,
        storageKey: await storeDemoFile(f.data, uploadDir),
        filename: f.filename,
        contentType: f.type,
        size: f.data.length,
        width: f.kind === 'image' ? 64 : null,
        height: f.kind === 'image' ? 48 : null,
        uploadedById: m.by,
        createdAt: at(m.ago),
      })
    }
  }
  type DemoFile = { data: Buffer, filename: string, kind: 'image' | 'pdf', type: string }
  const photo: DemoFile = {
    data: demoPhoto(),
    filename: 'rail-end.png',
    kind: 'image',
    type: 'image/png',
  }
  const wiring: DemoFile = {
    data: DEMO_PDF,
    filename: 'wiring-check.pdf',
    kind: 'pdf',
    type: 'application/pdf',
  }

  // Needs reply: the builder's ball is not sensed at one end (a photo and their sheet).
  const sensed = await ticket({
    rigId: builderRig,
    subject: 'The ball is not sensed at the far end',
    status: 'needs reply',
    priority: 'urgent',
    assigneeId: people.support.id,
    openedById: people.builder.id,
    ago: 26 * HOUR,
    changedAgo: 3 * HOUR,
  })
  await message(sensed, {
    by: people.builder.id,
    body:
      'When the ball rolls past the last 4 cm the reading jumps back to the middle and the beam '
      + 'tips the wrong way. Photo of the rail end attached, and my latest sheet.',
    ago: 26 * HOUR,
    sheetId: sheet?.id ?? null,
    files: [photo],
  })
  await message(sensed, {
    by: people.support.id,
    internal: true,
    body:
      'Rails from the spring batch had a little oxidation at the ends. If cleaning does not fix '
      + 'it, send a new sensor track.',
    ago: 3 * HOUR,
  })

  // Awaiting builder: the teacher asks about servo buzz; support answered from a stock reply.
  const buzz = await ticket({
    rigId: otherRig,
    subject: 'Servo buzzes and the beam jitters at rest',
    status: 'awaiting builder',
    priority: 'normal',
    assigneeId: people.support.id,
    openedById: people.teacher.id,
    ago: 3 * DAY,
    changedAgo: 2 * DAY,
  })
  await message(buzz, {
    by: people.teacher.id,
    body:
      'The group on this rig raised the derivative gain and now the servo hums and the beam '
      + 'twitches even when the ball sits still. Their wiring check is attached.',
    ago: 3 * DAY,
    files: [wiring],
  })
  await message(buzz, {
    by: people.support.id,
    body:
      'Before changing any gain, level the beam: power off, set the servo to its centre, and '
      + 'adjust the pushrod until the beam sits flat. Then lower the derivative gain by a '
      + 'third: a buzz at rest is sensor noise made loud by the derivative term. Keep fingers '
      + 'clear of the lever arm whenever the controller is powered.',
    ago: 2 * DAY,
    stockReplyId: level,
  })

  // Resolved: a servo horn arrived bent; support sent a new servo free of charge.
  const bent = await ticket({
    rigId: null,
    subject: 'A servo arrived with a bent output shaft',
    status: 'resolved',
    priority: 'low',
    assigneeId: people.admin.id,
    openedById: people.teacher.id,
    ago: 5 * DAY,
    changedAgo: 2 * DAY,
  })
  await message(bent, {
    by: people.teacher.id,
    body: 'One of the six servos has a bent shaft: the horn wobbles when it turns.',
    ago: 5 * DAY,
  })
  await message(bent, {
    by: people.admin.id,
    body:
      'Sorry about that. A replacement servo is on its way, free of charge; the tracking is on '
      + 'this ticket and your order.',
    ago: 4 * DAY,
  })
  await message(bent, {
    by: people.teacher.id,
    body: 'It arrived and works. Thank you!',
    ago: 2 * DAY,
  })
  const [servo] = await tx
    .select({ id: schema.products.id, name: schema.products.name })
    .from(schema.products)
    .where(and(eq(schema.products.kind, 'part'), eq(schema.products.slug, 'servo-s20')))
    .limit(1)
  const [batch] = servo
    ? await tx
        .select()
        .from(schema.batches)
        .where(eq(schema.batches.productId, servo.id))
        .orderBy(asc(schema.batches.builtOn))
        .limit(1)
    : []
  if (servo && batch && batch.quantityBuilt - batch.reserved >= 1) {
    const tracking = '1Z4F72W10398765432'
    const [ship] = await tx
      .insert(schema.shipments)
      .values({
        orderId: space.orderId,
        carrier: 'ups',
        tracking,
        kind: 'replacement',
        ticketId: bent,
        createdById: people.admin.id,
        shippedAt: at(4 * DAY),
      })
      .$returningId()
    await tx
      .insert(schema.shipmentItems)
      .values({ shipmentId: ship!.id, productId: servo.id, quantity: 1 })
    await tx
      .update(schema.batches)
      .set({ reserved: batch.reserved + 1 })
      .where(eq(schema.batches.id, batch.id))
    await tx.insert(schema.stockReservations).values({
      orderId: space.orderId,
      productId: servo.id,
      batchId: batch.id,
      quantity: 1,
      status: 'sent',
      shipmentId: ship!.id,
      createdAt: at(4 * DAY),
    })
    await tx.insert(schema.orderEvents).values({
      orderId: space.orderId,
      kind: 'replacement-shipped',
      message:
        `Replacement parts sent free by ${people.admin.name}: ${servo.name} × 1 for ticket `
        + `T-${bent}; UPS, tracking ${tracking}.`,
      actorId: people.admin.id,
      createdAt: at(4 * DAY),
    })
  }
  return { tickets: [sensed, buzz, bent], stockReplies: [rails, level] }
}
