// The demo tickets on the demo build space (order TW-10001 of Wrenfield Middle School): six
// tickets in every state, their threads from builders, the teacher and support, photos and a PDF
// in the upload storage, a tuning sheet attached, stock replies and one used, an internal note,
// and a replacement shipment on the order (docs/tickets.md, "The demo tickets"). Every time is
// relative to the moment of seeding; every name is invented.
import { randomBytes } from 'node:crypto'
import { mkdirSync, writeFileSync } from 'node:fs'
import { dirname, join } from 'node:path'
import { deflateSync } from 'node:zlib'
import { asc, eq, inArray } from 'drizzle-orm'
import PDFDocument from 'pdfkit'
import * as schema from '../server/database/schema'
import type { SeedTx } from './demo-build'
import { ORDER_FLOW, flowWording } from '../shared/utils/order-flow'
import { replacementReference } from '../shared/utils/shipments'
import { palette } from '../shared/utils/palette'
import type { Role } from '../shared/utils/roles'
import type { TicketPriority, TicketStatus } from '../shared/utils/states'
import { statusAfterMessage, ticketRef } from '../shared/utils/tickets'

const MINUTE = 60_000
const HOUR = 60 * MINUTE
const DAY = 24 * HOUR

/** What the demo tickets need from the demo build space and the demo people. */
export interface DemoTicketPeople {
  schoolId: number
  teacher: { id: number, name: string }
  builder: { id: number, name: string }
  support: { id: number, name: string }
  admin: { id: number, name: string }
}
export interface DemoTicketSpace {
  orderId: number
  rigIds: number[]
}

/** Who writes: the demo people, or a code-joined builder of the class by display name. */
type Who = 'teacher' | 'builder' | 'support' | 'admin' | 'Theo M.' | 'Priya K.' | 'Sam W.'
  | 'Lena D.'

type FileKey = 'rig-photo' | 'rail-photo' | 'lever-photo' | 'readings-pdf'
type StockKey = 'rails' | 'video' | 'replacement' | 'more-kd'

interface DemoMessage {
  ago: number
  by: Who
  body: string
  /** A staff note: never shown to the customer side. */
  internal?: boolean
  /** A staff reply that resolves the ticket. */
  resolve?: boolean
  files?: FileKey[]
  /** Attach the rig's first tuning sheet. */
  sheet?: boolean
  stockReply?: StockKey
}

interface DemoTicket {
  /** The rig's index in the build space (0 = TW-10001-01); null for the order as a whole. */
  rig: number | null
  subject: string
  priority: TicketPriority
  assignee: 'support' | 'admin' | null
  messages: DemoMessage[]
  /** Free parts sent with the staff message at this index. */
  replacement?: {
    withMessage: number
    parts: { slug: string, quantity: number }[]
    carrier: string
    tracking: string
  }
}

/** Saved answers, in Tiltwright's words (support edits them before sending). */
const STOCK_REPLIES: Record<StockKey, { title: string, body: string }> = {
  'rails': {
    title: 'Check the rail contacts',
    body:
      'Thanks for the details. Jumps and drop-outs in the position reading nearly always come '
      + 'from the contact between the ball and the rails. Could you try this, in order?\n\n'
      + '- Unplug the servo first, then wipe both rails and the ball with a lint-free cloth and '
      + 'isopropyl alcohol.\n'
      + '- Rub any dull grey patches on the rails with a fine abrasive pad and wipe again.\n'
      + '- Look along the track at eye level: the ball should sit on both rails all the way.\n'
      + '- Wiggle each sensor wire gently and watch the reading: a jump means a loose joint.\n\n'
      + 'Then tell us what the reading does, with a photo of the rails if anything looks odd. '
      + 'The troubleshooting guide has the same steps under "The readings jump around" (Help, '
      + 'at the foot of every page).',
  },
  'video': {
    title: 'Send us a short video',
    body:
      'Thanks! A short video would help us see what the rig does: 10 to 20 seconds from the '
      + 'side, with the whole beam and the servo in view, while the loop runs. Attach it to '
      + 'your reply (phone videos are fine). Keep hands clear of the lever arm while you film.',
  },
  'replacement': {
    title: 'Replacement part on its way',
    body:
      'We are sending the replacement free of charge; it is on the order\'s page under '
      + 'Shipments, with its tracking. Until it arrives, keep the rig unplugged if a part is '
      + 'loose or bent. Reply here if anything is still not right once it is fitted.',
  },
  'more-kd': {
    title: 'Raise the derivative gain',
    body:
      'Your tuning sheet shows why the ball keeps swinging: the derivative gain (Kd) is well '
      + 'below the Gain Planner\'s suggestion for this rig, so nothing brakes the ball as it '
      + 'nears the setpoint. Raise Kd in steps of about 20 % (or go back to the planner\'s '
      + 'value) and save a sheet after each try, saying how the rig behaved. Keep hands clear '
      + 'of the linkage while the loop runs.',
  },
}

