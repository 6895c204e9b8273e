// The account life cycle through the real built server, the real test MariaDB and the
// fake SMTP server: register, verify by the caught mail, sign in, wrong password,
// throttling, reset, change password.
import { describe, expect, inject, it } from 'vitest'
import { $fetch, setup } from '@nuxt/test-utils/e2e'
import { Client, uniqueEmail } from '../helpers/client'
import { linkIn, waitForMail } from '../helpers/mail'

await setup({ host: inject('baseUrl') })

const school = {
  name: 'Harbor Point Middle School',
  addressLine1: '9 Dune Road',
  city: 'Seaview',
  region: 'CA',
  postalCode: '90001',
}

describe('register and verify', () => {
  it('serves the home page', async () => {
    const html = await $fetch<string>('/')
    expect(html).toContain('Tiltwright')
  })

  it(
    'registers a teacher and school, who signs in and verifies the address from '
    + 'the e-mailed link', async () => {
      const c = new Client()
      const email = uniqueEmail('reg')
      const r = await c.post('/api/auth/register', {
        name: 'Avery Lin',
        email,
        password: 'a-long-password-1',
        school,
      })
      expect(r.status).toBe(201)
      expect(r.body.user).toBeUndefined()
      expect((await c.get('/api/_auth/session')).body.user).toBeUndefined()
      expect(await c.signIn(email, 'a-long-password-1')).toMatchObject({
        email,
        role: 'teacher',
        verified: false,
      })

      const session = await c.get('/api/_auth/session')
      expect(session.body.user).toMatchObject({ email, name: 'Avery Lin', role: 'teacher' })

      const mail = await waitForMail(email, /Confirm your e-mail/)
      const link = new URL(linkIn(mail, /http\S+verify-email\?token=\S+/))
      const token = link.searchParams.get('token')!
      const v = await c.post('/api/auth/verify-email', { token })
      expect(v.status).toBe(200)
      expect((await c.get('/api/account')).body.user.verified).toBe(true)
      expect((await c.get('/api/account')).body.school).toMatchObject({
        name: school.name,
        taxExemption: 'none',
      })

      const again = await c.post('/api/auth/verify-email', { token })
      expect(again.status).toBe(400)
      expect(again.body.data.code).toBe('token-invalid')
    })

  it(
    'answers a known address exactly as a new one and tells only the owner, by '
    + 'e-mail', async () => {
      const owner = uniqueEmail('known')
      await new Client().post('/api/auth/register', {
        name: 'First Owner',
        email: owner,
        password: 'owner-password-1',
        school,
      })
      const fresh = await new Client().post('/api/auth/register', {
        name: 'New Person',
        email: uniqueEmail('new'),
        password: 'a-long-password-1',
        school,
      })
      const again = await new Client().post('/api/auth/register', {
        name: 'Someone',
        email: owner.toUpperCase(),
        password: 'intruder-password',
        school,
      })
      expect(again.status).toBe(fresh.status)
      expect(again.body).toEqual(fresh.body)
      expect(again.headers.get('set-cookie') ?? '').not.toMatch(/nuxt-session=[^;]+/)
      await waitForMail(owner, /already have a Tiltwright account/)
      // Nothing of the account changed: the owner's password still works, the intruder's does not.
      const intruder = { email: owner, password: 'intruder-password' }
      expect(
        (await new Client().post('/api/auth/login', intruder)).status,
      ).toBe(401)
      await new Client().signIn(owner, 'owner-password-1')
    })

  it('answers bad input field by field with 422, never 500', async () => {
    const c = new Client()
    const r = await c.post('/api/auth/register', {
      name: '',
      email: 'not-an-email',
      password: 'short',
      school: { name: 'x'.repeat(200) },
    })
    expect(r.status).toBe(422)
    const f = r.body.data.fields
    expect(f.name).toBe('Enter your name.')
    expect(f.email).toMatch(/e-mail address/)
    expect(f.password).toMatch(/at least 10/)
    expect(f['school.name']).toMatch(/160 characters or fewer/)
    expect(f['school.city']).toBe('Enter the city.')

    const wrongTypes = await c.post('/api/auth/register', {
      name: 42,
      email: [],
      password: null,
      school: 'yes',
    })
    expect(wrongTypes.status).toBe(422)
    expect(Object.keys(wrongTypes.body.data.fields).sort()).toEqual([
      'email',
      'name',
      'password',
      'school',
    ])

    const notJson = await c.request('POST', '/api/auth/login', '{"email":')
    expect(notJson.status).toBe(400)
  })
})

