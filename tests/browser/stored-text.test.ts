// Text a customer typed is shown, never run: a teacher's name, the school's street, a ticket's
// subject and message and support's reply carry script in every form a page, a PDF or an e-mail
// could trip over. Each place that shows them is opened (pages in Chromium, as the teacher, as
// support and as an admin; the quote PDF; the ticket mails), and the words must be there as
// words while no script of theirs ran.
import { describe, expect, it } from 'vitest'
import type { Page } from 'playwright-core'
import { launchForFile, gotoReady, signInThroughPage } from '../helpers/browser'
import type { Client } from '../helpers/client'
import { waitForMail, type Caught } from '../helpers/mail'
import { newTeacher, pdfText, poForm, productBySlug, signedIn } from '../helpers/shop'
import { SUPPORT_ADDRESS } from '../helpers/tickets'

const browser = await launchForFile()

/** Every payload sets this global (or calls alert) if it ever runs. */
const RAN = '__twRan'
const tag = Date.now().toString(36)
const STORED = {
  name: `Dana <img src=x onerror="window.${RAN}='name'"> ${tag}`,
  street: `1 Lane <script>window.${RAN}='street'</script>`,
  subject: `Ball <svg onload="window.${RAN}='subject'"> {{ 7*7 }} ${tag}`,
  message: [
    `</textarea><script>window.${RAN}='message'</script>`,
    `[the guide](javascript:window.${RAN}='markdown')`,
    `<a href="javascript:window.${RAN}='link'">click</a> \${7*7}`,
  ].join('\n'),
  reply: `<iframe srcdoc="<script>parent.${RAN}='reply'</script>"></iframe> Try a lower Kd.`,
}

interface World {
  teacher: { client: Client, email: string }
  orderId: number
  quoteId: number
  ticketId: number
}

async function storeHostileText(): Promise<World> {
  const t = await newTeacher('stored')
  const c = t.client
  expect((await c.patch('/api/account', { name: STORED.name })).status).toBe(200)
  const school = await c.patch('/api/account/school', {
    addressLine1: STORED.street,
    city: 'Ridgeford',
    region: 'CA',
    postalCode: '95999',
  })
  expect(school.status, JSON.stringify(school.body)).toBe(200)
  const lines = [{ productId: (await productBySlug('steel-balls')).id, quantity: 2 }]
  const quote = await c.post('/api/quotes', { lines })
  expect(quote.status, JSON.stringify(quote.body)).toBe(201)
  const order = await c.post('/api/checkout/purchase-order', poForm({ lines }))
  expect(order.status, JSON.stringify(order.body)).toBe(201)
  const ticket = await c.post('/api/tickets', {
    orderId: order.body.orderId,
    subject: STORED.subject,
    message: STORED.message,
  })
  expect(ticket.status, JSON.stringify(ticket.body)).toBe(201)
  const support = await signedIn(SUPPORT_ADDRESS)
  const reply = await support.post(`/api/tickets/${ticket.body.id}/messages`, {
    body: STORED.reply,
  })
  expect(reply.status, JSON.stringify(reply.body)).toBe(201)
  return {
    teacher: { client: c, email: t.email },
    orderId: order.body.orderId,
    quoteId: quote.body.id,
    ticketId: ticket.body.id,
  }
}

const world = await storeHostileText()

/** Opens `path` as `who` and returns the page's visible text; fails if a payload ran. */
async function visibleText(page: Page, path: string, ran: string[]) {
  await gotoReady(page, path)
  await page.waitForLoadState('networkidle')
  const flag = await page.evaluate(name => (window as unknown as Record<string, unknown>)[name],
    RAN)
  if (flag !== undefined) ran.push(`${path}: ${String(flag)}`)
  return page.evaluate(() => document.body.innerText)
}

async function signedInPage(email: string, password?: string) {
  const ctx = await browser.newContext()
  const page = await ctx.newPage()
  const ran: string[] = []
  page.on('dialog', (d) => {
    ran.push(`dialog: ${d.message()}`)
    void d.dismiss()
  })
  await signInThroughPage(page, email, password)
  return { page, ran }
}

