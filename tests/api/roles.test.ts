// Role checks on the server: anonymous callers get 401, wrong roles 403 (or 404 where
// existence must not leak), the right role gets through.
import { describe, expect, it } from 'vitest'
import { Client, uniqueEmail } from '../helpers/client'
import { linkIn, waitForMail } from '../helpers/mail'
import { hoursInWords, LINK_LIFETIME_HOURS } from '../../shared/utils/lifetimes'

async function as(role: string) {
  const c = new Client()
  await c.signIn(`${role}@tiltwright.test`)
  return c
}

describe('role checks', () => {
  it('answers 401 to anonymous calls on protected routes', async () => {
    const c = new Client()
    for (const path of ['/api/account', '/api/admin/staff', '/api/staff/mail'])
      expect((await c.get(path)).status).toBe(401)
    expect(
      (await c.post('/api/admin/staff', { name: 'X', email: 'x@y.test', role: 'support' })).status,
    ).toBe(401)
  })

  it('lets only admins list and add staff', async () => {
    for (const role of ['teacher', 'builder', 'support']) {
      const c = await as(role)
      expect((await c.get('/api/admin/staff')).status).toBe(403)
      expect(
        (
          await c.post('/api/admin/staff', {
            name: 'Sneaky',
            email: uniqueEmail('sneak'),
            role: 'admin',
          })
        ).status,
      ).toBe(403)
    }
    const admin = await as('admin')
    const list = await admin.get('/api/admin/staff?sort=email&dir=desc')
    expect(list.status).toBe(200)
    expect(list.body.meta.total).toBeGreaterThanOrEqual(2)
    expect(
      list.body.data.map((u: any) => u.role).every((r: string) => r === 'support' || r === 'admin'),
    ).toBe(true)
    const emails = list.body.data.map((u: any) => u.email)
    expect(emails).toEqual([...emails].sort().reverse())
  })

  it('validates list queries instead of passing a free string to ORDER BY', async () => {
    const admin = await as('admin')
    const r = await admin.get('/api/admin/staff?sort=password_hash&page=0')
    expect(r.status).toBe(422)
    expect(r.body.data.fields.sort).toMatch(/Sort by one of/)
    expect(r.body.data.fields.page).toMatch(/start at 1/)
  })

  it('adds a support colleague who receives a link to choose a password', async () => {
    const admin = await as('admin')
    const email = uniqueEmail('colleague')
    const r = await admin.post('/api/admin/staff', {
      name: 'New Colleague',
      email,
      role: 'support',
    })
    expect(r.status).toBe(201)
    expect(typeof r.body.id).toBe('number')
    const invite = await waitForMail(email, /staff account/)
    expect(invite.text).toContain('Marcus Teel has added you')
    expect(invite.text).toMatch(/reset-password\/[A-Za-z0-9_-]+/)
    expect(invite.text).toContain(`expires in ${hoursInWords(LINK_LIFETIME_HOURS.invitation)}`)
    const dup = await admin.post('/api/admin/staff', { name: 'Twice', email, role: 'support' })
    expect(dup.status).toBe(409)
    expect(dup.body.data.fields.email).toBeDefined()
  })

  it('shows caught mail to admins only, with every single-use link masked', async () => {
    expect((await (await as('teacher')).get('/api/staff/mail')).status).toBe(403)
    // Support staff could otherwise read any customer's reset link and take the account over.
    expect((await (await as('support')).get('/api/staff/mail')).status).toBe(403)
    const email = uniqueEmail('masked')
    await new Client().post('/api/auth/register', {
      name: 'Masked Mo',
      email,
      password: 'a-long-password-1',
      school: {
        name: 'Mask School',
        addressLine1: '1 Way',
        city: 'Town',
        region: 'OR',
        postalCode: '97000',
      },
    })
    await new Client().post('/api/auth/forgot-password', { email })
    await waitForMail(email, /Reset your Tiltwright password/)
    const r = await (await as('admin')).get('/api/staff/mail')
    expect(r.status).toBe(200)
    const mine = r.body.data.filter((m: any) => m.to.includes(email))
    expect(mine.length).toBe(2)
    for (const m of mine) {
      expect(m.text).toMatch(/(reset-password\/|verify-email\?token=)[A-Za-z0-9_-]{4}…\(hidden\)/)
      expect(m.text).not.toMatch(/(reset-password\/|token=)[A-Za-z0-9_-]{20,}/)
      expect(m.html ?? '').not.toMatch(/(reset-password\/|token=)[A-Za-z0-9_-]{20,}/)
    }
  })
})

describe('the staff desk', () => {
  it('shows admins the order lists and support only the failed mail', async () => {
    expect((await new Client().get('/api/staff/desk')).status).toBe(401)
    for (const role of ['teacher', 'builder'])
      expect((await (await as(role)).get('/api/staff/desk')).status).toBe(403)
    const support = await (await as('support')).get('/api/staff/desk')
    expect(support.status).toBe(200)
    // Support see no prices, so none of the order lists (which carry totals).
    expect(support.body).toEqual({
      poToReview: null,
      toAllocate: null,
      toShip: null,
      waiting: null,
      failedMail: expect.any(Number),
    })
    const admin = await (await as('admin')).get('/api/staff/desk')
    expect(admin.status).toBe(200)
    expect(admin.body.failedMail).toBe(support.body.failedMail)
    for (const key of ['poToReview', 'toAllocate', 'toShip']) {
      const list = admin.body[key]
      expect(Array.isArray(list)).toBe(true)
      expect(list.length).toBeLessThanOrEqual(20)
      // The count is of all that wait: the list is them all, or the 20 oldest of more.
      expect(list.length, key).toBe(Math.min(admin.body.waiting[key], 20))
      for (const o of list)
        expect(o).toEqual({
          id: expect.any(Number),
          number: expect.stringMatching(/^TW-\d+$/),
          schoolName: expect.any(String),
          totalCents: expect.any(Number),
          since: expect.any(String),
        })
      const since = list.map((o: any) => Date.parse(o.since))
      expect(since).toEqual([...since].sort((a, b) => a - b))
    }
  })
})

