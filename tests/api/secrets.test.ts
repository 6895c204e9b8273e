// No secret ships in the source: the built server refuses to start without the per-install
// secrets, and names the ones that are missing.
import { describe, expect, it } from 'vitest'
import { inject } from 'vitest'
import { runAppExpectingExit } from '../helpers/instance'

describe('secrets come from the install, not the source', () => {
  it('refuses to start without the payment secrets and names them', async () => {
    const port = Number(new URL(inject('baseUrl')).port) + 60
    const r = await runAppExpectingExit(port, { NUXT_PAYMENTS_SECRET_KEY: undefined, NUXT_PAYMENTS_WEBHOOK_SECRET: undefined })
    expect(r.code).toBe(1)
    expect(r.log).toMatch(/refusing to start: missing NUXT_PAYMENTS_SECRET_KEY, NUXT_PAYMENTS_WEBHOOK_SECRET/)
  })

  it('refuses a short session password and a missing CSRF secret', async () => {
    const port = Number(new URL(inject('baseUrl')).port) + 61
    const r = await runAppExpectingExit(port, { NUXT_SESSION_PASSWORD: 'short', NUXT_CSURF_ENCRYPT_SECRET: undefined })
    expect(r.code).toBe(1)
    expect(r.log).toContain('NUXT_SESSION_PASSWORD (32 characters or more)')
    expect(r.log).toContain('NUXT_CSURF_ENCRYPT_SECRET')
  })
})