describe('sign in', () => {
  it('signs in every demo account with its role', async () => {
    for (const role of ['teacher', 'builder', 'support', 'admin']) {
      const c = new Client()
      const user = await c.signIn(`${role}@tiltwright.test`)
      expect(user.role).toBe(role)
      expect((await c.get('/api/_auth/session')).body.user.role).toBe(role)
    }
  })

  it('rejects a wrong password with 401 and the same message as an unknown account', async () => {
    const c = new Client()
    const wrong = await c.post('/api/auth/login', {
      email: 'admin@tiltwright.test',
      password: 'not-the-password',
    })
    const unknown = await c.post('/api/auth/login', {
      email: 'nobody@school.test',
      password: 'not-the-password',
    })
    expect(wrong.status).toBe(401)
    expect(unknown.status).toBe(401)
    expect(wrong.body.message).toBe(unknown.body.message)
    expect((await c.get('/api/_auth/session')).body.user).toBeUndefined()
  })

  it('refuses a state-changing request without the CSRF token', async () => {
    const c = new Client()
    const r = await c.post(
      '/api/auth/login',
      { email: 'teacher@tiltwright.test', password: 'tiltwright-demo' },
      { csrf: false },
    )
    expect(r.status).toBe(403)
  })

  it(
    'slows down guessing: after 5 failures the account answers 429 with '
    + 'Retry-After, even for the right password', async () => {
      const c = new Client()
      const email = uniqueEmail('throttle')
      await c.post('/api/auth/register', {
        name: 'Guess Target',
        email,
        password: 'the-right-password',
        school,
      })
      const guesser = new Client()
      for (let i = 0; i < 5; i++)
        expect(
          (await guesser.post('/api/auth/login', { email, password: `guess-${i}-wrong` })).status,
        ).toBe(401)
      const right = { email, password: 'the-right-password' }
      const blocked = await guesser.post('/api/auth/login', right)
      expect(blocked.status).toBe(429)
      expect(Number(blocked.headers.get('retry-after'))).toBeGreaterThan(0)
      expect(blocked.body.data.code).toBe('rate-limited')
    })

  it('signs out', async () => {
    const c = new Client()
    await c.signIn('teacher@tiltwright.test')
    expect((await c.post('/api/auth/logout')).status).toBe(200)
    expect((await c.get('/api/account')).status).toBe(401)
  })
})

describe('password reset and change', () => {
  it(
    'resets a forgotten password with a single-use link and answers the same for '
    + 'unknown addresses', async () => {
      const c = new Client()
      const email = uniqueEmail('reset')
      await c.post('/api/auth/register', {
        name: 'Forgetful Fran',
        email,
        password: 'first-password-1',
        school,
      })
      await c.post('/api/auth/logout')

      const unknown = await c.post('/api/auth/forgot-password', { email: uniqueEmail('ghost') })
      const known = await c.post('/api/auth/forgot-password', { email })
      expect(unknown.status).toBe(202)
      expect(known.status).toBe(202)
      expect(known.body.message).toBe(unknown.body.message)

      const mail = await waitForMail(email, /Reset your Tiltwright password/)
      const token = linkIn(mail, /reset-password\/[A-Za-z0-9_-]+/)
        .split('/')
        .pop()!
      const short = await c.post('/api/auth/reset-password', { token, password: 'short' })
      expect(short.status).toBe(422)
      expect(short.body.data.fields.password).toMatch(/at least 10/)

      const ok = await c.post('/api/auth/reset-password', { token, password: 'second-password-2' })
      expect(ok.status).toBe(200)
      expect((await c.get('/api/_auth/session')).body.user.email).toBe(email)
      expect(
        (await c.post('/api/auth/reset-password', { token, password: 'third-password-3' })).status,
      ).toBe(400)

      const fresh = new Client()
      expect(
        (await fresh.post('/api/auth/login', { email, password: 'first-password-1' })).status,
      ).toBe(401)
      await fresh.signIn(email, 'second-password-2')
      await waitForMail(email, /password was changed/)
    })

  it('changes the password only with the current one', async () => {
    const c = new Client()
    const email = uniqueEmail('change')
    await c.post('/api/auth/register', {
      name: 'Careful Cam',
      email,
      password: 'first-password-1',
      school,
    })
    await c.signIn(email, 'first-password-1')
    const bad = await c.post('/api/account/password', {
      currentPassword: 'wrong-one-here',
      newPassword: 'second-password-2',
    })
    expect(bad.status).toBe(422)
    expect(bad.body.data.fields.currentPassword).toMatch(/not your current password/)
    const same = await c.post('/api/account/password', {
      currentPassword: 'first-password-1',
      newPassword: 'first-password-1',
    })
    expect(same.body.data.fields.newPassword).toMatch(/different/)
    expect(
      (
        await c.post('/api/account/password', {
          currentPassword: 'first-password-1',
          newPassword: 'second-password-2',
        })
      ).status,
    ).toBe(200)
    await new Client().signIn(email, 'second-password-2')
  })
})