const TICKETS: DemoTicket[] = [
  {
    // Needs reply, urgent: cleaned as asked, still jumping; support noted a worn rail.
    rig: 2,
    subject: 'Readings jump near the far end of the track',
    priority: 'urgent',
    assignee: 'support',
    messages: [
      {
        ago: 24 * HOUR,
        by: 'Sam W.',
        body:
          'When I calibrate, the readings are fine up to about 28 cm and then jump around by a '
          + 'lot. The ball is still. I put a photo of the rails.',
        files: ['rail-photo'],
      },
      {
        ago: 22 * HOUR,
        by: 'support',
        body: STOCK_REPLIES.rails.body,
        stockReply: 'rails',
      },
      {
        ago: 21 * HOUR,
        by: 'support',
        internal: true,
        body:
          'The photo shows a dark patch on the resistive rail at about 30 cm. If cleaning does '
          + 'not help, it is a worn track: send a Two-Rail Sensor Track from RT-11.',
      },
      {
        ago: 3 * HOUR,
        by: 'teacher',
        body:
          'We cleaned both rails and the ball in today\'s lesson. It still jumps past 30 cm. '
          + 'Sam measured the readings again; they are in the PDF. Could you look before Sam\'s '
          + 'next lesson tomorrow?',
        files: ['readings-pdf'],
      },
    ],
  },
  {
    // Awaiting builder: a sheet attached, support answered.
    rig: 1,
    subject: 'Ball keeps swinging past the middle',
    priority: 'normal',
    assignee: 'support',
    messages: [
      {
        ago: 28 * MINUTE,
        by: 'builder',
        body:
          'We loaded our gains and the ball swings past the middle and back, again and again. '
          + 'It never stops. Our sheet is attached, and a photo of the rig.',
        sheet: true,
        files: ['rig-photo'],
      },
      {
        ago: 20 * MINUTE,
        by: 'support',
        internal: true,
        body: 'Kd on the sheet is about a third of the planner\'s suggestion. Plain tuning, no '
          + 'parts needed.',
      },
      {
        ago: 18 * MINUTE,
        by: 'support',
        body: STOCK_REPLIES['more-kd'].body,
        stockReply: 'more-kd',
      },
    ],
  },
  {
    // Resolved, with free parts sent on the order.
    rig: null,
    subject: 'Bent lever arm and lost balls after a fall',
    priority: 'normal',
    assignee: 'support',
    messages: [
      {
        ago: 3 * DAY + 2 * HOUR,
        by: 'teacher',
        body:
          'One of our rigs fell off the bench: the beam cracked (we swapped in a spare) and '
          + 'the lever arm is bent, see the photo. Two balls rolled away for good. Could we get '
          + 'a lever arm set and some balls?',
        files: ['lever-photo'],
      },
      {
        ago: 3 * DAY,
        by: 'support',
        body:
          'Sorry to hear about the fall! We are sending a Lever Arm and Pushrod Set and a '
          + 'Steel Ball Set free of charge; they are on the order\'s page under Shipments, with '
          + 'the tracking. Until they arrive, keep that rig unplugged. Reply here if anything '
          + 'is still not right once they are fitted.',
        stockReply: 'replacement',
        resolve: true,
      },
    ],
    replacement: {
      withMessage: 1,
      parts: [
        { slug: 'lever-arm', quantity: 1 },
        { slug: 'steel-balls', quantity: 1 },
      ],
      carrier: 'usps',
      tracking: '9400111899223418870042',
    },
  },
  {
    // Resolved, then reopened by a builder's reply.
    rig: 0,
    subject: 'The setpoint knob makes the ball jump',
    priority: 'normal',
    assignee: null,
    messages: [
      {
        ago: 3 * DAY + 5 * HOUR,
        by: 'Theo M.',
        body: 'When we turn the knob a little the ball jumps to a new place and swings.',
      },
      {
        ago: 3 * DAY + 4 * HOUR,
        by: 'support',
        body:
          'Read the knob about 10 times a second, average a few readings and ignore changes '
          + 'smaller than 3 counts. Then let the setpoint move only a few centimetres per '
          + 'second. "The setpoint knob is touchy or noisy" in the troubleshooting guide has '
          + 'the details.',
      },
      {
        ago: 2 * DAY + 6 * HOUR,
        by: 'Theo M.',
        body: 'The averaging fixed it. Thank you!',
      },
      {
        ago: 2 * DAY + 5 * HOUR,
        by: 'support',
        body: 'Great to hear. We will close this one; reply here if it comes back.',
        resolve: true,
      },
      {
        ago: HOUR,
        by: 'Priya K.',
        body:
          'It is jumpy again since we moved the rig to another bench. The knob crackles when we '
          + 'turn it.',
      },
    ],
  },
  {
    // Needs reply, low, unassigned: just opened.
    rig: 3,
    subject: 'Servo lead does not reach the controller',
    priority: 'low',
    assignee: null,
    messages: [
      {
        ago: 9 * MINUTE,
        by: 'Lena D.',
        body:
          'The servo wire is about 5 cm too short to reach the controller board. Is there an '
          + 'extension lead?',
      },
    ],
  },
  {
    // Resolved by an admin: a power bank that switched itself off.
    rig: 0,
    subject: 'Rig stops balancing after about ten minutes',
    priority: 'low',
    assignee: 'admin',
    messages: [
      {
        ago: 5 * DAY + 3 * HOUR,
        by: 'teacher',
        body:
          'Bench 1\'s rig balances well, then after about ten minutes the servo goes limp and '
          + 'nothing responds until we unplug it. It runs from a USB power bank.',
      },
      {
        ago: 5 * DAY + HOUR,
        by: 'admin',
        body:
          'Many power banks switch themselves off when the current stays low for a while, and '
          + 'a balanced rig draws very little. Try the 6 V bench supply, or a power bank with '
          + 'an "always on" mode. "The controller goes quiet after a while" in the '
          + 'troubleshooting guide lists the other causes.',
      },
      {
        ago: 4 * DAY + 20 * HOUR,
        by: 'teacher',
        body: 'That was it: on the bench supply it has run a whole lesson. Thanks.',
      },
      {
        ago: 4 * DAY + 19 * HOUR,
        by: 'admin',
        body: 'Good news. Closing this one; write again any time.',
        resolve: true,
      },
    ],
  },
]

