// Shop test helpers: fresh teachers of fresh (taxed, in California: 7.25 % in
// shared/data/us-sales-tax.ts) schools, a product with known stock, the payment SDK pointed at the
// app's fake, and paying on the fake's hosted page.
import Stripe from 'stripe'
import { expect, inject } from 'vitest'
import { Client, uniqueEmail } from './client'
import { sql } from './db'
import { linkIn, waitForMail } from './mail'

// The simulator's key and webhook secret: this test run's own (tests/setup/global.ts makes them
// as `npm start` makes an install's).
export const paymentsKey = () => inject('paymentsKey')
export const webhookSecret = () => inject('webhookSecret')
// The secrets an earlier version printed in its source: nothing may accept them now.
export const PUBLISHED_KEY = 'sk_test_tiltwright_local_fake'
export const PUBLISHED_WEBHOOK_SECRET = 'whsec_tiltwright_local_fake_signing_secret'
// The answers the local payment simulator's page offers (DECISIONS in
// server/fake-payments/pages.ts).
export const APPROVE = 'approve'
export const DECLINE = 'decline'

export async function signedIn(email: string) {
  const c = new Client()
  await c.signIn(email)
  return c
}

/** A teacher of a new school (in California unless the region says otherwise), with the
 *  e-mail address confirmed through the mailed link (ordering needs it) unless `verified: false`.
 * */
export async function newTeacher(
  tag = 'shop',
  opts: { verified?: boolean, region?: string, postalCode?: string } = {},
) {
  const { verified: _v, ...school } = opts
  const c = new Client()
  const email = uniqueEmail(tag)
  const r = await c.post('/api/auth/register', {
    name: `Teacher ${tag}`,
    email,
    password: 'a-long-password-1',
    school: {
      name: `${tag} Academy ${Math.random().toString(36).slice(2, 6)}`,
      addressLine1: '1 Test Lane',
      city: 'Ridgeford',
      region: 'CA',
      postalCode: '95999',
      ...school,
    },
  })
  if (r.status !== 201) throw new Error(`register failed: ${r.status} ${JSON.stringify(r.body)}`)
  if (opts.verified !== false) {
    const mail = await waitForMail(email, /Confirm your e-mail/)
    const token = linkIn(mail, /verify-email\?token=[\w-]+/).split('=')[1]
    const v = await c.post('/api/auth/verify-email', { token })
    if (v.status !== 200) throw new Error(`verify failed: ${v.status} ${JSON.stringify(v.body)}`)
  }
  // Registering answers alike for new and known addresses and signs nobody in.
  const user = await c.signIn(email, 'a-long-password-1')
  return { client: c, email, user }
}

let seq = 0
/** A product of its own with one batch, so a test knows exactly how much stock there is (a
 *  part unless `kind` says kit: each kit unit of a paid order becomes a rig). */
export async function productWithStock(
  admin: Client,
  quantity: number,
  tiers = [
    { minQuantity: 1, unitPriceCents: 2500 },
    { minQuantity: 10, unitPriceCents: 2000 },
  ],
  kind: 'kit' | 'part' = 'part',
) {
  const slug = `test-part-${Date.now().toString(36)}-${++seq}`
  const p = await admin.post('/api/admin/products', {
    slug,
    name: `Test ${kind} ${slug}`,
    kind,
    summary: 'A part made for one test.',
    weightGrams: 100,
    tiers,
  })
  if (p.status !== 201)
    throw new Error(`product create failed: ${p.status} ${JSON.stringify(p.body)}`)
  const b = await admin.post('/api/admin/batches', {
    productId: p.body.id,
    code: `T-${slug.slice(-10)}`,
    quantity,
  })
  if (b.status !== 201)
    throw new Error(`batch create failed: ${b.status} ${JSON.stringify(b.body)}`)
  return { productId: p.body.id as number, batchId: b.body.id as number, slug }
}

/** A card order of `quantity` units of a new product (10 in stock) by a new teacher. */
export async function cardOrder(tag: string, quantity = 2) {
  const admin = await signedIn('admin@tiltwright.test')
  const { productId, batchId } = await productWithStock(admin, 10)
  const t = await newTeacher(tag)
  const r = await t.client.post('/api/checkout/card', { lines: [{ productId, quantity }] })
  expect(r.status).toBe(201)
  return {
    admin,
    t,
    productId,
    batchId,
    orderId: r.body.orderId as number,
    url: r.body.url as string,
  }
}

/** A purchase order of `quantity` units of a new product (10 in stock) by a new teacher,
 *  approved by an admin: its invoice is issued at the payment simulator. */
export async function approvedPurchaseOrder(tag: string, quantity: number, apEmail?: string) {
  const admin = await signedIn('admin@tiltwright.test')
  const { productId, batchId } = await productWithStock(admin, 10)
  const t = await newTeacher(tag)
  const placed = await t.client.post(
    '/api/checkout/purchase-order',
    poForm({ lines: [{ productId, quantity }], apEmail }),
  )
  expect(placed.status).toBe(201)
  const orderId = placed.body.orderId as number
  const approved = await admin.post(`/api/admin/orders/${orderId}/approve`, {})
  expect(approved.status).toBe(200)
  const [row] = await sql<{ invoiceId: string }>(
    'SELECT invoice_id AS invoiceId FROM orders WHERE id = ?',
    [orderId],
  )
  const invoiceId = row!.invoiceId
  const payUrl = approved.body.payUrl as string
  return { admin, t, productId, batchId, orderId, invoiceId, payUrl }
}

/** POSTs a payment event to the app's webhook as the provider would, with the signature
 *  given (a forged one), or signed with this run's webhook secret as the fake's events.ts
 *  signs. Answers the status and the JSON reply. */
