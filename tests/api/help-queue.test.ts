// The help queue against a few thousand tickets of one school, seeded straight into the
// database: every filter, both directions of each sort (priority and status by rank), the
// search (staff search covers message bodies and internal notes; a customer's search never
// covers notes), paging to the last page and bulk assignment, each checked against SQL counts
// and orders computed here, independently of the route.
import { beforeAll, describe, expect, it } from 'vitest'
import type { Client } from '../helpers/client'
import { sql } from '../helpers/db'
import { signedIn } from '../helpers/shop'
import { orderOfKits } from '../helpers/build'

const N = 3000
const STATUSES = ['needs reply', 'awaiting builder', 'resolved']
const PRIORITIES = ['low', 'normal', 'urgent']
const tag = Date.now().toString(36)
const MSGWORD = `msgword${tag}`
const NOTEWORD = `noteword${tag}`

let support: Client
let admin: Client
let teacher: Client
let schoolId: number
let supportId: number
let adminId: number

const q = (path: string) => `/api/help-queue?school=${schoolId}&${path}`

async function count(where: string, params: unknown[] = []) {
  const [row] = await sql(
    `select count(*) as n from tickets t where t.school_id = ? and ${where}`,
    [schoolId, ...params],
  )
  return Number(row.n)
}

async function ids(orderBy: string, limit: number) {
  const rows = await sql(
    `select t.id from tickets t where t.school_id = ? order by ${orderBy} limit ${limit}`,
    [schoolId],
  )
  return rows.map(r => Number(r.id))
}

beforeAll(async () => {
  const world = await orderOfKits('queue', 1)
  admin = world.admin
  teacher = world.teacher.client
  support = await signedIn('support@tiltwright.test')
  const [order] = await sql('select school_id, placed_by_id from orders where id = ?', [
    world.orderId,
  ])
  schoolId = Number(order.school_id)
  const teacherId = Number(order.placed_by_id)
  const staff = await sql('select id, email from users where email in (?, ?)', [
    'support@tiltwright.test',
    'admin@tiltwright.test',
  ])
  supportId = Number(staff.find(s => s.email.startsWith('support')).id)
  adminId = Number(staff.find(s => s.email.startsWith('admin')).id)

  const rows: string[] = []
  const params: unknown[] = []
  for (let i = 0; i < N; i++) {
    const hours = (i % 60) * 24 + 12
    const at = `utc_timestamp(3) - interval ${hours} hour`
    rows.push(`(?, ?, ?, ?, ?, ?, ?, ${at}, ${at}, ${at})`)
    params.push(
      schoolId,
      world.orderId,
      `Queue ${tag} ticket ${String((i * 7919) % N).padStart(4, '0')}`,
      STATUSES[i % 3],
      PRIORITIES[Math.floor(i / 3) % 3],
      i % 5 === 0 ? supportId : i % 5 === 1 ? adminId : null,
      teacherId,
    )
  }
  await sql(
    'insert into tickets (school_id, order_id, subject, status, priority, assignee_id, '
    + 'opened_by_id, created_at, last_message_at, status_changed_at) values '
    + rows.join(', '),
    params,
  )
  const seeded = (await sql('select id from tickets where school_id = ? order by id', [schoolId]))
    .map(r => Number(r.id))
  expect(seeded).toHaveLength(N)
  const msgs: string[] = []
  const msgParams: unknown[] = []
  seeded.forEach((id, i) => {
    msgs.push('(?, ?, false, ?)')
    msgParams.push(id, teacherId, `Seeded message ${i}${i % 81 === 0 ? ` ${MSGWORD}` : ''}`)
    if (i % 97 === 0) {
      msgs.push('(?, ?, true, ?)')
      msgParams.push(id, supportId, `A staff note ${NOTEWORD}`)
    }
  })
  await sql(
    `insert into ticket_messages (ticket_id, author_id, internal, body) values ${msgs.join(', ')}`,
    msgParams,
  )
})