// ── Files: a few drawings as PNG photos and a PDF of readings ─────────────────────────────

type Rgb = [number, number, number]
const rgb = (hex: string): Rgb => [1, 3, 5].map(i => parseInt(hex.slice(i, i + 2), 16)) as Rgb

const CRC_TABLE = Array.from({ length: 256 }, (_, n) => {
  let c = n
  for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1
  return c >>> 0
})
function crc32(buf: Buffer) {
  let c = 0xffffffff
  for (const b of buf) c = CRC_TABLE[(c ^ b) & 0xff]! ^ (c >>> 8)
  return (c ^ 0xffffffff) >>> 0
}
function chunk(type: string, data: Buffer) {
  const len = Buffer.alloc(4)
  len.writeUInt32BE(data.length)
  const body = Buffer.concat([Buffer.from(type, 'ascii'), data])
  const crc = Buffer.alloc(4)
  crc.writeUInt32BE(crc32(body))
  return Buffer.concat([len, body, crc])
}

/** A truecolour PNG (8-bit RGB, no interlace) from a pixel function. */
function png(width: number, height: number, pixel: (x: number, y: number) => Rgb) {
  const rows = Buffer.alloc((width * 3 + 1) * height)
  for (let y = 0; y < height; y++) {
    const row = y * (width * 3 + 1)
    for (let x = 0; x < width; x++) rows.set(pixel(x, y), row + 1 + x * 3)
  }
  const header = Buffer.alloc(13)
  header.writeUInt32BE(width, 0)
  header.writeUInt32BE(height, 4)
  header.set([8, 2, 0, 0, 0], 8)
  return Buffer.concat([
    Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]),
    chunk('IHDR', header),
    chunk('IDAT', deflateSync(rows)),
    chunk('IEND', Buffer.alloc(0)),
  ])
}

const W = 320
const H = 200

