// The shop's rough edges, tried as a new user would, on a phone (390×844) and a desktop
// (1280×800): a failed form moves the focus to its one error summary; the header counts the
// cart and the kit page counts it against the stock; an out-of-stock kit offers a quote for the
// next batch; the home page's steps fill their grid; shipments are recorded with a carrier from
// the list and link its tracking page. Screenshots go to tests/.artifacts/shop-edges/.

import { beforeAll, describe, expect, it } from 'vitest'
import type { Page } from 'playwright-core'
import {
  accessibilityViolations,
  artifacts,
  gotoReady,
  launchForFile,
  signInThroughPage,
} from '../helpers/browser'
import type { Client } from '../helpers/client'
import { newTeacher, poForm, productWithStock, signedIn } from '../helpers/shop'

const { shot } = artifacts('shop-edges')
const browser = await launchForFile()
const SIZES = [
  { name: 'phone', viewport: { width: 390, height: 844 } },
  { name: 'desktop', viewport: { width: 1280, height: 800 } },
] as const
async function pageAt(viewport: { width: number, height: number }) {
  const ctx = await browser.newContext({ viewport })
  return { ctx, page: await ctx.newPage() }
}
const focusedTestId = (page: Page) =>
  page.evaluate(() => document.activeElement?.getAttribute('data-testid') ?? null)
const noSidewaysScroll = (page: Page) =>
  page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth)

/** A kit with no batch at all: out of stock. */
async function productWithoutStock(admin: Client) {
  const slug = `test-gone-${Date.now().toString(36)}`
  const p = await admin.post('/api/admin/products', {
    slug,
    name: `Sold-out part ${slug}`,
    kind: 'part',
    summary: 'A part whose batch is sold out.',
    weightGrams: 100,
    tiers: [{ minQuantity: 1, unitPriceCents: 1500 }],
  })
  if (p.status !== 201) throw new Error(`product create failed: ${p.status}`)
  return { productId: p.body.id as number, slug }
}

describe.each(SIZES)('forms on a $name', ({ name, viewport }) => {
  it('focus the one error summary, link each field and clear an error as it is fixed', async () => {
    const { ctx, page } = await pageAt(viewport)
    await gotoReady(page, '/login')
    await page.getByRole('button', { name: 'Sign in' }).click()
    const summary = page.getByTestId('error-summary')
    await summary.getByRole('link', { name: /^E-mail or username: / }).waitFor()
    await summary.getByRole('link', { name: /^Password: / }).waitFor()
    await page.waitForFunction(() => document.activeElement?.getAttribute('role') === 'alert')
    expect(await focusedTestId(page)).toBe('error-summary')
    expect(await page.locator('[role="alert"]').count()).toBe(1)
    const email = page.getByLabel('E-mail')
    expect(await email.getAttribute('aria-describedby')).toBe('email-error')
    expect(await email.getAttribute('aria-invalid')).toBe('true')
    expect(await accessibilityViolations(page)).toEqual([])
    await shot(page, `login-summary-${name}`)

    await summary.getByRole('link', { name: /^E-mail or username: / }).click()
    expect(await page.evaluate(() => document.activeElement?.id)).toBe('email')
    await email.fill('nobody@tiltwright.test')
    await summary
      .getByRole('link', { name: /^E-mail or username: / })
      .waitFor({ state: 'detached' })
    expect(await email.getAttribute('aria-invalid')).toBe('false')
    expect(await page.locator('#email-error').count()).toBe(0)

    // The server's refusal is the summary's message, focused again.
    await page.getByLabel('Password').fill('not-the-password')
    await email.focus()
    await page.getByRole('button', { name: 'Sign in' }).click()
    await summary.getByRole('link', { name: /^Password: That sign-in name and password/ }).waitFor()
    await page.waitForFunction(() => document.activeElement?.getAttribute('role') === 'alert')
    expect(await page.locator('[role="alert"]').count()).toBe(1)
    await ctx.close()
  })

  it('lists the registration form\'s nested fields in the summary', async () => {
    const { ctx, page } = await pageAt(viewport)
    await gotoReady(page, '/register')
    await page.getByRole('button', { name: 'Open the account' }).click()
    const summary = page.getByTestId('error-summary')
    await summary.getByRole('link', { name: /^School name: / }).waitFor()
    await summary.getByRole('link', { name: /^City: / }).click()
    expect(await page.evaluate(() => document.activeElement?.id)).toBe('school-city')
    expect(await page.locator('[role="alert"]').count()).toBe(1)
    expect(await noSidewaysScroll(page)).toBe(0)
    expect(await accessibilityViolations(page)).toEqual([])
    await shot(page, `register-summary-${name}`)
    await ctx.close()
  })
})

