// Tickets through the real server: who may do what on every ticket route (everyone else 404,
// a wrong role 403 on the staff-only lists), internal notes never reaching a customer's reply,
// list or e-mail, the status flow, and replacement parts through the order engine.
import { beforeAll, describe, expect, it } from 'vitest'
import { DEFAULT_TARGETS, KIT_PRESETS } from '../../shared/utils/planner/presets'
import { planGains } from '../../shared/utils/planner/plan'
import { Client } from '../helpers/client'
import { jobsSettled, sql } from '../helpers/db'
import { mailsTo, waitForMail } from '../helpers/mail'
import { newTeacher, productWithStock, signedIn } from '../helpers/shop'
import { joinAs, newCode, orderOfKits } from '../helpers/build'
import { openTicket, SUPPORT_ADDRESS, ticketSpace } from '../helpers/tickets'

type World = Awaited<ReturnType<typeof ticketSpace>>
let w: World
let support: Client
let admin: Client
let otherTeacher: Client
let otherBuilder: Client
let anon: Client
let ticketId: number

beforeAll(async () => {
  w = await ticketSpace('tk')
  support = await signedIn('support@tiltwright.test')
  admin = w.admin
  otherTeacher = (await newTeacher('tk-other')).client
  const other = await orderOfKits('tk-elsewhere', 1)
  otherBuilder = (await joinAs((await newCode(other.teacher.client, other.orderId)).code)).client
  anon = new Client()
  ticketId = await openTicket(w.one.client, { rigId: w.rigs[0]!.id })
})

