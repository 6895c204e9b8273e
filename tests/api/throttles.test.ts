// Guessing, flooding and reset links: limits that hold under parallel requests and cannot be
// turned against the account's owner or their school.
import { request } from 'node:http'
import { describe, expect, inject, it } from 'vitest'
import { Client, registerAccount, uniqueEmail, type Reply } from '../helpers/client'
import { jobsSettled, sql } from '../helpers/db'
import { linkIn, mailsTo, waitForMail, type Caught } from '../helpers/mail'

const school = {
  name: 'Throttle Hill School',
  addressLine1: '8 Slow Road',
  city: 'Ease',
  region: 'OR',
  postalCode: '97002',
}

const newAccount = (tag: string, password = 'the-right-password') =>
  registerAccount(tag, password, school)

/** A browser behind the reverse proxy at 127.0.0.2 (trusted by the test server). The proxy
 *  appends the address it saw; whatever the browser itself claimed stands to the left. */
function behindProxy(clientIp: string) {
  const base = new URL(inject('baseUrl'))
  let cookies = ''
  let csrf = ''
  const send = (method: string, path: string, body?: unknown) =>
    new Promise<Reply>((resolve, reject) => {
      const payload = body === undefined ? undefined : JSON.stringify(body)
      const headers: Record<string, string> = {
        'host': base.host,
        'x-forwarded-for': `6.6.6.6, ${clientIp}`,
      }
      if (cookies) headers.cookie = cookies
      if (payload)
        Object.assign(headers, { 'content-type': 'application/json', 'csrf-token': csrf })
      const req = request(
        { host: '127.0.0.1', port: base.port, path, method, localAddress: '127.0.0.2', headers },
        (res) => {
          const chunks: Buffer[] = []
          res.on('data', c => chunks.push(c))
          res.on('end', () => {
            const set = res.headers['set-cookie'] ?? []
            if (set.length)
              cookies = [
                ...new Set([
                  ...cookies.split('; ').filter(Boolean),
                  ...set.map(c => c.split(';')[0]!),
                ]),
              ].join('; ')
            const text = Buffer.concat(chunks).toString()
            let parsed: any = text
            try {
              parsed = JSON.parse(text)
            } catch {
              /* HTML */
            }
            resolve({
              status: res.statusCode!,
              body: parsed,
              headers: new Headers(res.headers as Record<string, string>),
            })
          })
        },
      )
      req.on('error', reject)
      req.end(payload)
    })
  return {
    async login(email: string, password: string) {
      // A token as a signed-out page gets one (its snapshot carries none): on demand.
      if (!csrf) csrf = (await send('GET', '/api/csrf-token')).body.token ?? ''
      return send('POST', '/api/auth/login', { email, password })
    },
  }
}

describe('sign-in throttle', () => {
  it(
    'checks at most 5 passwords of a parallel burst of 30, and the right one at '
    + 'the end does not slip through', async () => {
      const email = await newAccount('burst')
      const guesser = new Client()
      await guesser.page('/')
      const burst = await Promise.all(
        Array.from({ length: 30 }, (_, i) =>
          guesser.post('/api/auth/login', { email, password: `wrong-guess-${i}` }),
        ),
      )
      const statuses = burst.map(r => r.status)
      expect(statuses.filter(s => s === 401).length).toBeLessThanOrEqual(5)
      expect(statuses.filter(s => s !== 401 && s !== 429)).toEqual([])
      const right = await guesser.post('/api/auth/login', { email, password: 'the-right-password' })
      expect(right.status).toBe(429)
      expect(right.body.data.code).toBe('rate-limited')
      const wait = Number(right.headers.get('retry-after'))
      expect(wait).toBeGreaterThan(0)
      expect(wait).toBeLessThanOrEqual(60)
    })

  it(
    'slows down only the account-and-address pair: the owner elsewhere, and '
    + 'others at that address, still sign in', async () => {
      const target = await newAccount('pair')
      const neighbour = await newAccount('neighbour')
      const attacker = behindProxy('198.51.100.7')
      for (let i = 0; i < 5; i++)
        expect((await attacker.login(target, `guess-${i}`)).status).toBe(401)
      expect((await attacker.login(target, 'the-right-password')).status).toBe(429)
      // Wrong guesses at unknown accounts from one address do not lock that address out either.
      for (let i = 0; i < 12; i++)
        expect((await attacker.login(uniqueEmail('nobody'), 'whatever-pass')).status).toBe(401)
      expect((await attacker.login(neighbour, 'the-right-password')).status).toBe(200)
      // The owner, from home, is not locked out.
      const fromHome = await behindProxy('203.0.113.20').login(target, 'the-right-password')
      expect(fromHome.status).toBe(200)
    })

  it('believes X-Forwarded-For only from a trusted proxy', async () => {
    const email = await newAccount('spoof')
    const direct = new Client()
    for (let i = 0; i < 5; i++) {
      const r = await direct.post(
        '/api/auth/login',
        { email, password: `guess-${i}` },
        { headers: { 'x-forwarded-for': `192.0.2.${i}` } },
      )
      expect(r.status).toBe(401)
    }
    // A made-up header does not buy a fresh address when the peer is no trusted proxy.
    const r = await direct.post(
      '/api/auth/login',
      { email, password: 'the-right-password' },
      { headers: { 'x-forwarded-for': '192.0.2.99' } },
    )
    expect(r.status).toBe(429)
  })

  it('lets the owner in through a reset, which clears the throttle', async () => {
    const email = await newAccount('unlock')
    const c = new Client()
    for (let i = 0; i < 5; i++) await c.post('/api/auth/login', { email, password: `guess-${i}` })
    expect(
      (await c.post('/api/auth/login', { email, password: 'the-right-password' })).status,
    ).toBe(429)
    await new Client().post('/api/auth/forgot-password', { email })
    const token = linkIn(
      await waitForMail(email, /Reset your Tiltwright password/),
      /reset-password\/[A-Za-z0-9_-]+/,
    )
      .split('/')
      .pop()!
    expect(
      (await new Client().post('/api/auth/reset-password', { token, password: 'a-new-password-9' }))
        .status,
    ).toBe(200)
    expect((await c.post('/api/auth/login', { email, password: 'a-new-password-9' })).status).toBe(
      200,
    )
  })
})