describe('the cart in the header and on the kit page', () => {
  let teacherEmail = ''
  let kit = { productId: 0, slug: '' }
  let soldOut = { productId: 0, slug: '' }
  beforeAll(async () => {
    const admin = await signedIn('admin@tiltwright.test')
    kit = await productWithStock(admin, 5)
    soldOut = await productWithoutStock(admin)
    teacherEmail = (await newTeacher('edges')).email
  })

  it.each(SIZES)('counts the cart against the stock on a $name', async ({ name, viewport }) => {
    const { ctx, page } = await pageAt(viewport)
    await signInThroughPage(page, teacherEmail, 'a-long-password-1')
    await gotoReady(page, `/kits/${kit.slug}`)
    await page.getByLabel('How many?').fill('3')
    await page.getByRole('button', { name: 'Add to cart' }).click()
    await page.getByText('added to the cart').waitFor()
    expect(await page.getByTestId('cart-count').textContent()).toBe('3 items')
    if (name === 'phone') {
      // On a phone the count is in the menu: open it to see, close it to go on.
      await page.getByRole('button', { name: 'Menu' }).click()
      await page.getByTestId('cart-count').waitFor()
      await page.getByRole('button', { name: 'Menu' }).click()
    }

    await page.getByLabel('How many?').fill('3')
    await page.getByText('Your cart has 3 already; 2 more can be added (5 in stock).').waitFor()
    expect(await page.getByRole('button', { name: 'Add to cart' }).isDisabled()).toBe(true)
    await page.getByLabel('How many?').fill('2')
    expect(await page.getByRole('button', { name: 'Add to cart' }).isDisabled()).toBe(false)

    // The drawing's card is as tall as its drawing, not the height of the column beside it.
    const figure = (await page.locator('figure').first().boundingBox())!
    const drawing = (await page.locator('figure img').first().boundingBox())!
    expect(figure.height - drawing.height).toBeLessThan(80)
    expect(await noSidewaysScroll(page)).toBe(0)
    expect(await accessibilityViolations(page)).toEqual([])
    await shot(page, `kit-cart-counted-${name}`)
    await ctx.close()
  })

  it.each(SIZES)('offers a quote for the next batch of a sold-out kit on a $name', async ({
    name,
    viewport,
  }) => {
    const { ctx, page } = await pageAt(viewport)
    await signInThroughPage(page, teacherEmail, 'a-long-password-1')
    await gotoReady(page, `/kits/${soldOut.slug}`)
    await page.getByTestId('next-batch').waitFor()
    expect(await page.getByText(/Only 0 left/).count()).toBe(0)
    expect(await page.getByRole('button', { name: 'Add to cart' }).count()).toBe(0)
    await page.getByLabel('How many?').fill('12')
    expect(await accessibilityViolations(page)).toEqual([])
    await shot(page, `kit-sold-out-${name}`)
    await page.getByRole('button', { name: 'Quote for the next batch' }).click()
    await page.waitForURL(/\/quotes\/\d+\?new=1/)
    await page.getByText(soldOut.slug).first().waitFor()
    await ctx.close()
  })

  it('tells a visitor to sign in for a quote of a sold-out kit', async () => {
    const { ctx, page } = await pageAt(SIZES[0].viewport)
    await gotoReady(page, `/kits/${soldOut.slug}`)
    await page.getByRole('link', { name: 'Sign in' }).last().waitFor()
    expect(await page.getByRole('button', { name: 'Quote for the next batch' }).count()).toBe(0)
    await ctx.close()
  })
})