export async function postWebhook(event: object | string, signature?: string) {
  const payload = typeof event === 'string' ? event : JSON.stringify(event)
  const res = await fetch(new URL('/api/webhooks/payments', inject('baseUrl')), {
    method: 'POST',
    body: payload,
    headers: {
      'content-type': 'application/json',
      'stripe-signature': signature ?? new Stripe('sk_test_unused', { telemetry: false })
        .webhooks.generateTestHeaderString({ payload, secret: webhookSecret() }),
    },
  })
  return { status: res.status, body: await res.json().catch(() => null) }
}

export async function productBySlug(slug: string) {
  const r = await new Client().get('/api/products')
  const p = r.body.data.find((x: any) => x.slug === slug)
  if (!p) throw new Error(`no product ${slug}`)
  return p
}

export function fakeStripe() {
  const base = new URL(inject('baseUrl'))
  return new Stripe(paymentsKey(), {
    host: base.hostname,
    port: Number(base.port),
    protocol: 'http',
    telemetry: false,
  })
}

/** Presses "Approve this payment" or "Decline this payment" on the fake's hosted page, like a
 *  buyer's browser would. */
export async function payOnPage(url: string, decision: typeof APPROVE | typeof DECLINE) {
  const page = await fetch(url)
  const html = await page.text()
  const action = html.match(/<form method="post" action="([^"]+)"/)?.[1]
  if (!action || !html.includes(`name="decision" value="${decision}"`))
    throw new Error(`no ${decision} button on ${url}: ${html.slice(0, 300)}`)
  const res = await fetch(new URL(action, url), {
    method: 'POST',
    body: new URLSearchParams({ decision }),
    redirect: 'manual',
    headers: { 'content-type': 'application/x-www-form-urlencoded' },
  })
  return {
    status: res.status,
    location: res.headers.get('location'),
    html: await res.text(),
    pageHtml: html,
  }
}

/** Sets the simulator's fault switch (server/fake-payments/simulator.ts). */
export async function simulator(settings: {
  api?: 'normal' | 'fail' | 'slow'
  webhooks?: 'deliver' | 'fail'
  slowMs?: number
}) {
  const body = new URLSearchParams(Object.entries(settings).map(([k, v]) => [k, String(v)]))
  const res = await fetch(new URL('/v1/simulator/settings', inject('baseUrl')), {
    method: 'POST',
    body,
    headers: {
      'authorization': `Bearer ${paymentsKey()}`,
      'content-type': 'application/x-www-form-urlencoded',
    },
  })
  if (!res.ok) throw new Error(`simulator settings: ${res.status} ${await res.text()}`)
  return res.json()
}

export async function waitForOrder(
  c: Client,
  id: number,
  done: (o: any) => boolean,
  timeoutMs = 10_000,
) {
  const deadline = Date.now() + timeoutMs
  for (;;) {
    const r = await c.get(`/api/orders/${id}`)
    if (r.status === 200 && done(r.body)) return r.body
    if (Date.now() > deadline)
      throw new Error(
        `order ${id} did not reach the expected state: ${JSON.stringify(r.body).slice(0, 500)}`,
      )
    await new Promise(ok => setTimeout(ok, 150))
  }
}

export async function attachmentBytes(mailId: number, n = 0) {
  const res = await fetch(`${inject('mailUrl')}/messages/${mailId}/attachments/${n}`)
  if (!res.ok) throw new Error(`attachment ${n} of mail ${mailId}: ${res.status}`)
  return new Uint8Array(await res.arrayBuffer())
}

export async function pdfText(bytes: Uint8Array) {
  const { extractText, getDocumentProxy } = await import('unpdf')
  const pdf = await getDocumentProxy(bytes)
  const { text } = await extractText(pdf, { mergePages: true })
  return text
}

// Smallest real files whose first bytes file-type recognises (PDF header, PNG signature + IHDR).
export const PDF_BYTES = Buffer.from(
  '%PDF-1.4\n1 0 obj<</Type/Catalog/Pages 2 0 R>>endobj\n2 0 obj<</Type/Pages/Kids[]/Count '
  + '0>>endobj\ntrailer<</Root 1 0 R>>\n%%EOF\n',
)
export const PNG_BYTES = Buffer.from(
  '89504e470d0a1a0a0000000d49484452000000010000000108060000001f15c489'
  + '0000000d4944415478da63f8ffff3f0005fe02fea7d6a4f20000000049454e44ae426082',
  'hex',
)

export function poForm(fields: {
  lines?: unknown
  quoteId?: number
  poNumber?: string
  apEmail?: string
  poFile?: { data: Buffer, name: string, type?: string } | null
  taxCertificate?: { data: Buffer, name: string, type?: string }
}) {
  const f = new FormData()
  if (fields.lines !== undefined) f.set('lines', JSON.stringify(fields.lines))
  if (fields.quoteId !== undefined) f.set('quoteId', String(fields.quoteId))
  f.set('poNumber', fields.poNumber ?? `PO-${Math.floor(Math.random() * 1e6)}`)
  f.set('apEmail', fields.apEmail ?? 'payables@district.test')
  const po
    = fields.poFile === undefined
      ? { data: PDF_BYTES, name: 'po.pdf', type: 'application/pdf' }
      : fields.poFile
  if (po)
    f.set(
      'poFile',
      new Blob([new Uint8Array(po.data)], { type: po.type ?? 'application/pdf' }),
      po.name,
    )
  if (fields.taxCertificate)
    f.set(
      'taxCertificate',
      new Blob([new Uint8Array(fields.taxCertificate.data)], {
        type: fields.taxCertificate.type ?? 'image/png',
      }),
      fields.taxCertificate.name,
    )
  return f
}
