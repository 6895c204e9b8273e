// Join codes and builder accounts through the real server: a code that works, expires, runs
// out (under concurrency) or is revoked; usernames; signing in by username; the teacher
// resetting a builder's password and removing a builder; guessing codes is throttled.
import { request } from 'node:http'
import { describe, expect, inject, it } from 'vitest'
import {
  JOIN_CODE_ALPHABET,
  JOIN_CODE_DEFAULT_HOURS,
  JOIN_CODE_LENGTH,
  formatJoinCode,
} from '../../shared/utils/build'
import { JOIN_THROTTLE } from '../../shared/utils/sign-in-rules'
import { Client } from '../helpers/client'
import { sql } from '../helpers/db'
import {
  BUILDER_PASSWORD,
  board,
  freshUsername,
  joinAs,
  newCode,
  orderOfKits,
} from '../helpers/build'

const join = (code: string, username = freshUsername()) =>
  new Client().post('/api/join', { code, name: 'Sam T.', username, password: BUILDER_PASSWORD })

const signInByUsername = (username: string, password = BUILDER_PASSWORD) =>
  new Client().post('/api/auth/login', { username, password })

describe('join codes', () => {
  it('lets a student join with a code, as a builder without an e-mail address', async () => {
    const { teacher, orderId } = await orderOfKits('join', 2)
    const made = await newCode(teacher.client, orderId)
    expect(made.code).toMatch(new RegExp(`^[${JOIN_CODE_ALPHABET}]{${JOIN_CODE_LENGTH}}$`))
    const hours = (new Date(made.expiresAt).getTime() - Date.now()) / 3600_000
    expect(hours).toBeGreaterThan(JOIN_CODE_DEFAULT_HOURS - 0.1)
    expect(hours).toBeLessThanOrEqual(JOIN_CODE_DEFAULT_HOURS)

    // Typed in lower case with the dash, as printed.
    const check = await new Client().post('/api/join/check', {
      code: formatJoinCode(made.code).toLowerCase(),
    })
    expect(check.status).toBe(200)
    expect(check.body.space).toEqual({
      schoolName: expect.stringMatching(/^join Academy/),
      teacherName: 'Teacher join',
      orderNumber: expect.stringMatching(/^TW-/),
    })
    expect(check.body.suggestedUsername).toMatch(/^[a-z]+-[a-z]+-\d{2}$/)

    const student = new Client()
    const username = freshUsername()
    const joined = await student.post('/api/join', {
      code: made.code,
      name: 'Mira O.',
      username: username.toUpperCase(),
      password: BUILDER_PASSWORD,
    })
    expect(joined.status).toBe(201)
    expect(joined.body.user).toMatchObject({
      role: 'builder',
      email: null,
      username,
      name: 'Mira O.',
      verified: true,
    })
    const session = (await student.get('/api/_auth/session')).body
    expect(session.user).toMatchObject({ username, email: null, role: 'builder' })
    const [row] = await sql(
      'SELECT u.school_id AS schoolId, o.school_id AS orderSchool FROM users u '
      + 'JOIN build_members m ON m.user_id = u.id JOIN orders o ON o.id = m.order_id '
      + 'WHERE u.username = ?',
      [username],
    )
    expect(row.schoolId).toBe(row.orderSchool)
    const b = await board(teacher.client, orderId)
    expect(b.members.map((m: any) => m.username)).toEqual([username])
    expect(b.joinCodes[0]).toMatchObject({ code: made.code, uses: 1, live: true })
    const spaces = (await student.get('/api/build-spaces')).body
    expect(spaces.map((s: any) => s.orderId)).toEqual([orderId])

    // Signing in by username, and a wrong password answered in words that fit both.
    const back = await signInByUsername(username)
    expect(back.status).toBe(200)
    expect(back.body.user.username).toBe(username)
    const wrong = await signInByUsername(username, 'not-the-password')
    expect(wrong.status).toBe(401)
    expect(wrong.body.data.fields.password).toBe(
      'That sign-in name and password do not match an account.',
    )
  })

  it('refuses a taken username with 409 naming the field, and counts no use', async () => {
    const { teacher, orderId } = await orderOfKits('taken', 1)
    const { code } = await newCode(teacher.client, orderId, { maxUses: 2 })
    const first = await joinAs(code)
    const again = await join(code, first.username)
    expect(again.status).toBe(409)
    expect(again.body.data.fields.username).toMatch(/taken/)
    const b = await board(teacher.client, orderId)
    expect(b.joinCodes[0].uses).toBe(1)
    expect((await join(code)).status).toBe(201)
  })

  it('refuses an expired, a revoked and an unknown code with a field error on code', async () => {
    const { teacher, orderId } = await orderOfKits('dead', 1)
    const expired = await newCode(teacher.client, orderId, { expiresInHours: 1 })
    await sql('UPDATE join_codes SET expires_at = NOW(3) - INTERVAL 1 MINUTE WHERE code = ?', [
      expired.code,
    ])
    const revoked = await newCode(teacher.client, orderId)
    const listed = await board(teacher.client, orderId)
    const codeId = listed.joinCodes.find((c: any) => c.code === revoked.code).id
    const off = await teacher.client.post(`/api/orders/${orderId}/join-codes/${codeId}/revoke`)
    expect(off.status).toBe(200)
    expect(off.body).toMatchObject({ live: false, code: revoked.code })
    expect(off.body.revokedAt).not.toBeNull()
    // Another school's teacher cannot revoke it.
    const other = await orderOfKits('deadb', 1)
    expect((await other.teacher.client.post(
      `/api/orders/${orderId}/join-codes/${codeId}/revoke`,
    )).status).toBe(404)

    for (const code of [expired.code, revoked.code, 'ZZZZ2222']) {
      const check = await new Client().post('/api/join/check', { code })
      expect(check.status, code).toBe(422)
      expect(check.body.data.fields.code).toMatch(/does not work/)
      const j = await join(code)
      expect(j.status, code).toBe(422)
      expect(j.body.data.fields.code).toMatch(/does not work/)
    }
    // A live code of an order that was since cancelled takes no one either.
    const { teacher: t2, orderId: cancelled } = await orderOfKits('deadc', 1)
    const live = await newCode(t2.client, cancelled)
    expect((await new Client().post('/api/join/check', { code: live.code })).status).toBe(200)
    await sql('UPDATE orders SET status = ? WHERE id = ?', ['cancelled', cancelled])
    expect((await join(live.code)).status).toBe(422)

    const malformed = await new Client().post('/api/join/check', { code: 'O0I1' })
    expect(malformed.status).toBe(422)
    expect(malformed.body.data.fields.code).toBeTruthy()
  })

  it('admits exactly one student on a one-use code when two join at once', async () => {
    const { teacher, orderId } = await orderOfKits('race', 1)
    const { code } = await newCode(teacher.client, orderId, { maxUses: 1 })
    const replies = await Promise.all([join(code), join(code)])
    expect(replies.map(r => r.status).sort()).toEqual([201, 422])
    expect(replies.find(r => r.status === 422)!.body.data.fields.code).toBeTruthy()
    const b = await board(teacher.client, orderId)
    expect(b.members).toHaveLength(1)
    expect(b.joinCodes[0]).toMatchObject({ uses: 1, maxUses: 1, live: false })
  })

  it('refuses bad fields one by one', async () => {
    const r = await new Client().post('/api/join', {
      code: '',
      name: '',
      username: '9lives',
      password: 'short',
    })
    expect(r.status).toBe(422)
    expect(Object.keys(r.body.data.fields).sort()).toEqual(['code', 'name', 'password', 'username'])
  })
})

