// No batch is ever oversold: many buyers checking out at once for the last units.
import { describe, expect, it } from 'vitest'
import { newTeacher, poForm, productWithStock, signedIn } from '../helpers/shop'

describe('stock under concurrent checkouts', () => {
  it(
    'sells the last 3 units to exactly 3 of 16 simultaneous buyers and refuses '
    + 'the rest with 409', async () => {
      const admin = await signedIn('admin@tiltwright.test')
      const { productId, batchId } = await productWithStock(admin, 3)
      const buyers = await Promise.all(Array.from({ length: 4 }, (_, i) => newTeacher(`race${i}`)))
      for (const b of buyers) await b.client.page('/')
      const attempts = buyers.flatMap((b, i) =>
        Array.from({ length: 4 }, (_, j) =>
          (i + j) % 2
            ? b.client.post('/api/checkout/card', { lines: [{ productId, quantity: 1 }] })
            : b.client.post(
                '/api/checkout/purchase-order',
                poForm({ lines: [{ productId, quantity: 1 }] }),
              ),
        ),
      )
      const results = await Promise.all(attempts)
      const statuses = results.map(r => r.status).sort()
      expect(statuses.filter(s => s === 201)).toHaveLength(3)
      expect(statuses.filter(s => s === 409)).toHaveLength(13)
      for (const r of results.filter(x => x.status === 409)) {
        expect(r.body.data.code).toBe('out-of-stock')
        expect(r.body.data.fields['lines.0.quantity']).toMatch(/out of stock|Only \d+/)
      }
      const batch = (await admin.get('/api/admin/batches')).body.data.find(
        (b: any) => b.id === batchId,
      )
      expect(batch).toMatchObject({ quantityBuilt: 3, reserved: 3, left: 0 })
    })

  it('takes a large order across two batches, oldest first, and never below zero', async () => {
    const admin = await signedIn('admin@tiltwright.test')
    const { productId, batchId } = await productWithStock(admin, 4)
    const second = await admin.post('/api/admin/batches', {
      productId,
      code: `T2-${Date.now().toString(36)}`,
      quantity: 5,
    })
    const t = await newTeacher('split')
    const [a, b] = await Promise.all([
      t.client.post('/api/checkout/card', { lines: [{ productId, quantity: 7 }] }),
      t.client.post('/api/checkout/card', { lines: [{ productId, quantity: 7 }] }),
    ])
    expect([a.status, b.status].sort()).toEqual([201, 409])
    const won = a.status === 201 ? a : b
    const order = (await t.client.get(`/api/orders/${won.body.orderId}`)).body
    expect(order.reservations.map((r: any) => r.quantity)).toEqual([4, 3])
    const rows = (await admin.get('/api/admin/batches')).body.data
    expect(rows.find((x: any) => x.id === batchId).left).toBe(0)
    expect(rows.find((x: any) => x.id === second.body.id).left).toBe(2)
    const recount = await admin.patch(`/api/admin/batches/${second.body.id}`, { quantity: 2 })
    expect(recount.status).toBe(409)
    expect(recount.body.data.fields.quantity).toMatch(/At least 3/)
  })
})