/** A side view of a rig: base, pivot, tilted beam, ball, servo with lever and pushrod. */
function rigDrawing(opts: { tilt: number, ballAt: number, bentLever?: boolean }) {
  const chalk = rgb(palette.chalk.DEFAULT)
  const beam = rgb(palette.beam[500])
  const ink = rgb(palette.ink.DEFAULT)
  const brass = rgb(palette.brass[400])
  const steel = rgb(palette.beam[200])
  const stop = rgb(palette.stop.DEFAULT)
  const pivot = { x: 160, y: 100 }
  const t = Math.tan(opts.tilt)
  const beamY = (x: number) => pivot.y + (x - pivot.x) * t
  const ball = { x: 40 + opts.ballAt * 240, y: beamY(40 + opts.ballAt * 240) - 11 }
  const lever = { x: 270, y: 150 }
  const tip = opts.bentLever ? { x: 292, y: 142 } : { x: 278, y: 132 }
  const end = { x: 280, y: beamY(280) }
  const nearSegment = (x: number, y: number, a: { x: number, y: number },
    b: { x: number, y: number }, r: number) => {
    const dx = b.x - a.x
    const dy = b.y - a.y
    const k = Math.max(0, Math.min(1, ((x - a.x) * dx + (y - a.y) * dy) / (dx * dx + dy * dy)))
    return Math.hypot(x - a.x - k * dx, y - a.y - k * dy) <= r
  }
  return png(W, H, (x, y) => {
    if (Math.hypot(x - ball.x, y - ball.y) <= 10) return steel
    if (x >= 30 && x <= 290 && Math.abs(y - beamY(x)) <= 3) return beam
    if (nearSegment(x, y, tip, end, 1.5)) return ink
    if (nearSegment(x, y, lever, tip, 2.5)) return opts.bentLever ? stop : brass
    if (x >= 250 && x <= 290 && y >= 150 && y <= 180) return ink
    if (y >= 180 && y <= 188 && x >= 20 && x <= 300) return ink
    if (y >= pivot.y && y <= 180 && Math.abs(x - pivot.x) <= (y - pivot.y) * 0.35) return brass
    return chalk
  })
}

/** A close-up of the two rails with a dark worn patch on one. */
function railDrawing() {
  const chalk = rgb(palette.chalk.DEFAULT)
  const rail = rgb(palette.beam[300])
  const worn = rgb(palette.ink.soft)
  const steel = rgb(palette.beam[200])
  return png(W, H, (x, y) => {
    if (Math.hypot(x - 90, y - 100) <= 26) return steel
    const onRail = (y >= 70 && y <= 80) || (y >= 120 && y <= 130)
    if (onRail && y <= 80 && x >= 210 && x <= 250) return worn
    if (onRail) return rail
    return chalk
  })
}

/** The readings Sam took along the track, as a one-page PDF. */
function readingsPdf(): Promise<Buffer> {
  return new Promise((resolve, reject) => {
    const doc = new PDFDocument({ size: 'A4', margin: 56, info: { Title: 'Track readings' } })
    const parts: Buffer[] = []
    doc.on('data', (b: Buffer) => parts.push(b))
    doc.on('end', () => resolve(Buffer.concat(parts)))
    doc.on('error', reject)
    doc.fontSize(18).text('Tall Tower (TW-10001-03): readings along the track')
    doc.moveDown(0.5).fontSize(11)
      .text('Ball held still at each mark, 10 readings each, rails cleaned first.')
    doc.moveDown()
    const rows = [
      [40, '101', '99-103'],
      [80, '204', '202-206'],
      [120, '309', '306-311'],
      [160, '412', '409-415'],
      [200, '515', '512-518'],
      [240, '618', '614-622'],
      [280, '720', '690-760'],
      [320, '690', '402-951'],
      [360, '905', '0-1023'],
    ] as const
    // A fixed-width font keeps the columns in line.
    doc.font('Courier-Bold').text(`${'Position (mm)'.padEnd(20)}${'Average'.padEnd(14)}Range`)
    doc.font('Courier')
    for (const [mm, avg, range] of rows)
      doc.text(`${String(mm).padEnd(20)}${avg.padEnd(14)}${range}`)
    doc.moveDown().font('Helvetica')
      .text('From 280 mm on, the reading jumps even with the ball still.')
    doc.end()
  })
}

interface MadeFile {
  filename: string
  kind: 'image' | 'pdf'
  contentType: string
  data: Buffer
  width: number | null
  height: number | null
}

