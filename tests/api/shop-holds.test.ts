// A card order that is never paid gives its stock back: past the 48-hour hold the sweep
// cancels it, releases its units and tells the teacher. A recent one is left alone.
import { describe, expect, it } from 'vitest'
import { newTeacher, productWithStock, signedIn, waitForOrder } from '../helpers/shop'
import { sql, sweepRunsAgain } from '../helpers/db'
import { waitForMail } from '../helpers/mail'

async function backdate(orderId: number, hours: number) {
  await sql('UPDATE orders SET created_at = NOW(3) - INTERVAL ? HOUR WHERE id = ?', [
    hours,
    orderId,
  ])
}

describe('card holds', () => {
  it(
    'cancels an unpaid card order past its hold and releases its stock, but not a '
    + 'recent one', async () => {
      const admin = await signedIn('admin@tiltwright.test')
      const { productId, batchId } = await productWithStock(admin, 5)
      const t = await newTeacher('hold')
      const card = (quantity: number) =>
        t.client.post('/api/checkout/card', { lines: [{ productId, quantity }] })
      const stale = await card(2)
      const fresh = await card(1)
      expect([stale.status, fresh.status]).toEqual([201, 201])
      const left = async () =>
        (await admin.get('/api/admin/batches')).body.data.find((b: any) => b.id === batchId).left
      expect(await left()).toBe(2)

      await backdate(stale.body.orderId, 49)
      const cancelled = await waitForOrder(
        t.client,
        stale.body.orderId,
        o => o.status === 'cancelled',
        15_000,
      )
      expect(cancelled.events.at(-1).message).toMatch(/not completed within 48 hours.*released/)
      expect(await left()).toBe(4)
      await waitForMail(t.email, new RegExp(`Order ${cancelled.number} cancelled`))

      // The sweep runs again and still leaves the fresh order alone.
      await sweepRunsAgain()
      expect((await t.client.get(`/api/orders/${fresh.body.orderId}`)).body.status).toBe(
        'awaiting payment',
      )
    })
})