describe('who may use each ticket route', () => {
  it('opens tickets for the school\'s teacher and the space\'s builders only', async () => {
    const rigId = w.rigs[0]!.id
    const body = { rigId, subject: 'Servo buzzes', message: 'It hums at rest.' }
    expect((await anon.post('/api/tickets', body)).status).toBe(401)
    expect((await support.post('/api/tickets', body)).status).toBe(403)
    expect((await otherTeacher.post('/api/tickets', body)).status).toBe(404)
    expect((await otherBuilder.post('/api/tickets', body)).status).toBe(404)
    expect((await otherTeacher.post('/api/tickets', { ...body, rigId: undefined,
      orderId: w.orderId })).status).toBe(404)
    // A builder opens on a rig only, never on the order.
    const onOrder = await w.one.client.post('/api/tickets', { ...body, rigId: undefined,
      orderId: w.orderId })
    expect(onOrder.status).toBe(422)
    expect(onOrder.body.data.fields.rigId).toBe('Choose the rig this is about.')
    // Any builder of the space may ask about a rig of it, and the teacher about the order.
    expect((await w.two.client.post('/api/tickets', body)).status).toBe(201)
    expect((await w.teacher.client.post('/api/tickets', { ...body, rigId: undefined,
      orderId: w.orderId })).status).toBe(201)
  })

  it('shows a ticket to staff, the school\'s teacher and the rig\'s builder; 404 to the rest',
    async () => {
      const path = `/api/tickets/${ticketId}`
      expect((await anon.get(path)).status).toBe(401)
      for (const c of [otherTeacher, otherBuilder, w.two.client])
        expect((await c.get(path)).status).toBe(404)
      for (const c of [w.one.client, w.teacher.client, support, admin])
        expect((await c.get(path)).status).toBe(200)
      expect((await support.get('/api/tickets/0x1')).status).toBe(404)
    })

  it('lists a builder\'s own rigs\' tickets and the teacher\'s school\'s', async () => {
    const ids = async (c: Client, q = '') =>
      ((await c.get(`/api/tickets?pageSize=100${q}`)).body.data as { id: number }[]).map(t => t.id)
    expect((await anon.get('/api/tickets')).status).toBe(401)
    expect((await support.get('/api/tickets')).status).toBe(403)
    expect(await ids(w.one.client)).toContain(ticketId)
    expect(await ids(w.teacher.client)).toContain(ticketId)
    expect(await ids(w.two.client)).not.toContain(ticketId)
    expect(await ids(otherTeacher)).toEqual([])
    expect(await ids(otherBuilder)).toEqual([])
    expect(await ids(w.teacher.client, `&rigId=${w.rigs[1]!.id}`)).not.toContain(ticketId)
  })

  it('counts for every signed-in role', async () => {
    expect((await anon.get('/api/tickets/counts')).status).toBe(401)
    const staff = (await support.get('/api/tickets/counts')).body
    expect(staff.awaitingYou).toBeNull()
    expect(staff.needsReply).toBeGreaterThan(0)
    const builder = (await w.one.client.get('/api/tickets/counts')).body
    expect(builder).toMatchObject({ needsReply: null, assignedToMe: null, unassigned: null })
    expect(typeof builder.awaitingYou).toBe('number')
  })

  it('takes messages from those who see the ticket; notes, context and changes from staff',
    async () => {
      const base = `/api/tickets/${ticketId}`
      const msg = { body: 'Any news?' }
      expect((await anon.post(`${base}/messages`, msg)).status).toBe(401)
      for (const c of [otherTeacher, otherBuilder, w.two.client])
        expect((await c.post(`${base}/messages`, msg)).status).toBe(404)
      expect((await w.one.client.post(`${base}/messages`, msg)).status).toBe(201)

      const note = { body: 'Checked the batch.' }
      expect((await anon.post(`${base}/notes`, note)).status).toBe(401)
      for (const c of [w.teacher.client, w.one.client, otherTeacher])
        expect((await c.post(`${base}/notes`, note)).status).toBe(404)
      expect((await support.post(`${base}/notes`, note)).status).toBe(201)
      expect((await admin.post(`${base}/notes`, note)).status).toBe(201)

      expect((await anon.get(`${base}/context`)).status).toBe(401)
      for (const c of [w.teacher.client, w.one.client])
        expect((await c.get(`${base}/context`)).status).toBe(404)
      const ctx = await support.get(`${base}/context`)
      expect(ctx.status).toBe(200)
      expect(ctx.body.rig.id).toBe(w.rigs[0]!.id)
      expect(ctx.body.order.items.length).toBeGreaterThan(0)

      expect((await anon.patch(base, { priority: 'urgent' })).status).toBe(401)
      for (const c of [otherTeacher, w.two.client])
        expect((await c.patch(base, { priority: 'urgent' })).status).toBe(404)
      // The customer side sees the ticket, so it is told it may not (403), not that it is gone.
      expect((await w.teacher.client.patch(base, { priority: 'urgent' })).status).toBe(403)
      expect((await w.one.client.patch(base, { status: 'awaiting builder' })).status).toBe(403)
      const urgent = await support.patch(base, { priority: 'urgent' })
      expect(urgent.status).toBe(200)
      expect(urgent.body.priority).toBe('urgent')
      const audited = await sql(
        'select action from audit_log where subject_type = \'ticket\' and subject_id = ?',
        [ticketId],
      )
      expect(audited.map(a => a.action)).toEqual(
        expect.arrayContaining(['ticket.note', 'ticket.priority']),
      )

      const repl = { carrier: 'ups', tracking: '1Z999AA10123456784', items: [] }
      expect((await anon.post(`${base}/replacements`, repl)).status).toBe(401)
      for (const c of [w.teacher.client, w.one.client])
        expect((await c.post(`${base}/replacements`, repl)).status).toBe(404)
    })

  it('keeps the queue, its options, bulk assignment and stock replies to staff', async () => {
    const routes: [string, string, unknown?][] = [
      ['GET', '/api/help-queue'],
      ['GET', '/api/help-queue/options'],
      ['POST', '/api/help-queue/assign', { ticketIds: [ticketId], assigneeId: null }],
      ['GET', '/api/stock-replies'],
      ['POST', '/api/stock-replies', { title: `Hello ${Date.now()}`, body: 'Hi.' }],
      ['PATCH', '/api/stock-replies/1', { title: 'Whatever title', body: 'Hi.' }],
      ['DELETE', '/api/stock-replies/1'],
    ]
    for (const [method, path, body] of routes) {
      expect((await anon.request(method, path, body)).status, `${method} ${path}`).toBe(401)
      for (const c of [w.teacher.client, w.one.client])
        expect((await c.request(method, path, body)).status, `${method} ${path}`).toBe(403)
    }
    expect((await support.get('/api/help-queue')).status).toBe(200)
    expect((await admin.get('/api/help-queue/options')).status).toBe(200)
    const created = await support.post('/api/stock-replies', {
      title: `Check the rails ${Date.now()}`,
      body: 'Wipe the rails with a dry cloth.',
    })
    expect(created.status).toBe(201)
    const again = await support.post('/api/stock-replies', {
      title: (await support.get('/api/stock-replies')).body.data.find(
        (r: any) => r.id === created.body.id,
      ).title,
      body: 'Same title.',
    })
    expect(again.status).toBe(409)
    expect(again.body.data.fields.title).toBe('Another stock reply already has that title.')
    const edited = await admin.patch(`/api/stock-replies/${created.body.id}`, {
      title: `Rails, edited ${Date.now()}`,
      body: 'Wipe the rails, then try again.',
    })
    expect(edited.status).toBe(200)
    expect(edited.body.body).toBe('Wipe the rails, then try again.')
    expect((await support.delete(`/api/stock-replies/${created.body.id}`)).status).toBe(204)
    const left = (await support.get('/api/stock-replies')).body.data.map((r: any) => r.id)
    expect(left).not.toContain(created.body.id)
    expect((await support.delete(`/api/stock-replies/${created.body.id}`)).status).toBe(404)
  })
})