describe('the teacher and their builders', () => {
  it('resets a builder\'s password: the old one fails, the new one works, old sessions '
    + 'end', async () => {
    const { teacher, orderId } = await orderOfKits('reset', 1)
    const { client: builder, username, user } = await joinAs(
      (await newCode(teacher.client, orderId)).code,
    )
    const r = await teacher.client.post(`/api/orders/${orderId}/builders/${user.id}/password`)
    expect(r.status).toBe(200)
    expect(r.body.username).toBe(username)
    expect(r.body.password.length).toBeGreaterThanOrEqual(12)
    expect((await builder.get('/api/build-spaces')).status).toBe(401)
    expect((await signInByUsername(username)).status).toBe(401)
    expect((await signInByUsername(username, r.body.password)).status).toBe(200)

    const support = new Client()
    await support.signIn('support@tiltwright.test')
    expect((await support.post(`/api/orders/${orderId}/builders/${user.id}/password`)).status)
      .toBe(404)
    const other = await orderOfKits('resetb', 1)
    expect((await other.teacher.client.post(
      `/api/orders/${orderId}/builders/${user.id}/password`,
    )).status).toBe(404)
  })

  it('removes a builder: their rig is gone at once, and an account in no space is disabled',
    async () => {
      const { teacher, orderId } = await orderOfKits('remove', 1)
      const rigId = (await board(teacher.client, orderId)).rigs[0].id
      const { code } = await newCode(teacher.client, orderId)
      const kept = await joinAs(code)
      const gone = await joinAs(code)
      // `kept` also belongs to another build space, so their account stays enabled.
      const other = await orderOfKits('removeb', 1)
      await sql('INSERT INTO build_members (order_id, user_id) VALUES (?, ?)', [
        other.orderId,
        kept.user.id,
      ])
      for (const b of [kept, gone])
        expect((await b.client.get(`/api/rigs/${rigId}`)).status).toBe(200)
      for (const b of [kept, gone]) {
        const del = await teacher.client.delete(`/api/orders/${orderId}/builders/${b.user.id}`)
        expect(del.status).toBe(204)
      }
      expect((await kept.client.get(`/api/rigs/${rigId}`)).status).toBe(404)
      expect((await kept.client.get('/api/build-spaces')).status).toBe(200)
      expect((await gone.client.get(`/api/rigs/${rigId}`)).status).toBe(401)
      expect((await signInByUsername(gone.username)).status).toBe(401)
      expect((await board(teacher.client, orderId)).members).toEqual([])
      expect((await teacher.client.delete(`/api/orders/${orderId}/builders/${gone.user.id}`))
        .status).toBe(404)
    })
})