async function makeFiles(): Promise<Record<FileKey, MadeFile>> {
  const image = (filename: string, data: Buffer): MadeFile => ({
    filename,
    kind: 'image',
    contentType: 'image/png',
    data,
    width: W,
    height: H,
  })
  return {
    'rig-photo': image('bench-1-rig.png', rigDrawing({ tilt: -0.08, ballAt: 0.8 })),
    'rail-photo': image('rails-far-end.png', railDrawing()),
    'lever-photo': image('bent-lever.png', rigDrawing({ tilt: 0.1, ballAt: 0.15,
      bentLever: true })),
    'readings-pdf': {
      filename: 'tall-tower-readings.pdf',
      kind: 'pdf',
      contentType: 'application/pdf',
      data: await readingsPdf(),
      width: null,
      height: null,
    },
  }
}

/** Writes a file where Nitro's `uploads` storage (fs driver) reads the key, as
 *  server/services/files.ts keys them: `ticket:YYYY-MM:random`, colons as folders. */
function storeDemoFile(uploadDir: string, data: Buffer, at: Date) {
  const key = `ticket:${at.toISOString().slice(0, 7)}:${randomBytes(16).toString('hex')}`
  const path = join(uploadDir, ...key.split(':'))
  mkdirSync(dirname(path), { recursive: true })
  writeFileSync(path, data)
  return key
}

const ROLE_OF: Record<'teacher' | 'builder' | 'support' | 'admin', Role> = {
  teacher: 'teacher',
  builder: 'builder',
  support: 'support',
  admin: 'admin',
}

/**
 * Seeds the demo tickets on the demo build space; runs inside the seed's transaction after the
 * build demo. Files go into `uploadDir`, the folder the app's `uploads` storage reads.
 */
export async function seedDemoTickets(
  tx: SeedTx,
  people: DemoTicketPeople,
  space: DemoTicketSpace,
  uploadDir: string,
  now = new Date(),
) {
  const at = (ago: number) => new Date(now.getTime() - ago)

  // The class's code-joined builders, by display name (only what the build space keeps).
  const members = await tx
    .select({ id: schema.users.id, name: schema.users.name })
    .from(schema.buildMembers)
    .innerJoin(schema.users, eq(schema.users.id, schema.buildMembers.userId))
    .where(eq(schema.buildMembers.orderId, space.orderId))
  const person = (who: Who): { id: number, role: Role } => {
    if (who in ROLE_OF) {
      const key = who as keyof typeof ROLE_OF
      return { id: people[key].id, role: ROLE_OF[key] }
    }
    const m = members.find(u => u.name === who)
    if (!m) throw new Error(`the demo builder ${who} is not in the build space`)
    return { id: m.id, role: 'builder' }
  }

  // ── Stock replies ───────────────────────────────────────────────────────────────────────
  const stockIds = new Map<StockKey, number>()
  for (const [i, [key, r]] of Object.entries(STOCK_REPLIES).entries()) {
    const made = at(20 * DAY - i * HOUR)
    const [row] = await tx
      .insert(schema.stockReplies)
      .values({ ...r, createdById: people.support.id, createdAt: made, updatedAt: made })
      .$returningId()
    stockIds.set(key as StockKey, row!.id)
  }

  const files = await makeFiles()
  const [firstSheet] = await tx
    .select({ id: schema.tuningSheets.id })
    .from(schema.tuningSheets)
    .where(eq(schema.tuningSheets.rigId, space.rigIds[1]!))
    .orderBy(asc(schema.tuningSheets.createdAt))
    .limit(1)

  const ticketIds: number[] = []
  for (const t of TICKETS) {
    const opener = person(t.messages[0]!.by)
    // The status each customer-visible message leaves, as the routes apply it.
    let status: TicketStatus = 'needs reply'
    let statusChangedAt = at(t.messages[0]!.ago)
    let resolvedAt: Date | null = null
    for (const m of t.messages) {
      if (m.internal) continue
      const next = statusAfterMessage(person(m.by).role, m.resolve)
      if (next !== status) statusChangedAt = at(m.ago)
      status = next
      resolvedAt = status === 'resolved' ? at(m.ago) : null
    }
    const [ins] = await tx
      .insert(schema.tickets)
      .values({
        schoolId: people.schoolId,
        orderId: space.orderId,
        rigId: t.rig === null ? null : space.rigIds[t.rig]!,
        subject: t.subject,
        status,
        priority: t.priority,
        assigneeId: t.assignee ? people[t.assignee].id : null,
        openedById: opener.id,
        createdAt: at(t.messages[0]!.ago),
        lastMessageAt: at(Math.min(...t.messages.map(m => m.ago))),
        statusChangedAt,
        resolvedAt,
      })
      .$returningId()
    const ticketId = ins!.id
    ticketIds.push(ticketId)

    const messageIds: number[] = []
    for (const m of t.messages) {
      const author = person(m.by)
      const [msg] = await tx
        .insert(schema.ticketMessages)
        .values({
          ticketId,
          authorId: author.id,
          internal: m.internal ?? false,
          body: m.body,
          sheetId: m.sheet ? (firstSheet?.id ?? null) : null,
          stockReplyId: m.stockReply ? stockIds.get(m.stockReply)! : null,
          createdAt: at(m.ago),
        })
        .$returningId()
      messageIds.push(msg!.id)
      for (const key of m.files ?? []) {
        const f = files[key]
        // Uploaded a minute before the message that sent it.
        const uploadedAt = at(m.ago + MINUTE)
        await tx.insert(schema.ticketAttachments).values({
          ticketId,
          messageId: msg!.id,
          kind: f.kind,
          storageKey: storeDemoFile(uploadDir, f.data, uploadedAt),
          filename: f.filename,
          contentType: f.contentType,
          size: f.data.length,
          width: f.width,
          height: f.height,
          uploadedById: author.id,
          createdAt: uploadedAt,
        })
      }
    }
    if (t.replacement) await seedReplacement(tx, t, ticketId, people, space, at)
  }
  return { ticketIds, stockReplyIds: [...stockIds.values()] }
}

