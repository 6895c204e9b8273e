// A teacher of another school is refused on every order and quote route with 404 (the order's
// existence does not leak); builders and support are kept to what their roles allow.
import { beforeAll, describe, expect, it } from 'vitest'
import { Client } from '../helpers/client'
import { PNG_BYTES, newTeacher, poForm, productWithStock, signedIn } from '../helpers/shop'

let orderId: number
let quoteId: number
let fileId: string
let owner: Client

beforeAll(async () => {
  const admin = await signedIn('admin@tiltwright.test')
  const { productId } = await productWithStock(admin, 10)
  owner = await signedIn('teacher@tiltwright.test')
  const q = await owner.post('/api/quotes', { lines: [{ productId, quantity: 2 }] })
  quoteId = q.body.id
  const o = await owner.post(
    '/api/checkout/purchase-order',
    poForm({
      lines: [{ productId, quantity: 2 }],
      taxCertificate: { data: PNG_BYTES, name: 'cert.png' },
    }),
  )
  orderId = o.body.orderId
  await admin.post(`/api/admin/orders/${orderId}/approve`, {})
  const view = (await owner.get(`/api/orders/${orderId}`)).body
  fileId = view.documents
    .find((d: any) => d.kind === 'purchase-order')
    .url.split('/')
    .pop()
})

const readRoutes = () => [
  `/api/orders/${orderId}`,
  `/api/orders/${orderId}/documents/invoice`,
  `/api/orders/${orderId}/documents/receipt`,
  `/api/orders/${orderId}/documents/packing-list`,
  `/api/orders/${orderId}/files/${fileId}`,
  `/api/quotes/${quoteId}`,
  `/api/quotes/${quoteId}/pdf`,
]

describe('another school', () => {
  it('sees the owner\'s documents', async () => {
    expect((await owner.get(`/api/orders/${orderId}`)).status).toBe(200)
    expect((await owner.raw(`/api/orders/${orderId}/documents/invoice`)).status).toBe(200)
    expect((await owner.raw(`/api/orders/${orderId}/files/${fileId}`)).status).toBe(200)
    expect((await owner.raw(`/api/quotes/${quoteId}/pdf`)).status).toBe(200)
  })

  it('answers 404 to another school\'s teacher on every order and quote route', async () => {
    const other = (await newTeacher('other')).client
    for (const path of readRoutes())
      expect({ path, status: (await other.get(path)).status }).toEqual({ path, status: 404 })
    expect((await other.post(`/api/orders/${orderId}/cancel`)).status).toBe(404)
    expect((await other.post('/api/checkout/card', { quoteId })).status).toBe(404)
    expect((await other.post('/api/checkout/purchase-order', poForm({ quoteId }))).status).toBe(404)
    expect(
      (await other.get('/api/orders')).body.data.find((o: any) => o.id === orderId),
    ).toBeUndefined()
    expect(
      (await other.get('/api/quotes')).body.data.find((q: any) => q.id === quoteId),
    ).toBeUndefined()
    expect((await other.get('/api/orders/99999999')).status).toBe(404)
    expect((await other.get('/api/orders/not-a-number')).status).toBe(404)
  })

  it('keeps teachers, builders and support out of the admin routes', async () => {
    for (const who of ['teacher', 'builder', 'support']) {
      const c = await signedIn(`${who}@tiltwright.test`)
      expect((await c.get('/api/admin/orders')).status).toBe(403)
      for (const step of ['approve', 'allocate', 'deliver'])
        expect((await c.post(`/api/admin/orders/${orderId}/${step}`, {})).status).toBe(403)
      expect(
        (await c.post(`/api/admin/orders/${orderId}/reject`, { reason: 'because I can' })).status,
      ).toBe(403)
      expect(
        (await c.post(`/api/admin/orders/${orderId}/shipments`, { carrier: 'X', tracking: 'Y' }))
          .status,
      ).toBe(403)
      expect((await c.post('/api/admin/products', {})).status).toBe(403)
      expect((await c.post('/api/admin/batches', {})).status).toBe(403)
    }
  })

  it(
    'gives builders no order at all and support the order without its priced '
    + 'documents', async () => {
      const builder = await signedIn('builder@tiltwright.test')
      for (const path of readRoutes())
        expect({ path, status: (await builder.get(path)).status }).toEqual({ path, status: 404 })
      const support = await signedIn('support@tiltwright.test')
      const view = await support.get(`/api/orders/${orderId}`)
      expect(view.status).toBe(200)
      expect(view.body.documents).toEqual([])
      expect(view.body.payUrl).toBeNull()
      // No money at all: no totals, no line prices, no amount in the timeline.
      expect(view.body.pricesHidden).toBe(true)
      expect(view.body.lines.length).toBeGreaterThan(0)
      expect(JSON.stringify(view.body)).not.toMatch(/Cents"|\$\d/)
      const admin = await signedIn('admin@tiltwright.test')
      expect((await admin.get(`/api/orders/${orderId}`)).body.totalCents).toBeGreaterThan(0)
      expect((await support.get(`/api/orders/${orderId}/files/${fileId}`)).status).toBe(404)
      expect((await support.post(`/api/orders/${orderId}/cancel`)).status).toBe(403)
    })

  it('answers 401 to anonymous callers', async () => {
    const anon = new Client()
    for (const path of [...readRoutes(), '/api/orders', '/api/quotes', '/api/admin/orders'])
      expect({ path, status: (await anon.get(path)).status }).toEqual({ path, status: 401 })
  })
})
