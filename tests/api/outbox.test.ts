// Mail jobs keep mail through an SMTP outage: while the fake SMTP server refuses mail
// (451, temporary failure) the message waits as a pending `mail` job with its error; once
// the server accepts again, the retry delivers it. Nothing is lost, nothing is sent twice.
import { afterEach, describe, expect, it } from 'vitest'
import { Client, uniqueEmail } from '../helpers/client'
import { jobsSettled, sql } from '../helpers/db'
import { mailsTo, refuseMail, waitForMail } from '../helpers/mail'

function outboxRowsTo(email: string) {
  return sql<{ status: string, attempts: number, lastError: string | null }>(
    `SELECT state AS status, attempts, last_error AS lastError FROM jobs
    WHERE kind = 'mail' AND JSON_VALUE(payload, '$.to') = ? ORDER BY id`,
    [email],
  )
}

afterEach(() => refuseMail(false))

describe('mail jobs', () => {
  it(
    'holds a mail while SMTP refuses it and delivers it exactly once when SMTP is '
    + 'back', async () => {
      await refuseMail(true)
      const email = uniqueEmail('outage')
      const r = await new Client().post('/api/auth/forgot-password', {
        email: 'teacher@tiltwright.test',
      })
      expect(r.status).toBe(202)
      const reg = await new Client().post('/api/auth/register', {
        name: 'Outage Olu',
        email,
        password: 'a-long-password-1',
        school: {
          name: 'Storm Hill School',
          addressLine1: '3 Gale Way',
          city: 'Windy',
          region: 'WA',
          postalCode: '98000',
        },
      })
      expect(reg.status).toBe(201)

      await expect
        .poll(async () => (await outboxRowsTo(email))[0]?.attempts ?? 0, { timeout: 15_000 })
        .toBeGreaterThanOrEqual(1)
      const waiting = (await outboxRowsTo(email))[0]!
      expect(waiting.status).toBe('pending')
      expect(waiting.lastError).toMatch(/451|temporarily/i)
      expect(await mailsTo(email)).toEqual([])

      await refuseMail(false)
      const mail = await waitForMail(email, /Confirm your e-mail/, 20_000)
      expect(mail.text).toContain('/verify-email?token=')
      await expect
        .poll(async () => (await outboxRowsTo(email))[0]?.status, { timeout: 10_000 })
        .toBe('done')
      await jobsSettled({ to: email })
      expect((await mailsTo(email)).length).toBe(1)
    })
})