describe('guessing join codes', () => {
  /** A POST from `clientIp` behind the trusted proxy at 127.0.0.2 (as tests/api/throttles). */
  function checkFrom(clientIp: string, code: string) {
    const base = new URL(inject('baseUrl'))
    return new Promise<{ status: number, retryAfter: string | undefined }>((resolve, reject) => {
      const payload = JSON.stringify({ code })
      const req = request(
        {
          host: '127.0.0.1',
          port: base.port,
          path: '/api/join/check',
          method: 'POST',
          localAddress: '127.0.0.2',
          headers: {
            'host': base.host,
            'x-forwarded-for': clientIp,
            'content-type': 'application/json',
            'csrf-token': csrf,
            'cookie': cookie,
          },
        },
        (res) => {
          res.resume()
          res.on('end', () => resolve({
            status: res.statusCode!,
            retryAfter: res.headers['retry-after'] as string | undefined,
          }))
        },
      )
      req.on('error', reject)
      req.end(payload)
    })
  }
  let csrf = ''
  let cookie = ''

  it('slows an address down after JOIN_THROTTLE.freeAttempts wrong codes, not a class '
    + 'joining', async () => {
    const { teacher, orderId } = await orderOfKits('guess', 1)
    const { code } = await newCode(teacher.client, orderId)
    const page = new Client()
    const headers = await page.authHeaders()
    csrf = headers['csrf-token']!
    cookie = headers.cookie!
    // Right codes are given back: many more checks than the free wrong ones all pass.
    for (let i = 0; i < JOIN_THROTTLE.freeAttempts + 5; i++)
      expect((await checkFrom('10.9.8.7', code)).status).toBe(200)
    const wrong = await Promise.all(
      Array.from({ length: JOIN_THROTTLE.freeAttempts + 3 }, () =>
        checkFrom('10.9.8.7', 'ZZZZ3333')),
    )
    expect(wrong.filter(r => r.status === 422).length).toBe(JOIN_THROTTLE.freeAttempts)
    const limited = wrong.filter(r => r.status === 429)
    expect(limited.length).toBe(3)
    expect(Number(limited[0]!.retryAfter)).toBeGreaterThan(0)
    // Even the right code waits now from that address; another address is untouched.
    expect((await checkFrom('10.9.8.7', code)).status).toBe(429)
    expect((await checkFrom('10.9.8.6', code)).status).toBe(200)
  })
})
