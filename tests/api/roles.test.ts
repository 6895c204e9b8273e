// Role checks on the server: anonymous callers get 401, wrong roles 403 (or 404 where
// existence must not leak), the right role gets through.
import { describe, expect, it } from 'vitest'
import { Client, uniqueEmail } from '../helpers/client'
import { waitForMail } from '../helpers/mail'
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