describe('internal notes', () => {
  it('never reach the teacher\'s or the builder\'s reply, list or e-mail', async () => {
    const secret = `NOTEWORD${Date.now().toString(36)}`
    const id = await openTicket(w.one.client, { rigId: w.rigs[0]!.id, subject: 'Jumpy readings' })
    const noted = await support.post(`/api/tickets/${id}/notes`, {
      body: `School seems to use ${secret} rails.`,
    })
    expect(noted.status).toBe(201)
    const replied = await support.post(`/api/tickets/${id}/messages`, {
      body: 'Please clean the rails and send a photo.',
    })
    expect(replied.status).toBe(201)
    await jobsSettled({ to: w.teacher.email })
    await jobsSettled({ to: SUPPORT_ADDRESS })

    // The staff see the note …
    const staffView = await support.get(`/api/tickets/${id}`)
    expect(JSON.stringify(staffView.body)).toContain(secret)
    expect(staffView.body.messages.some((m: any) => m.internal)).toBe(true)
    // … the customer side does not, anywhere.
    for (const c of [w.teacher.client, w.one.client]) {
      const thread = await c.request('GET', `/api/tickets/${id}`)
      expect(thread.status).toBe(200)
      const raw = JSON.stringify(thread.body)
      expect(raw).not.toContain(secret)
      expect(raw).toContain('Please clean the rails')
      expect(thread.body.messages.every((m: any) => !m.internal && !m.stockReplyTitle)).toBe(true)
      const list = await c.get(`/api/tickets?pageSize=100&q=${secret}`)
      expect(list.body.meta.total).toBe(0)
      expect(JSON.stringify((await c.get('/api/tickets?pageSize=100')).body)).not.toContain(secret)
    }
    const teacherMail = await waitForMail(w.teacher.email, /support replied/)
    expect(teacherMail.text).toContain('Please clean the rails')
    for (const to of [w.teacher.email, SUPPORT_ADDRESS])
      for (const m of await mailsTo(to)) {
        expect(m.text).not.toContain(secret)
        expect(m.html ?? '').not.toContain(secret)
      }
  })
})

