// The demo tickets the seed writes on order TW-10001 (scripts/demo-tickets.ts, docs/tickets.md
// "The demo tickets"), read back from the test database and the test build's upload folder:
// every state, threads that agree with their status, files the app's storage can serve, and a
// replacement shipment recorded the way the order engine records one.
import { existsSync, readFileSync } from 'node:fs'
import { join, resolve } from 'node:path'
import { fileTypeFromBuffer } from 'file-type'
import { imageSize } from 'image-size'
import { describe, expect, it } from 'vitest'
import { projectRoot } from '../../scripts/lib/mariadb'
import { SUFFIX } from '../setup/slot'
import { sql } from '../helpers/db'
import { TICKET_STATUSES } from '../../shared/utils/states'
import { ticketRef } from '../../shared/utils/tickets'

const uploadDir = resolve(projectRoot, `data/uploads-test${SUFFIX}`)
const STAFF = ['support', 'admin']

// The seed writes the demo tickets before any test runs: they hold the lowest ids.
const demoTickets = () => sql(
  `SELECT t.*, o.number FROM tickets t JOIN orders o ON o.id = t.order_id
   ORDER BY t.id LIMIT 6`,
)
const thread = (ticketId: number) => sql(
  `SELECT m.*, u.role FROM ticket_messages m JOIN users u ON u.id = m.author_id
   WHERE m.ticket_id = ? ORDER BY m.created_at, m.id`,
  [ticketId],
)

describe('the demo tickets', () => {
  it('are six tickets on TW-10001 in every state, assigned and not, one reopened', async () => {
    const tickets = await demoTickets()
    expect(tickets).toHaveLength(6)
    expect(new Set(tickets.map(t => t.number))).toEqual(new Set(['TW-10001']))
    expect(new Set(tickets.map(t => t.status))).toEqual(new Set(TICKET_STATUSES))
    expect(tickets.some(t => t.priority === 'urgent' && t.status === 'needs reply')).toBe(true)
    expect(tickets.some(t => t.priority === 'normal' && t.status === 'needs reply')).toBe(true)
    expect(tickets.some(t => t.rig_id === null)).toBe(true)
    const [support] = await sql(`SELECT id FROM users WHERE email = 'support@tiltwright.test'`)
    expect(tickets.filter(t => t.assignee_id === support.id).length).toBeGreaterThan(1)
    expect(tickets.filter(t => t.assignee_id === null).length).toBeGreaterThan(1)

    let reopened = 0
    for (const t of tickets) {
      const visible = (await thread(t.id)).filter(m => !m.internal)
      const last = visible.at(-1)!
      // A customer's message hands it to the staff; a staff reply to the customer side.
      if (t.status === 'needs reply') expect(STAFF).not.toContain(last.role)
      else expect(STAFF).toContain(last.role)
      expect(t.resolved_at === null).toBe(t.status !== 'resolved')
      expect(new Date(t.last_message_at).getTime()).toBeGreaterThanOrEqual(
        new Date(last.created_at).getTime())
      const staffBefore = visible.slice(0, -1).some(m => STAFF.includes(m.role))
      if (t.status === 'needs reply' && staffBefore && visible.length > 3) reopened++
    }
    expect(reopened).toBeGreaterThan(0)
  })

  it('have notes only from the staff, a stock reply used and a sheet of the rig attached',
    async () => {
      const ids = (await demoTickets()).map(t => t.id)
      const messages = await sql(
        `SELECT m.*, u.role, t.rig_id, s.rig_id AS sheet_rig, r.title AS reply_title
         FROM ticket_messages m JOIN users u ON u.id = m.author_id
         JOIN tickets t ON t.id = m.ticket_id
         LEFT JOIN tuning_sheets s ON s.id = m.sheet_id
         LEFT JOIN stock_replies r ON r.id = m.stock_reply_id
         WHERE m.ticket_id IN (?)`,
        [ids],
      )
      const notes = messages.filter(m => m.internal)
      expect(notes.length).toBeGreaterThan(0)
      for (const n of notes) expect(STAFF).toContain(n.role)
      const used = messages.filter(m => m.stock_reply_id !== null)
      expect(used.length).toBeGreaterThan(0)
      for (const m of used) {
        expect(STAFF).toContain(m.role)
        expect(m.reply_title).toMatch(/\w{3}/)
      }
      const withSheet = messages.filter(m => m.sheet_id !== null)
      expect(withSheet).toHaveLength(1)
      expect(withSheet[0].sheet_rig).toBe(withSheet[0].rig_id)
    })

  it('keep their photos and PDF where the app\'s upload storage reads them', async () => {
    const ids = (await demoTickets()).map(t => t.id)
    const files = await sql(
      `SELECT a.* FROM ticket_attachments a WHERE a.ticket_id IN (?) ORDER BY a.id`,
      [ids],
    )
    expect(new Set(files.map(f => f.kind))).toEqual(new Set(['image', 'pdf']))
    for (const f of files) {
      expect(f.message_id).not.toBeNull()
      // The fs driver of Nitro's storage: one folder per colon of the key.
      const path = join(uploadDir, ...String(f.storage_key).split(':'))
      expect(existsSync(path), path).toBe(true)
      const bytes = readFileSync(path)
      expect(bytes.length).toBe(f.size)
      expect((await fileTypeFromBuffer(bytes))?.mime).toBe(f.content_type)
      if (f.kind === 'image') {
        const size = imageSize(new Uint8Array(bytes))
        expect([size.width, size.height]).toEqual([f.width, f.height])
      }
    }
  })

  it('include free parts sent on the order, recorded as the order engine records them',
    async () => {
      const ids = (await demoTickets()).map(t => t.id)
      const [ship] = await sql(
        `SELECT * FROM shipments WHERE kind = 'replacement' AND ticket_id IN (?)`,
        [ids],
      )
      expect(ship?.kind).toBe('replacement')
      const items = await sql(
        'SELECT product_id, quantity FROM shipment_items WHERE shipment_id = ? ORDER BY product_id',
        [ship.id],
      )
      const sent = await sql(
        `SELECT product_id, quantity, batch_id FROM stock_reservations
         WHERE shipment_id = ? AND status = 'sent' ORDER BY product_id`,
        [ship.id],
      )
      expect(items.length).toBeGreaterThan(0)
      expect(sent.map(s => [s.product_id, s.quantity])).toEqual(
        items.map(i => [i.product_id, i.quantity]))
      for (const s of sent) {
        const [batch] = await sql('SELECT product_id, reserved FROM batches WHERE id = ?',
          [s.batch_id])
        expect(batch.product_id).toBe(s.product_id)
        expect(batch.reserved).toBeGreaterThanOrEqual(s.quantity)
      }
      // Other test files may send parts on the same order: only this ticket's entry counts.
      const events = await sql(
        `SELECT message FROM order_events WHERE order_id = ? AND kind = 'replacement-shipped'
         AND message LIKE ?`,
        [ship.order_id, `%for ticket ${ticketRef(ship.ticket_id)};%`],
      )
      expect(events).toHaveLength(1)
      expect(events[0].message).toContain(`for ticket ${ticketRef(ship.ticket_id)}`)
      expect(events[0].message).toContain(ship.tracking)
    })
})