describe('staff accounts', () => {
  async function staffRow(admin: Client, email: string) {
    const r = await admin.get(`/api/admin/staff?q=${encodeURIComponent(email)}`)
    expect(r.status).toBe(200)
    return r.body.data.find((u: any) => u.email === email)
  }

  /** A support colleague invited by the admin who has chosen a password (and so signed in). */
  async function invitedColleague(admin: Client, name = 'Desk Colleague') {
    const email = uniqueEmail('staffer')
    const made = await admin.post('/api/admin/staff', { name, email, role: 'support' })
    expect(made.status).toBe(201)
    return { id: made.body.id as number, email }
  }

  async function acceptInvitation(email: string) {
    const invite = await waitForMail(email, /staff account/)
    const token = linkIn(invite, /reset-password\/[A-Za-z0-9_-]+/).split('/').pop()
    const c = new Client()
    const r = await c.post('/api/auth/reset-password', { token, password: 'staff-password-9' })
    expect(r.status).toBe(200)
    return c
  }

  it('lists a colleague as invited until the first sign-in, then active', async () => {
    const admin = await as('admin')
    const { email } = await invitedColleague(admin)
    expect(await staffRow(admin, email)).toMatchObject({
      role: 'support',
      status: 'invited',
      lastSignInAt: null,
    })
    await acceptInvitation(email)
    const after = await staffRow(admin, email)
    expect(after.status).toBe('active')
    expect(Date.parse(after.lastSignInAt)).toBeGreaterThan(Date.parse(after.createdAt))
  })

  it('disables a colleague and ends their live session at once', async () => {
    const admin = await as('admin')
    const { id, email } = await invitedColleague(admin)
    const colleague = await acceptInvitation(email)
    expect((await colleague.get('/api/staff/desk')).status).toBe(200)
    const off = await admin.patch(`/api/admin/staff/${id}`, { disabled: true })
    expect(off.status).toBe(200)
    expect(off.body).toMatchObject({ id, email, status: 'disabled' })
    expect((await colleague.get('/api/account')).status).toBe(401)
    const signIn = await new Client().post('/api/auth/login', {
      email,
      password: 'staff-password-9',
    })
    expect(signIn.status).not.toBe(200)
    const on = await admin.patch(`/api/admin/staff/${id}`, { disabled: false, role: 'admin' })
    expect(on.body).toMatchObject({ status: 'active', role: 'admin' })
  })

  it('refuses self-demotion, self-disabling, customers and bad bodies', async () => {
    const admin = await as('admin')
    const me = (await admin.get('/api/account')).body.user
    const demote = await admin.patch(`/api/admin/staff/${me.id}`, { role: 'support' })
    expect(demote.status).toBe(409)
    expect(demote.body.data.fields.role).toMatch(/own role/)
    const off = await admin.patch(`/api/admin/staff/${me.id}`, { disabled: true })
    expect(off.status).toBe(409)
    expect(off.body.data.fields.disabled).toMatch(/own account/)
    expect((await admin.get('/api/account')).status).toBe(200)

    const teacher = (await (await as('teacher')).get('/api/account')).body.user
    expect((await admin.patch(`/api/admin/staff/${teacher.id}`, { disabled: true })).status).toBe(
      404,
    )
    const bad = await admin.patch(`/api/admin/staff/${me.id}`, { role: 'teacher' })
    expect(bad.status).toBe(422)
    expect(bad.body.data.fields.role).toBe('Staff are support or admin.')
    expect((await admin.patch(`/api/admin/staff/${me.id}`, {})).status).toBe(422)
    expect((await admin.patch('/api/admin/staff/0x1', { disabled: true })).status).toBe(404)
    const support = await as('support')
    expect((await support.patch(`/api/admin/staff/${me.id}`, { disabled: true })).status).toBe(403)
  })

  it('answers a page past the end with the last page', async () => {
    const admin = await as('admin')
    const first = await admin.get('/api/admin/staff?pageSize=1&sort=email')
    const { total, pages } = first.body.meta
    expect(pages).toBe(total)
    const last = await admin.get(`/api/admin/staff?pageSize=1&sort=email&page=${pages}`)
    const past = await admin.get('/api/admin/staff?pageSize=1&sort=email&page=100000')
    expect(past.status).toBe(200)
    expect(past.body.meta).toEqual({ total, page: pages, pageSize: 1, pages })
    expect(past.body.data).toEqual(last.body.data)
    expect(past.body.data).toHaveLength(1)
  })

  it('matches % and _ in a search literally', async () => {
    const admin = await as('admin')
    const { email } = await invitedColleague(admin, 'Hundred% Hana_Lee')
    for (const term of ['%', '_', 'd% H']) {
      const r = await admin.get(`/api/admin/staff?q=${encodeURIComponent(term)}&pageSize=100`)
      expect(r.status).toBe(200)
      expect(r.body.data.map((u: any) => u.email)).toContain(email)
      for (const u of r.body.data) expect(`${u.name} ${u.email}`).toContain(term)
    }
  })
})