/** Free parts sent on the order from a ticket, as the order engine records them: units reserved
 *  from each part's batch and marked `sent` with the shipment, the shipment and its parts, and
 *  the timeline entry in the order flow's words. */
async function seedReplacement(
  tx: SeedTx,
  t: DemoTicket,
  ticketId: number,
  people: DemoTicketPeople,
  space: DemoTicketSpace,
  at: (ago: number) => Date,
) {
  const r = t.replacement!
  const msg = t.messages[r.withMessage]!
  const sender = msg.by === 'admin' ? people.admin : people.support
  const shippedAt = at(msg.ago)
  const parts = await tx
    .select()
    .from(schema.products)
    .where(inArray(schema.products.slug, r.parts.map(p => p.slug)))
  const [ship] = await tx
    .insert(schema.shipments)
    .values({
      orderId: space.orderId,
      carrier: r.carrier,
      tracking: r.tracking,
      kind: 'replacement',
      ticketId,
      createdById: sender.id,
      shippedAt,
    })
    .$returningId()
  const shipmentId = ship!.id
  const sent: { name: string, quantity: number }[] = []
  for (const want of r.parts) {
    const product = parts.find(p => p.slug === want.slug)
    if (!product) throw new Error(`the demo catalog has no ${want.slug}`)
    const stock = await tx
      .select()
      .from(schema.batches)
      .where(eq(schema.batches.productId, product.id))
      .orderBy(asc(schema.batches.builtOn), asc(schema.batches.id))
    const batch = stock.find(b => b.quantityBuilt - b.reserved >= want.quantity)
    if (!batch) throw new Error(`no stock of ${want.slug} for the demo replacement`)
    await tx
      .update(schema.batches)
      .set({ reserved: batch.reserved + want.quantity })
      .where(eq(schema.batches.id, batch.id))
    await tx.insert(schema.stockReservations).values({
      orderId: space.orderId,
      productId: product.id,
      batchId: batch.id,
      quantity: want.quantity,
      status: 'sent',
      shipmentId,
      createdAt: shippedAt,
    })
    await tx.insert(schema.shipmentItems).values({
      shipmentId,
      productId: product.id,
      quantity: want.quantity,
    })
    sent.push({ name: product.name, quantity: want.quantity })
  }
  const [order] = await tx
    .select({ status: schema.orders.status })
    .from(schema.orders)
    .where(eq(schema.orders.id, space.orderId))
  const row = ORDER_FLOW.find(f => f.action === 'sendReplacement' && f.from === order!.status)
  if (!row) throw new Error(`replacement parts are not open for a ${order!.status} order`)
  await tx.insert(schema.orderEvents).values({
    orderId: space.orderId,
    kind: 'replacement-shipped',
    // The words the order engine writes (replacementReference, as sendReplacement does).
    message: flowWording(row, {
      actor: sender.name,
      reference: replacementReference(sent, ticketRef(ticketId), r.carrier, r.tracking),
    }),
    actorId: sender.id,
    createdAt: shippedAt,
  })
}
