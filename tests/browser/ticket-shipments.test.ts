// The demo teacher's order page after support sent replacement parts from a ticket: the
// replacement shows with its parts and its ticket, apart from the order's own shipment (the
// order is paid, not shipped, so the note about when it ships stays). Screenshots go to
// tests/.artifacts/ticket-shipments/ for a person to look at.
import { describe, expect, it } from 'vitest'
import {
  accessibilityViolations,
  artifacts,
  gotoReady,
  launchForFile,
  signInThroughPage,
} from '../helpers/browser'
import { sql } from '../helpers/db'
import { ticketRef } from '../../shared/utils/tickets'

const { shot } = artifacts('ticket-shipments')
const browser = await launchForFile()

describe('a replacement on the order page', () => {
  it('lists the parts sent free and links the ticket', async () => {
    const [row] = await sql<{ orderId: number, ticketId: number }>(
      'SELECT s.order_id AS orderId, s.ticket_id AS ticketId FROM shipments s '
      + 'JOIN orders o ON o.id = s.order_id JOIN users u ON u.id = o.placed_by_id '
      + 'WHERE u.email = ? AND s.kind = \'replacement\' ORDER BY s.id LIMIT 1',
      ['teacher@tiltwright.test'],
    )
    expect(row?.ticketId).toBeGreaterThan(0)
    const ctx = await browser.newContext({ viewport: { width: 1280, height: 800 } })
    const page = await ctx.newPage()
    await signInThroughPage(page, 'teacher@tiltwright.test')
    await gotoReady(page, `/orders/${row!.orderId}`)
    // Other test files may send parts on the same order: take this ticket's shipment.
    const line = page
      .getByTestId('replacement-shipment')
      .filter({ hasText: new RegExp(`ticket\\s+${ticketRef(row!.ticketId)}\\s*:`) })
    await expect(line.textContent()).resolves.toMatch(
      /Replacement parts for ticket\s+T-\d+\s*:\s+1 × Lever Arm and Pushrod Set, 1 × Steel Ball/,
    )
    expect(await line.getByRole('link').getAttribute('href')).toBe(`/tickets/${row!.ticketId}`)
    // The order itself has not shipped: its note says when it will.
    expect(await page.getByTestId('shipping-note').count()).toBe(1)
    expect(await accessibilityViolations(page)).toEqual([])
    await shot(page, 'teacher-order-replacement')
    await ctx.close()
  })
})