describe('the status flow', () => {
  it('goes needs reply → awaiting builder → resolved, and a customer reply reopens it',
    async () => {
      const id = await openTicket(w.one.client, { rigId: w.rigs[0]!.id, subject: 'It drifts' })
      const status = async () => (await w.one.client.get(`/api/tickets/${id}`)).body.ticket.status
      expect(await status()).toBe('needs reply')
      await support.post(`/api/tickets/${id}/messages`, { body: 'Level the beam first.' })
      expect(await status()).toBe('awaiting builder')
      // A customer's "resolve" flag is not theirs to use with a message.
      await w.one.client.post(`/api/tickets/${id}/messages`, { body: 'Done.', resolve: true })
      expect(await status()).toBe('needs reply')
      await support.post(`/api/tickets/${id}/messages`, { body: 'Great.', resolve: true })
      const resolved = (await w.teacher.client.get(`/api/tickets/${id}`)).body
      expect(resolved.ticket.status).toBe('resolved')
      expect(resolved.may.resolve).toBe(false)
      const [row] = await sql('select resolved_at from tickets where id = ?', [id])
      expect(row.resolved_at).not.toBeNull()
      await w.teacher.client.post(`/api/tickets/${id}/messages`, { body: 'It drifts again.' })
      expect(await status()).toBe('needs reply')
      const [reopened] = await sql('select resolved_at from tickets where id = ?', [id])
      expect(reopened.resolved_at).toBeNull()
      // The customer side may resolve it themselves.
      const done = await w.one.client.patch(`/api/tickets/${id}`, { status: 'resolved' })
      expect(done.status).toBe(200)
      expect(done.body.status).toBe('resolved')
      // A customer message goes to support, which has nobody assigned yet.
      await waitForMail(SUPPORT_ADDRESS, new RegExp(`T-${id}: new message from Teacher`))
      const toSupport = (await mailsTo(SUPPORT_ADDRESS))
        .filter(m => m.subject.startsWith(`T-${id}: new message`))
        .map(m => m.text)
      expect(toSupport.some(t => t.includes('It drifts again.'))).toBe(true)
      expect(toSupport.some(t => t.includes('Done.'))).toBe(true)
    })

  it('checks the sheet and assignee it is given', async () => {
    const rig = KIT_PRESETS[0]!.rig
    const inputs = { rig, targets: DEFAULT_TARGETS, gains: planGains(rig, DEFAULT_TARGETS).gains! }
    const other = await w.two.client.post('/api/sheets', {
      title: 'Rig two sheet', rigId: w.rigs[1]!.id, inputs,
    })
    expect(other.status).toBe(201)
    const bad = await w.one.client.post('/api/tickets', {
      rigId: w.rigs[0]!.id, subject: 'Sheet check', message: 'See sheet.', sheetId: other.body.id,
    })
    expect(bad.status).toBe(422)
    expect(bad.body.data.fields.sheetId).toBe(
      'Choose one of your tuning sheets or one saved on this rig.',
    )
    const own = await w.one.client.post('/api/sheets', {
      title: 'Rig one sheet', rigId: w.rigs[0]!.id, inputs,
    })
    const id = await openTicket(w.one.client, { rigId: w.rigs[0]!.id, sheetId: own.body.id })
    const thread = (await support.get(`/api/tickets/${id}`)).body
    expect(thread.messages[0].sheet.id).toBe(own.body.id)
    expect(thread.messages[0].sheet.inputs.gains).toEqual(inputs.gains)
    expect(Object.keys(thread.messages[0].sheet.results).length).toBeGreaterThan(0)
    const notStaff = await support.patch(`/api/tickets/${id}`, { assigneeId: w.teacher.user.id })
    expect(notStaff.status).toBe(422)
    expect(notStaff.body.data.fields.assigneeId).toBe(
      'Choose someone on the support staff from the list.',
    )
  })
})