describe('the help queue', () => {
  it('filters by status, priority, assignee, school and age as SQL counts them', async () => {
    const total = async (path: string) => {
      const r = await support.get(q(path))
      expect(r.status, JSON.stringify(r.body)).toBe(200)
      return r.body.meta.total as number
    }
    expect(await total('')).toBe(N)
    for (const s of STATUSES)
      expect(await total(`status=${encodeURIComponent(s)}`)).toBe(await count('t.status = ?', [s]))
    expect(await total('status=open')).toBe(await count('t.status <> \'resolved\''))
    for (const p of PRIORITIES)
      expect(await total(`priority=${p}`)).toBe(await count('t.priority = ?', [p]))
    expect(await total('assignee=me')).toBe(await count('t.assignee_id = ?', [supportId]))
    expect(await total(`assignee=${adminId}`)).toBe(await count('t.assignee_id = ?', [adminId]))
    expect(await total('assignee=none')).toBe(await count('t.assignee_id is null'))
    for (const [age, hours] of [['1d', 24], ['7d', 168], ['30d', 720]] as const)
      expect(await total(`age=${age}`)).toBe(
        await count(`t.created_at <= utc_timestamp(3) - interval ${hours} hour`),
      )
    expect(await total('status=needs%20reply&priority=urgent&assignee=none&age=3d')).toBe(
      await count(
        't.status = \'needs reply\' and t.priority = \'urgent\' and t.assignee_id is null '
        + 'and t.created_at <= utc_timestamp(3) - interval 72 hour',
      ),
    )
    // A filter value outside the list is a field error, not an empty page.
    const other = await support.get(`/api/help-queue?school=${schoolId}&status=bogus`)
    expect(other.status).toBe(422)
  })

  it('sorts both ways, priority and status by rank, ties by id', async () => {
    const page = async (sort: string, dir: string) =>
      ((await support.get(q(`sort=${sort}&dir=${dir}&pageSize=60`))).body.data as any[])
        .map(r => r.id)
    const rank = (col: string, values: string[]) =>
      `field(t.${col}, ${values.map(v => `'${v}'`).join(', ')})`
    for (const dir of ['asc', 'desc']) {
      expect(await page('priority', dir)).toEqual(
        await ids(`${rank('priority', PRIORITIES)} ${dir}, t.id asc`, 60),
      )
      expect(await page('status', dir)).toEqual(
        await ids(`${rank('status', STATUSES)} ${dir}, t.id asc`, 60),
      )
      expect(await page('createdAt', dir)).toEqual(await ids(`t.created_at ${dir}, t.id asc`, 60))
      expect(await page('subject', dir)).toEqual(await ids(`t.subject ${dir}, t.id asc`, 60))
    }
    // Urgent first when descending: not the alphabet's order (normal, low, urgent).
    const first = (await support.get(q('sort=priority&dir=desc&pageSize=5'))).body.data
    expect(first.every((r: any) => r.priority === 'urgent')).toBe(true)
  })

  it('searches subjects and message bodies, and notes for staff only', async () => {
    const hits = await count(
      `exists (select 1 from ticket_messages m where m.ticket_id = t.id and m.internal = false
        and m.body like ?)`,
      [`%${MSGWORD}%`],
    )
    const noted = await count(
      `exists (select 1 from ticket_messages m where m.ticket_id = t.id and m.internal = true
        and m.body like ?)`,
      [`%${NOTEWORD}%`],
    )
    expect(hits).toBeGreaterThan(10)
    expect(noted).toBeGreaterThan(10)
    expect((await support.get(q(`q=${MSGWORD}`))).body.meta.total).toBe(hits)
    expect((await support.get(q(`q=${NOTEWORD}`))).body.meta.total).toBe(noted)
    expect((await support.get(q(`q=Queue%20${tag}%20ticket%200001`))).body.meta.total).toBe(1)
    // The school's teacher finds the messages but never learns of the notes.
    expect((await teacher.get(`/api/tickets?q=${MSGWORD}`)).body.meta.total).toBe(hits)
    expect((await teacher.get(`/api/tickets?q=${NOTEWORD}`)).body.meta.total).toBe(0)
    // `%` and `_` match only themselves.
    expect((await support.get(q('q=%25'))).body.meta.total).toBe(0)
  })

  it('pages to the last page, and a page past the end answers the last', async () => {
    const r = await support.get(q('pageSize=7&page=9999'))
    const pages = Math.ceil(N / 7)
    expect(r.body.meta).toEqual({ total: N, page: pages, pageSize: 7, pages })
    expect(r.body.data).toHaveLength(N - (pages - 1) * 7)
    const row = r.body.data[0]
    expect(row).toMatchObject({ schoolId, messageCount: 1, lastFrom: 'customer' })
    expect(row.preview).toMatch(/^Seeded message \d+/)
    expect(row.ref).toBe(`T-${row.id}`)
  })

  it('assigns in bulk: only tickets that exist, only to active staff', async () => {
    const free = (await sql(
      'select id from tickets where school_id = ? and assignee_id is null order by id limit 3',
      [schoolId],
    )).map(r => Number(r.id))
    const r = await support.post('/api/help-queue/assign', {
      ticketIds: [...free, 999_999_999],
      assigneeId: adminId,
    })
    expect(r.status, JSON.stringify(r.body)).toBe(200)
    expect(r.body).toEqual({ updated: 3 })
    const now = await sql('select assignee_id from tickets where id in (?)', [free])
    expect(now.map(x => Number(x.assignee_id))).toEqual([adminId, adminId, adminId])
    const [teacherRow] = await sql('select placed_by_id from orders where school_id = ?', [
      schoolId,
    ])
    const bad = await support.post('/api/help-queue/assign', {
      ticketIds: free,
      assigneeId: Number(teacherRow.placed_by_id),
    })
    expect(bad.status).toBe(422)
    expect(bad.body.data.fields.assigneeId).toBe(
      'Choose someone on the support staff from the list.',
    )
    const back = await admin.post('/api/help-queue/assign', { ticketIds: free, assigneeId: null })
    expect(back.body).toEqual({ updated: 3 })
    const audited = await sql(
      'select count(*) as n from audit_log where action = \'ticket.assign\' and subject_id in (?)',
      [free],
    )
    expect(Number(audited[0].n)).toBe(6)
  })

  it('counts what the staff navigation shows', async () => {
    const c = (await support.get('/api/tickets/counts')).body
    const [row] = await sql(
      `select sum(status = 'needs reply') as needs,
        sum(status <> 'resolved' and assignee_id = ?) as mine,
        sum(status <> 'resolved' and assignee_id is null) as free from tickets`,
      [supportId],
    )
    expect(c).toEqual({
      awaitingYou: null,
      needsReply: Number(row.needs),
      assignedToMe: Number(row.mine),
      unassigned: Number(row.free),
    })
  })

  it('offers active staff, schools with tickets and parts in stock', async () => {
    const o = (await support.get('/api/help-queue/options')).body
    expect(o.staff.map((s: any) => s.id)).toEqual(expect.arrayContaining([supportId, adminId]))
    expect(o.staff.every((s: any) => s.role === 'support' || s.role === 'admin')).toBe(true)
    expect(o.schools.map((s: any) => s.id)).toContain(schoolId)
    expect(o.parts.length).toBeGreaterThan(0)
    expect(o.parts.every((p: any) => p.available > 0)).toBe(true)
  })
})
