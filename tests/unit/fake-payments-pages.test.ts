// The local payment simulator's invoice page once the invoice cannot be paid: void says so,
// paid says so, and neither offers a button; an open one offers Approve and Decline.
import { describe, expect, it } from 'vitest'
import {
  closedInvoicePage,
  decisionForm,
  DECISIONS,
  type InvoiceLike,
} from '../../server/fake-payments/html'

const invoice = (status: string): InvoiceLike => ({
  id: 'in_test_1',
  number: 'TWF-00001',
  description: 'Tiltwright order TW-10001',
  due_date: 1_800_000_000,
  status,
  amount_due: 12_345,
  lines: { data: [{ description: 'Classroom Rig Kit (price for 5–11) × 6', amount: 12_345 }] },
})

describe('the simulator\'s invoice page', () => {
  it('renders a void invoice as void, with no way to pay it', () => {
    const page = closedInvoicePage(invoice('void'), 'http://localhost/orders', 'GET')!
    expect(page.status).toBe(200)
    expect(page.html).toContain('This invoice is void')
    expect(page.html).not.toContain('<form')
    expect(page.html).not.toContain(DECISIONS.approve)
    expect(closedInvoicePage(invoice('void'), 'http://localhost/orders', 'POST')!.status).toBe(409)
  })

  it('renders a paid invoice as paid, with no way to pay it again', () => {
    const page = closedInvoicePage(invoice('paid'), 'http://localhost/orders', 'GET')!
    expect(page.html).toContain('This invoice is paid')
    expect(page.html).not.toContain('<form')
  })

  it(
    'leaves an open invoice to the payment form, which offers approve and decline, and '
    + 'says what it is', () => {
      expect(closedInvoicePage(invoice('open'), 'http://localhost/orders', 'GET')).toBeNull()
      const form = decisionForm('/fake-pay/invoice/in_test_1', 12_345)
      expect(form).toContain(`name="decision" value="approve">${DECISIONS.approve}`)
      expect(form).toContain(`name="decision" value="decline">${DECISIONS.decline}`)
      expect(form).toContain('$123.45')
    })
})