describe('stored text on pages', () => {
  it('shows the teacher their own words as words', async () => {
    const { page, ran } = await signedInPage(world.teacher.email, 'a-long-password-1')
    const ticket = await visibleText(page, `/tickets/${world.ticketId}`, ran)
    expect(ticket).toContain(STORED.subject)
    expect(ticket).toContain(`</textarea><script>window.${RAN}='message'</script>`)
    expect(ticket).toContain(STORED.reply)
    // No template syntax was evaluated: the braces are still there, not 49.
    expect(ticket).not.toMatch(/Ball <svg[^\n]*> 49/)
    expect(await visibleText(page, '/account', ran)).toContain(STORED.name)
    expect(await visibleText(page, `/quotes/${world.quoteId}`, ran)).toContain(STORED.name)
    expect(await visibleText(page, `/orders/${world.orderId}`, ran)).toContain(STORED.street)
    // The payloads' own elements never reached the document.
    expect(await page.locator('img[src="x"], iframe[srcdoc], a[href^="javascript:"]').count())
      .toBe(0)
    expect(ran).toEqual([])
    await page.context().close()
  })

  it('shows support and an admin the same words without running them', async () => {
    const support = await signedInPage(SUPPORT_ADDRESS)
    // Searched for by its tag, as other tests may have filled the queue's first pages.
    const queue = await visibleText(
      support.page,
      `/help-queue?status=any&q=${encodeURIComponent(tag)}`,
      support.ran,
    )
    expect(queue).toContain(tag)
    const thread = await visibleText(support.page, `/tickets/${world.ticketId}`, support.ran)
    expect(thread).toContain(STORED.subject)
    expect(thread).toContain(STORED.name)
    expect(support.ran).toEqual([])
    await support.page.context().close()

    const admin = await signedInPage('admin@tiltwright.test')
    const order = await visibleText(admin.page, `/admin/orders/${world.orderId}`, admin.ran)
    expect(order).toContain(STORED.street)
    expect(admin.ran).toEqual([])
    await admin.page.context().close()
  })
})

/** No tag in an HTML part that a mail reader could run or follow as script: the payloads
 *  are in it only as escaped text. */
function expectInert(mail: Caught) {
  const html = mail.html ?? ''
  const tags = html.match(/<[^>]+>/g) ?? []
  expect(tags.length).toBeGreaterThan(0)
  for (const tag of tags) {
    expect(tag).not.toMatch(/^<\/?(script|svg|iframe|object|embed|img)\b/i)
    expect(tag).not.toMatch(/\son\w+\s*=|javascript:/i)
  }
  expect(html).toContain('&lt;')
}

describe('stored text in documents and mail', () => {
  it('prints the school\'s street in the quote PDF as text, with no script in the file',
    async () => {
      const res = await world.teacher.client.raw(`/api/quotes/${world.quoteId}/pdf`)
      expect(res.status).toBe(200)
      const bytes = new Uint8Array(await res.arrayBuffer())
      expect((await pdfText(bytes)).replace(/\s+/g, ' ')).toContain(STORED.street)
      const raw = Buffer.from(bytes).toString('latin1')
      expect(raw).not.toMatch(/\/(JavaScript|JS|OpenAction|Launch|AA)\b/)
    })

  it('mails the ticket\'s words escaped to support and the reply escaped to the teacher',
    async () => {
      const opened = await waitForMail(SUPPORT_ADDRESS, new RegExp(`new ticket.*${tag}`))
      expect(opened.text).toContain(`</textarea><script>window.${RAN}='message'</script>`)
      expectInert(opened)
      const replied = await waitForMail(world.teacher.email, /support replied/)
      expect(replied.subject).toContain(STORED.subject)
      expect(replied.text).toContain(STORED.reply)
      expectInert(replied)
    })
})