describe('replacement parts', () => {
  it('ships free parts through the order engine, with stock, timeline, tracking and mail',
    async () => {
      const part = await productWithStock(admin, 5)
      const id = await openTicket(w.one.client, { rigId: w.rigs[0]!.id, subject: 'Bent horn' })
      const short = await support.post(`/api/tickets/${id}/replacements`, {
        carrier: 'ups', tracking: '1Z999AA10123456784',
        items: [{ productId: part.productId, quantity: 6 }],
      })
      expect(short.status).toBe(409)
      expect(short.body.data.fields['items.0.quantity']).toMatch(/Only 5/)
      const sent = await support.post(`/api/tickets/${id}/replacements`, {
        carrier: 'ups', tracking: '1Z999AA10123456784',
        items: [{ productId: part.productId, quantity: 2 }],
      })
      expect(sent.status, JSON.stringify(sent.body)).toBe(201)
      const shipmentId = sent.body.shipmentId

      const [batch] = await sql('select reserved from batches where id = ?', [part.batchId])
      expect(batch.reserved).toBe(2)
      const held = await sql(
        'select status, quantity, shipment_id from stock_reservations where product_id = ?',
        [part.productId],
      )
      expect(held).toEqual([{ status: 'sent', quantity: 2, shipment_id: shipmentId }])

      const order = (await w.teacher.client.get(`/api/orders/${w.orderId}`)).body
      const ship = order.shipments.find((s: any) => s.id === shipmentId)
      expect(ship).toMatchObject({
        kind: 'replacement',
        ticketId: id,
        tracking: '1Z999AA10123456784',
      })
      expect(ship.items).toEqual([{ name: expect.stringContaining('Test part'), quantity: 2 }])
      // The sent units are not the order's own to pack: they are listed with their shipment.
      expect(order.reservations.length).toBeGreaterThan(0)
      expect(order.reservations.every((r: any) => r.status !== 'sent')).toBe(true)
      const entry = order.events.find((e: any) => e.kind === 'replacement-shipped')
      expect(entry.message).toContain(`T-${id}`)
      expect(entry.message).toContain('1Z999AA10123456784')
      expect(entry.message).toContain('× 2')
      const thread = (await w.one.client.get(`/api/tickets/${id}`)).body
      expect(thread.replacements.map((s: any) => s.id)).toEqual([shipmentId])

      const mail = await waitForMail(w.teacher.email, /replacement parts shipped/)
      expect(mail.subject).toContain(`T-${id}`)
      expect(mail.text).toContain('1Z999AA10123456784')
      expect(mail.text).toContain('× 2')

      // Cancelling the order later gives back what it holds, never what was sent.
      const cancelled = await admin.post(`/api/admin/orders/${w.orderId}/cancel`, {
        reason: 'Testing what a cancel releases',
      })
      expect(cancelled.status, JSON.stringify(cancelled.body)).toBe(200)
      const [after] = await sql('select reserved from batches where id = ?', [part.batchId])
      expect(after.reserved).toBe(2)
      const still = await sql(
        'select status from stock_reservations where product_id = ?',
        [part.productId],
      )
      expect(still.map(s => s.status)).toEqual(['sent'])
      // A cancelled order takes no more replacements.
      const refused = await support.post(`/api/tickets/${id}/replacements`, {
        carrier: 'ups', tracking: '1Z999AA10123456784',
        items: [{ productId: part.productId, quantity: 1 }],
      })
      expect(refused.status).toBe(409)
      const [unchanged] = await sql('select reserved from batches where id = ?', [part.batchId])
      expect(unchanged.reserved).toBe(2)
    })
})

describe('the demo tickets', () => {
  it('cover every state, with files, a note, a stock reply used and a replacement', async () => {
    const demoTeacher = await signedIn('teacher@tiltwright.test')
    const mine = (await demoTeacher.get('/api/tickets?pageSize=100')).body.data as any[]
    expect(new Set(mine.map(t => t.status))).toEqual(
      new Set(['needs reply', 'awaiting builder', 'resolved']),
    )
    const threads = await Promise.all(
      mine.map(async t => (await support.get(`/api/tickets/${t.id}`)).body),
    )
    const messages = threads.flatMap(t => t.messages)
    expect(messages.some((m: any) => m.internal)).toBe(true)
    expect(messages.some((m: any) => m.stockReplyTitle)).toBe(true)
    expect(messages.some((m: any) => m.sheet)).toBe(true)
    const files = messages.flatMap((m: any) => m.attachments)
    expect(new Set(files.map((f: any) => f.kind))).toEqual(new Set(['image', 'pdf']))
    const photo = files.find((f: any) => f.kind === 'image')
    const res = await demoTeacher.raw(photo.url)
    expect(res.status).toBe(200)
    expect(Buffer.from(await res.arrayBuffer()).subarray(1, 4).toString()).toBe('PNG')
    expect(threads.some(t => t.replacements.length === 1)).toBe(true)
    // The teacher's own view of the same threads carries no note, nor any note's words.
    const notes = messages.filter((m: any) => m.internal).map((m: any) => m.body as string)
    for (const t of mine) {
      const own = await demoTeacher.get(`/api/tickets/${t.id}`)
      expect(own.body.messages.every((m: any) => !m.internal)).toBe(true)
      for (const note of notes) expect(JSON.stringify(own.body)).not.toContain(note.slice(0, 40))
    }
  })
})
