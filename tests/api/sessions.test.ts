// Sessions that stay the owner's: each sign-in is a row of its own, checked on every request,
// so a cookie copied before a sign-out, a password change or a reset stops working at once.
import { sql } from '../helpers/db'
import { describe, expect, it } from 'vitest'
import { Client, registerAccount } from '../helpers/client'
import { linkIn, waitForMail } from '../helpers/mail'

const school = {
  name: 'Session Street School',
  addressLine1: '5 Cookie Lane',
  city: 'Crumb',
  region: 'OR',
  postalCode: '97001',
}

const newAccount = (tag: string, password = 'first-password-1') =>
  registerAccount(tag, password, school)

async function signedIn(email: string, password = 'first-password-1') {
  const c = new Client()
  await c.signIn(email, password)
  return c
}

describe('revocable sessions', () => {
  it(
    'refuses a cookie copied before sign-out, on the API and on the session '
    + 'endpoint', async () => {
      const email = await newAccount('copied')
      const c = await signedIn(email)
      const thief = c.clone()
      expect((await thief.get('/api/account')).status).toBe(200)
      expect((await c.post('/api/auth/logout')).status).toBe(200)
      expect((await thief.get('/api/account')).status).toBe(401)
      expect((await thief.get('/api/_auth/session')).body.user).toBeUndefined()
    })

  it(
    'ends every other session on a password change, and keeps the one that '
    + 'changed it', async () => {
      const email = await newAccount('change')
      const here = await signedIn(email)
      const elsewhere = await signedIn(email)
      const r = await here.post('/api/account/password', {
        currentPassword: 'first-password-1',
        newPassword: 'second-password-2',
      })
      expect(r.status).toBe(200)
      expect((await here.get('/api/account')).status).toBe(200)
      expect((await elsewhere.get('/api/account')).status).toBe(401)
    })

  it('ends every session on a reset, and the reset signs in with a new one', async () => {
    const email = await newAccount('reset')
    const before = await signedIn(email)
    const stolen = before.clone()
    await new Client().post('/api/auth/forgot-password', { email })
    const token = linkIn(
      await waitForMail(email, /Reset your Tiltwright password/),
      /reset-password\/[A-Za-z0-9_-]+/,
    )
      .split('/')
      .pop()!
    const resetter = new Client()
    expect(
      (await resetter.post('/api/auth/reset-password', { token, password: 'after-reset-pass' }))
        .status,
    ).toBe(200)
    expect((await before.get('/api/account')).status).toBe(401)
    expect((await stolen.get('/api/account')).status).toBe(401)
    expect((await resetter.get('/api/account')).status).toBe(200)
  })

  it('lists the signed-in devices and signs out everywhere', async () => {
    const email = await newAccount('devices')
    const phone = await signedIn(email)
    const laptop = new Client()
    const ua = 'Mozilla/5.0 (Windows NT 10.0; Win64; x64; rv:128.0) Gecko/20100101 Firefox/128.0'
    expect(
      (
        await laptop.post(
          '/api/auth/login',
          { email, password: 'first-password-1' },
          { headers: { 'user-agent': ua } },
        )
      ).status,
    ).toBe(200)
    const list = await laptop.get('/api/account/sessions')
    expect(list.status).toBe(200)
    expect(list.body.data).toHaveLength(2)
    expect(list.body.data.filter((s: any) => s.current)).toEqual([
      expect.objectContaining({ device: 'Firefox on Windows' }),
    ])
    // No full user-agent strings or addresses are kept about anyone.
    expect(Object.keys(list.body.data[0]).sort()).toEqual([
      'current',
      'device',
      'id',
      'lastSeenAt',
      'signedInAt',
    ])

    expect((await laptop.delete('/api/account/sessions')).status).toBe(200)
    expect((await laptop.get('/api/account')).status).toBe(401)
    expect((await phone.get('/api/account')).status).toBe(401)
  })
})

describe('idle sessions', () => {
  it('ends a session left unused for as long as the cookie lives (14 days)', async () => {
    const email = await newAccount('idle')
    const c = await signedIn(email)
    await sql(
      `UPDATE user_sessions s JOIN users u ON u.id = s.user_id
      SET s.last_seen_at = NOW(3) - INTERVAL 15 DAY WHERE u.email = ?`,
      [email],
    )
    expect((await c.get('/api/account')).status).toBe(401)
  })
})

describe('the e-mail banner', () => {
  it(
    'reads the confirmed address in every signed-in browser, and "send it again" '
    + 'says what happened', async () => {
      const email = await newAccount('banner')
      const tabA = await signedIn(email)
      const tabB = await signedIn(email)
      expect((await tabB.get('/api/_auth/session')).body.user.verified).toBe(false)
      const first = await tabA.post('/api/auth/resend-verification')
      expect(first.body).toEqual({ sent: true, verified: false })

      const mail = await waitForMail(email, /Confirm your e-mail/)
      const link = new URL(linkIn(mail, /http\S+verify-email\?token=\S+/))
      const token = link.searchParams.get('token')!
      expect((await new Client().post('/api/auth/verify-email', { token })).status).toBe(200)
      // The other browser's cookie still says "unconfirmed"; the session answer reads the database.
      expect((await tabB.get('/api/_auth/session')).body.user.verified).toBe(true)
      expect((await tabA.get('/api/_auth/session')).body.user.verified).toBe(true)
      expect((await tabA.post('/api/auth/resend-verification')).body).toEqual({
        sent: false,
        verified: true,
      })
    })
})
