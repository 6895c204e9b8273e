// Whether the shop's and the help desk's rows are whole after a fault (a killed database, a
// killed app): each rule below is one SQL question whose rows are the broken things, so a test
// asserts the list of problems is empty and a failure names what is broken.
import { sql } from './db'

export interface WholeScope {
  /** Orders and tickets made from this moment on are checked. */
  since: Date
  /** The products whose batches' stock is checked against their reservations. */
  productIds: number[]
}

// Reservations that still hold units of a batch (released ones gave theirs back).
const HELD = `('reserved', 'allocated', 'sent')`

/** Every way the data can be half-written, as readable lines; empty when all is whole. */
export async function dataProblems({ since, productIds }: WholeScope): Promise<string[]> {
  const ids = productIds.length ? productIds : [0]
  const rules: [string, string, unknown[]][] = [
    [
      'order without lines',
      `SELECT o.id FROM orders o WHERE o.created_at >= ?
       AND NOT EXISTS (SELECT 1 FROM order_lines l WHERE l.order_id = o.id)`,
      [since],
    ],
    [
      'order without its stock reservation',
      `SELECT o.id FROM orders o WHERE o.created_at >= ?
       AND NOT EXISTS (SELECT 1 FROM stock_reservations r WHERE r.order_id = o.id)`,
      [since],
    ],
    [
      'order whose reserved units differ from its lines',
      `SELECT o.id FROM orders o WHERE o.created_at >= ?
       AND (SELECT COALESCE(SUM(l.quantity), 0) FROM order_lines l WHERE l.order_id = o.id)
        <> (SELECT COALESCE(SUM(r.quantity), 0) FROM stock_reservations r
            WHERE r.order_id = o.id)`,
      [since],
    ],
    [
      'order without a timeline',
      `SELECT o.id FROM orders o WHERE o.created_at >= ?
       AND NOT EXISTS (SELECT 1 FROM order_events e WHERE e.order_id = o.id)`,
      [since],
    ],
    [
      'order without a number',
      `SELECT o.id FROM orders o WHERE o.created_at >= ? AND o.number IS NULL`,
      [since],
    ],
    [
      'ended order still holding stock',
      `SELECT DISTINCT o.id FROM orders o JOIN stock_reservations r ON r.order_id = o.id
       WHERE o.created_at >= ? AND o.status IN ('cancelled', 'rejected')
       AND r.status IN ('reserved', 'allocated')`,
      [since],
    ],
    [
      'live order whose stock was released',
      `SELECT DISTINCT o.id FROM orders o JOIN stock_reservations r ON r.order_id = o.id
       WHERE o.created_at >= ? AND o.status NOT IN ('cancelled', 'rejected')
       AND r.status = 'released'`,
      [since],
    ],
    [
      'unpaid card order without its payment page',
      `SELECT o.id FROM orders o WHERE o.created_at >= ? AND o.payment_method = 'card'
       AND o.status = 'awaiting payment' AND o.checkout_session_id IS NULL`,
      [since],
    ],
    [
      'paid order with more or less than one "paid" timeline entry',
      `SELECT o.id FROM orders o WHERE o.created_at >= ? AND o.paid_at IS NOT NULL
       AND (SELECT COUNT(*) FROM order_events e WHERE e.order_id = o.id
            AND e.kind = 'paid') <> 1`,
      [since],
    ],
    [
      'ticket without its first message',
      `SELECT t.id FROM tickets t WHERE t.created_at >= ?
       AND NOT EXISTS (SELECT 1 FROM ticket_messages m
                       WHERE m.ticket_id = t.id AND m.internal = 0)`,
      [since],
    ],
    [
      'reservation without an order',
      `SELECT r.id FROM stock_reservations r LEFT JOIN orders o ON o.id = r.order_id
       WHERE r.product_id IN (?) AND o.id IS NULL`,
      [ids],
    ],
    [
      'batch whose reserved count is not what live orders hold',
      `SELECT b.id FROM batches b WHERE b.product_id IN (?)
       AND b.reserved <> (SELECT COALESCE(SUM(r.quantity), 0) FROM stock_reservations r
                          WHERE r.batch_id = b.id AND r.status IN ${HELD})`,
      [ids],
    ],
    [
      'batch reserved beyond what was built',
      `SELECT b.id FROM batches b WHERE b.product_id IN (?)
       AND (b.reserved > b.quantity_built OR b.reserved < 0)`,
      [ids],
    ],
  ]
  const problems: string[] = []
  for (const [what, query, params] of rules) {
    const rows = await sql<{ id: number }>(query, params)
    if (rows.length) problems.push(`${what}: ${rows.map(r => r.id).join(', ')}`)
  }
  return problems
}

/** What the scope's live orders hold of each product (units), for "stock = initial − held". */
export async function heldUnits(productIds: number[]) {
  const rows = await sql<{ productId: number, held: string }>(
    `SELECT r.product_id AS productId, SUM(r.quantity) AS held FROM stock_reservations r
     JOIN orders o ON o.id = r.order_id
     WHERE r.product_id IN (?) AND r.status IN ${HELD}
     AND o.status NOT IN ('cancelled', 'rejected')
     GROUP BY r.product_id`,
    [productIds.length ? productIds : [0]],
  )
  return new Map(rows.map(r => [Number(r.productId), Number(r.held)]))
}
