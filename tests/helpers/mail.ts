// Reads what the fake SMTP server caught during the test run.
import { inject } from 'vitest'

export interface Caught {
  id: number
  to: string[]
  subject: string
  text: string
  html: string | null
  attachments: { filename: string, contentType: string, size: number }[]
}

export async function waitForMail(
  to: string,
  subject: RegExp,
  timeoutMs = 15_000,
): Promise<Caught> {
  const deadline = Date.now() + timeoutMs
  for (;;) {
    const res = await fetch(`${inject('mailUrl')}/messages?to=${encodeURIComponent(to)}`)
    const { data } = (await res.json()) as { data: Caught[] }
    const hit = data.find(m => subject.test(m.subject))
    if (hit) return hit
    if (Date.now() > deadline)
      throw new Error(
        `no mail to ${to} matching ${subject} within ${timeoutMs} ms (saw: `
        + `${data.map(m => m.subject).join(' | ') || 'nothing'})`,
      )
    await new Promise(r => setTimeout(r, 200))
  }
}

/** The mail caught for `to` (everything when `to` is empty), newest first, by the test run's
 *  fake SMTP server or by another one's HTTP API at `mailUrl`. */
export async function mailsTo(to: string, mailUrl = inject('mailUrl')): Promise<Caught[]> {
  const res = await fetch(`${mailUrl}/messages?to=${encodeURIComponent(to)}`)
  return ((await res.json()) as { data: Caught[] }).data
}

export function linkIn(mail: Caught, pattern: RegExp): string {
  const m = mail.text.match(pattern)
  if (!m) throw new Error(`no link matching ${pattern} in: ${mail.text}`)
  return m[0]
}

/** Make the fake SMTP server answer 451 (temporary failure) to new mail, or accept again. */
export async function refuseMail(refuse: boolean) {
  const res = await fetch(`${inject('mailUrl')}/control?refuse=${refuse ? 1 : 0}`, {
    method: 'POST',
  })
  if (!res.ok) throw new Error(`the mail catcher did not take the control call: ${res.status}`)
}
