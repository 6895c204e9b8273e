// A teacher in the browser: from the catalog to a paid order by card on the fake's page, and
// through a purchase order that an admin approves and ships. Screenshots of each step go to
// tests/.artifacts/shop/ (desktop and phone) for a person to look at.
import { describe, expect, it } from 'vitest'
import type { BrowserContext } from 'playwright-core'
import {
  accessibilityViolations,
  artifacts,
  gotoReady,
  launchForFile,
  signInThroughPage,
} from '../helpers/browser'
import { waitForMail } from '../helpers/mail'
import { PDF_BYTES } from '../helpers/shop'

const { shot } = artifacts('shop')
const browser = await launchForFile()

const desktop = { width: 1366, height: 900 }
const phone = { width: 390, height: 844 }
async function context(viewport = desktop): Promise<BrowserContext> {
  return browser.newContext({ viewport })
}

describe('buying in the browser', () => {
  it('takes a teacher from the catalog to a paid order by card', async () => {
    const ctx = await context()
    const page = await ctx.newPage()
    await signInThroughPage(page, 'teacher@tiltwright.test')
    await page
      .getByRole('navigation', { name: 'Main' })
      .getByRole('link', { name: 'Kits', exact: true })
      .click()
    await page.getByRole('heading', { name: 'Kits and parts' }).waitFor()
    await shot(page, 'kits-desktop')
    await page.getByRole('link', { name: 'Classroom Rig Kit' }).click()
    await page.getByLabel('How many?').fill('12')
    expect(await page.locator('#quantity-hint').textContent()).toContain('$119.00 each')
    await shot(page, 'kit-desktop')
    await page.getByRole('button', { name: 'Add to cart' }).click()
    await page.getByRole('link', { name: 'Go to the cart' }).click()
    await page.getByTestId('total').waitFor()
    // 12 × $119.00 + shipping $80.40, no tax: the demo school's exemption is accepted.
    await page.waitForFunction(() =>
      document.querySelector('[data-testid=total]')?.textContent?.includes('$1,508.40'),
    )
    await page.reload()
    await page.waitForFunction(() =>
      document.querySelector('[data-testid=total]')?.textContent?.includes('$1,508.40'),
    )
    await shot(page, 'cart-desktop')
    expect(await accessibilityViolations(page)).toEqual([])

    await page.getByRole('button', { name: 'Pay by card' }).click()
    // Checkout asks where it ships, prefilled from the school, with a delivery note.
    await page.waitForURL(/\/checkout\?method=card/)
    expect(await page.getByLabel('Street address').first().inputValue()).not.toBe('')
    await page.getByLabel('Delivery note (optional)').fill('Room 114, science department')
    await shot(page, 'checkout-card-desktop')
    await page.getByRole('button', { name: 'Continue to the payment page' }).click()
    await page.waitForURL(/\/fake-pay\/checkout\//)
    await page.getByText('Local payment simulator').waitFor()
    await shot(page, 'fake-checkout')
    await page.getByRole('button', { name: 'Approve this payment' }).click()
    await page.waitForURL(/\/orders\/\d+\?paid=1/)
    await page.getByText('Payment received.').waitFor()
    expect(await page.getByTestId('order-status').textContent()).toBe('Paid')
    await shot(page, 'order-paid-desktop')
    expect(await accessibilityViolations(page)).toEqual([])
    await ctx.close()
  })

  it(
    'takes a purchase order through admin approval, shipping and payment of the '
    + 'invoice', async () => {
      const ctx = await context()
      const page = await ctx.newPage()
      await signInThroughPage(page, 'teacher@tiltwright.test')
      await gotoReady(page, '/kits/steel-balls')
      await page.getByLabel('How many?').fill('30')
      await page.getByRole('button', { name: 'Add to cart' }).click()
      await gotoReady(page, '/cart')
      await page.getByRole('link', { name: 'Pay by purchase order' }).click()
      await page.getByLabel('Purchase-order number').fill('CH-7781')
      await page.getByLabel('Accounts-payable e-mail').fill('ap@cobalt-hills.test')
      await page
        .getByLabel('Purchase-order document')
        .setInputFiles({ name: 'po-7781.pdf', mimeType: 'application/pdf', buffer: PDF_BYTES })
      await shot(page, 'checkout-po-desktop')
      await page.getByRole('button', { name: 'Place the order' }).click()
      await page.waitForURL(/\/orders\/\d+\?placed=1/)
      expect(await page.getByTestId('order-status').textContent()).toBe('PO under review')
      const orderPath = new URL(page.url()).pathname
      const number = (await page.locator('h1').textContent())!.replace('Order ', '').trim()
      await shot(page, 'order-po-review')

      const adminCtx = await context()
      const admin = await adminCtx.newPage()
      await signInThroughPage(admin, 'admin@tiltwright.test')
      await gotoReady(admin, '/admin/orders')
      await admin.getByLabel('Search order, school or PO number').fill('CH-7781')
      await admin.getByRole('link', { name: number }).click()
      await admin.getByRole('heading', { name: 'Purchase order CH-7781' }).waitFor()
      await shot(admin, 'admin-order-review')
      expect(await accessibilityViolations(admin)).toEqual([])
      await admin.getByRole('button', { name: 'Approve and send the invoice' }).click()
      await admin.getByText('Approved; the invoice was issued').waitFor()
      await admin.getByRole('button', { name: 'Allocate for packing' }).click()
      await admin.getByText('Units allocated for packing.').waitFor()
      await admin.getByLabel('Carrier').selectOption({ label: 'UPS' })
      await admin.getByLabel('Tracking number').fill('RF 5555 0101')
      await admin.getByRole('button', { name: 'Record the shipment' }).click()
      await admin.getByText('Shipment recorded').waitFor()
      expect(await admin.getByTestId('order-status').textContent()).toBe('Shipped')
      await shot(admin, 'admin-order-shipped')
      await gotoReady(admin, '/admin/orders')
      await shot(admin, 'admin-orders-desktop')
      await adminCtx.close()

      await waitForMail('ap@cobalt-hills.test', /^Invoice TWF-/)
      await gotoReady(page, orderPath)
      expect(await page.getByTestId('tracking').textContent()).toBe('RF 5555 0101')
      await page.getByRole('link', { name: 'Pay the invoice online' }).click()
      await page.waitForURL(/\/fake-pay\/invoice\//)
      await page.getByRole('button', { name: 'Approve this payment' }).click()
      await page.getByText('This invoice is paid').waitFor()
      await gotoReady(page, orderPath)
      await page.getByRole('link', { name: 'Receipt (PDF)' }).waitFor()
      await shot(page, 'order-po-paid')
      await ctx.close()
    })

  it('reads well on a phone', async () => {
    const ctx = await context(phone)
    const page = await ctx.newPage()
    await signInThroughPage(page, 'teacher@tiltwright.test')
    for (const [path, name] of [
      ['/kits', 'kits-phone'],
      ['/kits/rig-kit', 'kit-phone'],
      ['/cart', 'cart-phone'],
      ['/quotes', 'quotes-phone'],
      ['/orders', 'orders-phone'],
    ] as const) {
      await gotoReady(page, path)
      await page.locator('h1').first().waitFor()
      const overflow = await page.evaluate(
        () => document.documentElement.scrollWidth - document.documentElement.clientWidth,
      )
      expect({ path, overflow }).toEqual({ path, overflow: 0 })
      await shot(page, name)
    }
    const first = page.getByRole('link', { name: /^TW-\d+$/ }).first()
    await first.click()
    await page.getByRole('heading', { name: 'Timeline' }).waitFor()
    await shot(page, 'order-phone')
    await ctx.close()
  })
})

describe('shop pages accessibility (axe-core, WCAG 2.1 A/AA, serious and critical)', () => {
  it('finds no serious violations on the catalog, product, checkout and admin pages', async () => {
    const page = await browser.newPage()
    for (const path of ['/kits', '/kits/rig-kit']) {
      await gotoReady(page, path)
      expect({ path, violations: await accessibilityViolations(page) }).toEqual({
        path,
        violations: [],
      })
    }
    await signInThroughPage(page, 'admin@tiltwright.test')
    for (const path of ['/admin/orders', '/admin/catalog', '/admin/batches']) {
      await gotoReady(page, path)
      await page.locator('h1').first().waitFor()
      expect({ path, violations: await accessibilityViolations(page) }).toEqual({
        path,
        violations: [],
      })
      await shot(page, `${path.replace(/\//g, '-').slice(1)}`)
    }
    await page.close()
  })
})
