// Build-space test helpers: an order of kits whose purchase order an admin approves (which
// opens its build space), join codes, and students joining as builders.
import { expect } from 'vitest'
import { Client } from './client'
import { newTeacher, poForm, productWithStock, signedIn } from './shop'

export const BUILDER_PASSWORD = 'a-long-builder-password'

/** A username nobody has yet (lower case, starting with a letter). */
export const freshUsername = (tag = 'b') =>
  `${tag}-${Date.now().toString(36)}-${Math.random().toString(36).slice(2, 6)}`

/**
 * A teacher of a new school with an order of `kits` kit units (and one part), placed with a
 * purchase order; approved by an admin unless `approve: false`.
 */
export async function orderOfKits(tag: string, kits: number, opts: { approve?: boolean } = {}) {
  const admin = await signedIn('admin@tiltwright.test')
  const kit = await productWithStock(admin, kits + 5, undefined, 'kit')
  const part = await productWithStock(admin, 5)
  const teacher = await newTeacher(tag)
  const placed = await teacher.client.post(
    '/api/checkout/purchase-order',
    poForm({
      lines: [
        { productId: kit.productId, quantity: kits },
        { productId: part.productId, quantity: 1 },
      ],
    }),
  )
  expect(placed.status).toBe(201)
  const orderId = placed.body.orderId as number
  if (opts.approve !== false)
    expect((await admin.post(`/api/admin/orders/${orderId}/approve`, {})).status).toBe(200)
  return { admin, teacher, orderId, kit }
}

/** The order's board as its teacher reads it, with a query string. */
export async function board(teacher: Client, orderId: number, query = '') {
  const r = await teacher.get(`/api/orders/${orderId}/board${query}`)
  expect(r.status, JSON.stringify(r.body)).toBe(200)
  return r.body
}

export async function newCode(
  teacher: Client,
  orderId: number,
  body: { expiresInHours?: number, maxUses?: number | null } = {},
) {
  const r = await teacher.post(`/api/orders/${orderId}/join-codes`, body)
  expect(r.status, JSON.stringify(r.body)).toBe(201)
  return r.body as { code: string, expiresAt: string }
}

/** A student joins with `code`; the client stays signed in as the new builder. */
export async function joinAs(code: string, name = 'Ada R.') {
  const client = new Client()
  const username = freshUsername()
  const r = await client.post('/api/join', { code, name, username, password: BUILDER_PASSWORD })
  expect(r.status, JSON.stringify(r.body)).toBe(201)
  return { client, username, user: r.body.user }
}