describe('reset links and mail limits', () => {
  it(
    'spends every older reset link when one is used; a link works once; a second '
    + 'ask within a minute sends nothing', async () => {
      const email = await newAccount('links')
      const resetMails = async () =>
        (await mailsTo(email)).filter(m => /Reset your Tiltwright password/.test(m.subject))
      const tokenOf = (m: Caught) =>
        linkIn(m, /reset-password\/[A-Za-z0-9_-]+/)
          .split('/')
          .pop()!
      await new Client().post('/api/auth/forgot-password', { email })
      const first = tokenOf(await waitForMail(email, /Reset your Tiltwright password/))
      await new Client().post('/api/auth/forgot-password', { email })
      await jobsSettled({ to: email })
      expect(await resetMails()).toHaveLength(1)

      // A minute later (the first link's clock set back), asking again sends a second link.
      await sql(
        `UPDATE auth_tokens t JOIN users u ON u.id = t.user_id
        SET t.created_at = t.created_at - INTERVAL 2 MINUTE
        WHERE u.email = ? AND t.purpose = 'reset-password'`,
        [email],
      )
      await new Client().post('/api/auth/forgot-password', { email })
      await expect.poll(async () => (await resetMails()).length, { timeout: 15_000 }).toBe(2)
      const second = tokenOf((await resetMails()).find(m => tokenOf(m) !== first)!)

      expect(
        (
          await new Client().post('/api/auth/reset-password', {
            token: second,
            password: 'chosen-password-1',
          })
        ).status,
      ).toBe(200)
      expect(
        (
          await new Client().post('/api/auth/reset-password', {
            token: second,
            password: 'chosen-password-2',
          })
        ).status,
      ).toBe(400)
      const older = await new Client().post('/api/auth/reset-password', {
        token: first,
        password: 'chosen-password-3',
      })
      expect(older.status).toBe(400)
      expect(older.body.data.code).toBe('token-invalid')
      await new Client().signIn(email, 'chosen-password-1')
    })

  it(
    'sends at most 3 confirmation mails an hour to one address, and says when it '
    + 'did not', async () => {
      const email = await newAccount('flood', 'a-long-password-1')
      const c = new Client()
      await c.signIn(email, 'a-long-password-1')
      const answers = []
      for (let i = 0; i < 3; i++)
        answers.push((await c.post('/api/auth/resend-verification')).body.sent)
      expect(answers).toEqual([true, true, false])
      await jobsSettled({ to: email })
      const confirms = (await mailsTo(email)).filter(m => /Confirm your e-mail/.test(m.subject))
      expect(confirms).toHaveLength(
        3,
      )
    })

  it(
    'sends at most 2 "you already have an account" mails an hour, however often '
    + 'the address is registered', async () => {
      const email = await newAccount('exists')
      await Promise.all(
        Array.from({ length: 5 }, () =>
          new Client().post('/api/auth/register', {
            name: 'Again',
            email,
            password: 'some-password-1',
            school,
          }),
        ),
      )
      await waitForMail(email, /already have a Tiltwright account/)
      await jobsSettled({ to: email })
      expect((await mailsTo(email)).filter(m => /already have/.test(m.subject))).toHaveLength(2)
    })
})

describe('forgot-password timing', () => {
  it(
    'takes the same time for a known and an unknown address (both wait for the '
    + 'same floor)', async () => {
      const known = await newAccount('timing')
      const time = async (email: string) => {
        const t = Date.now()
        const r = await new Client().post('/api/auth/forgot-password', { email })
        expect(r.status).toBe(202)
        return Date.now() - t
      }
      const unknownMs = await time(uniqueEmail('ghost'))
      const knownMs = await time(known)
      expect(unknownMs).toBeGreaterThanOrEqual(600)
      expect(knownMs).toBeGreaterThanOrEqual(600)
    })
})