describe('the home page', () => {
  it.each(SIZES)('fills the steps\' grid on a $name', async ({ name, viewport }) => {
    const { ctx, page } = await pageAt(viewport)
    await gotoReady(page, '/')
    const list = page.locator('ol').filter({ hasText: 'Step 1' })
    const grid = (await list.boundingBox())!
    const cards = await list.locator('li').all()
    const last = (await cards.at(-1)!.boundingBox())!
    // The last card reaches the grid's right edge: no empty cell beside it.
    expect(Math.abs(last.x + last.width - (grid.x + grid.width))).toBeLessThan(2)
    if (name === 'desktop') {
      const before = (await cards.at(-2)!.boundingBox())!
      expect(before.y).toBe(last.y)
      expect(Math.abs(before.width - last.width)).toBeLessThan(2)
    }
    await shot(page, `home-steps-${name}`)
    await ctx.close()
  })
})

describe('shipments', () => {
  let orderId = 0
  let teacherEmail = ''
  beforeAll(async () => {
    const admin = await signedIn('admin@tiltwright.test')
    const { productId } = await productWithStock(admin, 10)
    const t = await newTeacher('ship-edges')
    teacherEmail = t.email
    const placed = await t.client.post(
      '/api/checkout/purchase-order',
      poForm({ lines: [{ productId, quantity: 2 }] }),
    )
    if (placed.status !== 201) throw new Error(`order failed: ${placed.status}`)
    orderId = placed.body.orderId
  })

  it('records the carrier from the list and links its tracking page on both order pages',
    async () => {
      const { ctx, page: admin } = await pageAt(SIZES[1].viewport)
      await signInThroughPage(admin, 'admin@tiltwright.test')
      await gotoReady(admin, `/admin/orders/${orderId}`)
      expect(await admin.getByRole('button', { name: 'Allocate for packing' }).count()).toBe(0)
      await admin.getByRole('button', { name: 'Approve and send the invoice' }).click()
      await admin.getByText('Approved; the invoice was issued').waitFor()
      await admin.getByRole('button', { name: 'Allocate for packing' }).click()
      await admin.getByText('Units allocated for packing.').waitFor()
      expect(await admin.getByRole('button', { name: 'Allocate for packing' }).count()).toBe(0)

      await admin.getByRole('button', { name: 'Record the shipment' }).click()
      await admin.getByTestId('error-summary').getByRole('link', { name: /^Carrier: / }).waitFor()
      const options = await admin.getByLabel('Carrier').locator('option').allTextContents()
      expect(options.map(o => o.trim())).toEqual(
        expect.arrayContaining(['USPS', 'UPS', 'FedEx', 'DHL']),
      )
      await admin.getByLabel('Carrier').selectOption({ label: 'UPS' })
      await admin.getByLabel('Tracking number').fill('1Z999AA10123456784')
      await admin.getByRole('button', { name: 'Record the shipment' }).click()
      await admin.getByText('Shipment recorded').waitFor()
      const link = admin.getByRole('link', { name: /1Z999AA10123456784/ })
      expect(await link.getAttribute('href')).toBe(
        'https://www.ups.com/track?tracknum=1Z999AA10123456784',
      )
      expect(await link.getAttribute('target')).toBe('_blank')
      expect(await link.getAttribute('rel')).toBe('noopener')
      expect(await accessibilityViolations(admin)).toEqual([])
      await shot(admin, 'admin-order-shipped-desktop')
      await ctx.close()

      for (const { name, viewport } of SIZES) {
        const { ctx: tctx, page } = await pageAt(viewport)
        await signInThroughPage(page, teacherEmail, 'a-long-password-1')
        await gotoReady(page, `/orders/${orderId}`)
        const tracking = page.getByRole('link', { name: /1Z999AA10123456784/ })
        expect(await tracking.getAttribute('href')).toContain('ups.com/track')
        expect(await tracking.getAttribute('rel')).toBe('noopener')
        expect(await page.getByRole('heading', { name: 'Documents' }).count()).toBe(1)
        expect(await page.getByRole('heading', { name: 'Timeline' }).count()).toBe(1)
        expect(await noSidewaysScroll(page)).toBe(0)
        await shot(page, `order-shipped-${name}`)
        await tctx.close()
      }
    })
})
