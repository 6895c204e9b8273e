// Snapshots of what every signed-out visitor gets alike (server/utils/snapshots.ts): the public
// catalog and the public pages. They must follow every change of the catalog, its prices and its
// stock (at once on the instance that made it, within SNAPSHOT_MAX_AGE_MS on another instance),
// and carry nothing of one visitor to another: no cookie, no CSRF token, no CSP nonce.
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest'
import { Client } from '../helpers/client'
import { newTeacher, productWithStock, signedIn } from '../helpers/shop'
import { startAppInstance, type AppInstance } from '../helpers/instance'
import { SNAPSHOT_MAX_AGE_MS } from '../../server/utils/snapshots'

const anonymous = () => new Client()
const priceOf = async (slug: string, base?: string) => {
  const r = await fetch(new URL(`/api/products/${slug}`, base ?? inject('baseUrl')))
  expect(r.status).toBe(200)
  expect(r.headers.getSetCookie()).toEqual([])
  const body = (await r.json()) as { priceTiers: { unitPriceCents: number }[], available: number }
  return { cents: body.priceTiers[0]!.unitPriceCents, available: body.available }
}
const listed = async (slug: string) =>
  ((await anonymous().get('/api/products')).body.data as any[]).find(p => p.slug === slug)

describe('the shared catalog snapshot', () => {
  let admin: Client
  beforeAll(async () => {
    admin = await signedIn('admin@tiltwright.test')
  })

  it('shows an admin\'s price change in the very next anonymous read', async () => {
    const { productId, slug } = await productWithStock(admin, 10)
    expect((await priceOf(slug)).cents).toBe(2500)
    expect((await listed(slug)).priceTiers[0].unitPriceCents).toBe(2500)
    const r = await admin.patch(`/api/admin/products/${productId}`, {
      tiers: [{ minQuantity: 1, unitPriceCents: 2600 }],
    })
    expect(r.status).toBe(200)
    expect((await priceOf(slug)).cents).toBe(2600)
    expect((await listed(slug)).priceTiers[0].unitPriceCents).toBe(2600)
    // The kit page a signed-out visitor is served says the new price too.
    const page = await (await fetch(new URL(`/kits/${slug}`, inject('baseUrl')))).text()
    expect(page).toContain('$26.00')
    expect(page).not.toContain('$25.00')
  })

  it('shows the stock an order took in the very next anonymous read', async () => {
    const { productId, slug } = await productWithStock(admin, 10)
    expect((await priceOf(slug)).available).toBe(10)
    const { client: teacher } = await newTeacher('snapshot')
    const r = await teacher.post('/api/checkout/card', { lines: [{ productId, quantity: 3 }] })
    expect(r.status).toBe(201)
    expect((await priceOf(slug)).available).toBe(7)
    expect((await listed(slug)).available).toBe(7)
  })

  describe('with a second instance on the same database', () => {
    let other: AppInstance
    beforeAll(async () => {
      other = await startAppInstance(Number(new URL(inject('baseUrl')).port) + 80)
    }, 60_000)
    afterAll(async () => {
      await other?.kill('SIGTERM')
    })

    it('shows a change made through the first within the staleness bound', async () => {
      const { productId, slug } = await productWithStock(admin, 10)
      // The second instance holds a snapshot with the old price…
      expect((await priceOf(slug, other.url)).cents).toBe(2500)
      expect((await admin.patch(`/api/admin/products/${productId}`, { active: false })).status)
        .toBe(200)
      const changedAt = Date.now()
      // …and answers from the database once the bound has passed.
      await new Promise(r => setTimeout(r, SNAPSHOT_MAX_AGE_MS + 20 - (Date.now() - changedAt)))
      const gone = await fetch(new URL(`/api/products/${slug}`, other.url))
      expect(gone.status).toBe(404)
      const list = await (await fetch(new URL('/api/products', other.url))).json()
      expect((list as any).data.some((p: any) => p.slug === slug)).toBe(false)
    })
  })
})

