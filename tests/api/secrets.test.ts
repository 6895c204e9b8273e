// No secret ships in the source: the built server refuses to start without the per-install
// secrets, and names the ones that are missing.
import { describe, expect, inject, it } from 'vitest'
import { runAppExpectingExit, startAppInstance } from '../helpers/instance'

describe('secrets come from the install, not the source', () => {
  it('refuses to start without the payment secrets and names them', async () => {
    const port = Number(new URL(inject('baseUrl')).port) + 60
    const r = await runAppExpectingExit(port, {
      NUXT_PAYMENTS_SECRET_KEY: undefined,
      NUXT_PAYMENTS_WEBHOOK_SECRET: undefined,
    })
    expect(r.code).toBe(1)
    expect(r.log).toMatch(
      /refusing to start: missing NUXT_PAYMENTS_SECRET_KEY, NUXT_PAYMENTS_WEBHOOK_SECRET/,
    )
  })

  it('refuses a short session password and a missing CSRF secret', async () => {
    const port = Number(new URL(inject('baseUrl')).port) + 61
    const r = await runAppExpectingExit(port, {
      NUXT_SESSION_PASSWORD: 'short',
      NUXT_CSURF_ENCRYPT_SECRET: undefined,
    })
    expect(r.code).toBe(1)
    expect(r.log).toContain('NUXT_SESSION_PASSWORD (32 characters or more)')
    expect(r.log).toContain('NUXT_CSURF_ENCRYPT_SECRET')
  })
})

describe('a restart keeps what the install\'s secrets protect', () => {
  // A page fetched before a restart, and a signed-in session, keep working after it: the
  // second process (same install, as after `npm start` again) accepts both. With another
  // CSRF secret the same token is refused, so the secret is the install's, not the build's.
  it(
    'accepts a CSRF token and a session made by an earlier process, and only with '
    + 'the same secret', async () => {
      const base = inject('baseUrl')
      const page = await fetch(new URL('/login', base))
      const token = (await page.text()).match(/<meta name="csrf-token" content="([^"]+)"/)![1]!
      const cookies = page.headers
        .getSetCookie()
        .map(c => c.split(';')[0])
        .join('; ')
      const login = await fetch(new URL('/api/auth/login', base), {
        method: 'POST',
        headers: {
          'cookie': cookies,
          'csrf-token': token,
          'content-type': 'application/json',
          'origin': base,
        },
        body: JSON.stringify({ email: 'teacher@tiltwright.test', password: 'tiltwright-demo' }),
      })
      expect(login.status).toBe(200)
      const session = login.headers
        .getSetCookie()
        .map(c => c.split(';')[0])
        .join('; ')
      const jar = `${cookies}; ${session}`

      const port = Number(new URL(base).port)
      const again = await startAppInstance(port + 70)
      const other = await startAppInstance(port + 71, { NUXT_CSURF_ENCRYPT_SECRET: 'x'.repeat(32) })
      try {
        const price = (url: string) =>
          fetch(new URL('/api/cart/price', url), {
            method: 'POST',
            headers: {
              'cookie': jar,
              'csrf-token': token,
              'content-type': 'application/json',
              'origin': url,
            },
            body: JSON.stringify({ lines: [{ productId: 1, quantity: 1 }] }),
          })
        expect((await price(again.url)).status).toBe(200)
        expect(
          (await fetch(new URL('/api/account', again.url), { headers: { cookie: jar } })).status,
        ).toBe(200)
        expect((await price(other.url)).status).toBe(403)
      } finally {
        await again.kill()
        await other.kill()
      }
    })
})