describe('pages served to signed-out visitors', () => {
  const base = () => inject('baseUrl')

  it('carry no cookie, no CSRF token and a nonce of their own', async () => {
    const pages = await Promise.all([fetch(new URL('/', base())), fetch(new URL('/', base()))])
    const nonces: string[] = []
    for (const p of pages) {
      expect(p.status).toBe(200)
      expect(p.headers.getSetCookie()).toEqual([])
      const html = await p.text()
      expect(html).not.toMatch(/<meta name="csrf-token"/)
      const nonce = p.headers.get('content-security-policy')!.match(/'nonce-([^']+)'/)![1]!
      expect(html).toContain(`nonce="${nonce}"`)
      nonces.push(nonce)
    }
    expect(nonces[0]).not.toBe(nonces[1])
  })

  it('leave a signed-in render its own nonce, and give API replies none to leak', async () => {
    // server/plugins/request-constants.ts skips the nonce where nothing is rendered; a page
    // rendered for a signed-in person must still get a fresh one, the same in header and page.
    const teacher = await signedIn('teacher@tiltwright.test')
    const nonces: string[] = []
    for (let i = 0; i < 2; i++) {
      const r = await teacher.raw('/orders', { headers: { accept: 'text/html' } })
      expect(r.status).toBe(200)
      const nonce = r.headers.get('content-security-policy')!.match(/'nonce-([^']+)'/)![1]!
      expect(nonce).toMatch(/^[A-Za-z0-9+/=]{16,}$/)
      expect(await r.text()).toContain(`nonce="${nonce}"`)
      nonces.push(nonce)
    }
    expect(nonces[0]).not.toBe(nonces[1])
    for (const path of ['/api/products', '/api/account']) {
      const r = await teacher.raw(path)
      expect(r.status, path).toBe(200)
      expect(r.headers.get('content-security-policy') ?? '', path).not.toMatch(/nonce/)
    }
  })

  it('give two visitors two different tokens, each good only with its own cookie', async () => {
    const a = anonymous()
    const b = anonymous()
    await a.page('/')
    await b.page('/')
    const ta = (await a.authHeaders())['csrf-token']
    const tb = (await b.authHeaders())['csrf-token']
    // A real token each (nuxt-csurf's are tens of characters), not an empty header.
    expect(ta).toMatch(/^\S{20,}$/)
    expect(tb).toMatch(/^\S{20,}$/)
    expect(ta).not.toBe(tb)
    expect(a.cookie('csrf')).not.toBe(b.cookie('csrf'))
    const wrong = { email: 'nobody@school.test', password: 'not-the-password-1' }
    // Each visitor's own token passes the CSRF check (the sign-in itself then fails: 401).
    expect((await a.post('/api/auth/login', wrong)).status).toBe(401)
    expect((await b.post('/api/auth/login', wrong)).status).toBe(401)
    // The other visitor's token does not.
    const crossed = await fetch(new URL('/api/auth/login', base()), {
      method: 'POST',
      headers: {
        ...(await a.authHeaders()),
        'csrf-token': tb!,
        'content-type': 'application/json',
      },
      body: JSON.stringify(wrong),
    })
    expect(crossed.status).toBe(403)
    const answer = await fetch(new URL('/api/csrf-token', base()))
    expect(answer.headers.get('cache-control')).toBe('no-store')
  })

  it('are rendered afresh, with a token, for a signed-in person', async () => {
    const teacher = await signedIn('teacher@tiltwright.test')
    const html = await teacher.page('/')
    expect(html).toMatch(/<meta name="csrf-token" content="[^"]+">/)
    expect(html).toContain('Dana Ferrow')
  })

  it('answer an unknown address with the 404 page, whatever the address', async () => {
    for (const path of ['/no-such-page', '/kits/no/such/thing', '/a/b/c?x=1']) {
      const r = await fetch(new URL(path, base()))
      expect(r.status).toBe(404)
      expect(r.headers.getSetCookie()).toEqual([])
      expect(await r.text()).toContain('There is nothing here')
    }
    // A page that exists is not taken for an unknown one.
    expect((await fetch(new URL('/login', base()))).status).toBe(200)
  })

  it('read an empty session without making one', async () => {
    const r = await fetch(new URL('/api/_auth/session', base()))
    expect(r.status).toBe(200)
    expect(await r.json()).toEqual({})
    expect(r.headers.getSetCookie()).toEqual([])
  })
})
