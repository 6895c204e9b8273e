// The shop pages' QA fixes in the browser: the admin catalog form recovers as it is corrected,
// the cart says what is wrong with a quantity instead of changing it, pages a role cannot use
// are not found, and the tables fit a phone. Screenshots go to tests/.artifacts/shop/.

import { resolve } from 'node:path'
import { describe, expect, it } from 'vitest'
import type { Page } from 'playwright-core'
import { artifacts, gotoReady, launchForFile, signInThroughPage } from '../helpers/browser'

const { dir: shots } = artifacts('shop')
const browser = await launchForFile()
const phone = { width: 390, height: 844 }

/** Opens a page on a phone as `email`: the page must not scroll sideways, and `last` (its
 *  right-most control or heading) must be on screen. */
async function fitsPhone(
  email: string,
  path: string,
  last: (page: Page) => ReturnType<Page['getByRole']>,
  shotName: string,
) {
  const ctx = await browser.newContext({ viewport: phone })
  const page = await ctx.newPage()
  await signInThroughPage(page, email)
  await gotoReady(page, path)
  await page.locator('h1').waitFor()
  expect(
    await page.evaluate(
      () => document.documentElement.scrollWidth - document.documentElement.clientWidth,
    ),
  ).toBe(0)
  const box = (await last(page).boundingBox())!
  expect(box.x + box.width).toBeLessThanOrEqual(phone.width)
  await page.screenshot({ path: resolve(shots, `${shotName}.png`), fullPage: true })
  await ctx.close()
}

describe('the admin catalog form', () => {
  it('gives every field its message and recovers as the admin corrects them', async () => {
    const page = await browser.newPage()
    await signInThroughPage(page, 'admin@tiltwright.test')
    await gotoReady(page, '/admin/catalog')
    await page.getByRole('button', { name: 'Add a product' }).click()
    await page.getByRole('button', { name: 'Save' }).click()
    const form = page.locator('form')
    for (const text of [
      'Enter the name.',
      'Enter a slug.',
      'Enter a one-line summary.',
      'Enter a price like 24.50.',
    ])
      await form.getByText(text).waitFor()
    await page.getByLabel('Each ($)').fill('24.50')
    await expect.poll(() => form.getByText('Enter a price like 24.50.').count()).toBe(0)
    await page.getByLabel('Name').fill('QA Spare Bracket')
    await page.getByLabel('Slug (in the address)').fill('qa-spare-bracket')
    await page.getByLabel('One-line summary').fill('A bracket for the QA walkthrough.')
    await page.getByLabel('On sale').uncheck()
    // A price that rises with quantity is refused beside the tier.
    await page.getByRole('button', { name: 'Add a tier' }).click()
    await page.getByLabel('Each ($)').nth(1).fill('30')
    await page.getByRole('button', { name: 'Save' }).click()
    await form.getByText(/must not be above \$24\.50/).waitFor()
    await page.getByLabel('Each ($)').nth(1).fill('22')
    // Save shows the tier table in the shop's words before anything is sent.
    await page.getByRole('button', { name: 'Save' }).click()
    const table = page.getByRole('table', { name: 'New classroom tiers' })
    await table.getByText('1–5').waitFor()
    await table.getByText('6+').waitFor()
    await table.getByText('$22.00').waitFor()
    const sent = page.waitForRequest(
      r => r.url().endsWith('/api/admin/products') && r.method() === 'POST',
    )
    await page.getByRole('button', { name: 'Publish these prices' }).click()
    await sent
    await page.getByText('QA Spare Bracket saved.').waitFor()
    await page.close()
  })

  it('fits a phone without sideways scrolling', async () => {
    await fitsPhone(
      'admin@tiltwright.test',
      '/admin/catalog',
      page => page.getByRole('button', { name: 'Edit Classroom Rig Kit' }),
      'admin-catalog-phone',
    )
  })
})

describe('the cart', () => {
  it(
    'keeps what the teacher typed, says what is wrong and blocks ordering until '
    + 'it is fixed', async () => {
      const page = await browser.newPage()
      await signInThroughPage(page, 'teacher@tiltwright.test')
      await gotoReady(page, '/kits/steel-balls')
      await page.getByLabel('How many?').fill('2')
      await page.getByRole('button', { name: 'Add to cart' }).click()
      await gotoReady(page, '/cart')
      await page.getByTestId('total').waitFor()
      const qty = page.getByLabel(/^Quantity of /)
      const pay = page.getByRole('button', { name: 'Pay by card' })
      for (const typed of ['0', '-2', '99999']) {
        await qty.fill(typed)
        await qty.blur()
        await page.getByText(/The quantity must be a whole number from 1 to 500\./).waitFor()
        expect(await qty.inputValue()).toBe(typed)
        expect(await pay.isDisabled()).toBe(true)
        expect(
          await page.getByRole('button', { name: 'Save as a formal quote (PDF)' }).isDisabled(),
        ).toBe(true)
      }
      await qty.fill('500')
      await qty.blur()
      await page.getByText(/^Only \d+ left in stock: lower the quantity/).waitFor()
      expect(await pay.isDisabled()).toBe(true)
      await page.screenshot({ path: resolve(shots, 'cart-over-stock.png'), fullPage: true })
      await qty.fill('3')
      await qty.blur()
      await expect.poll(() => pay.isDisabled()).toBe(false)

      // Checkout shows the lines and where they ship before the teacher commits.
      await page.getByRole('link', { name: 'Pay by purchase order' }).click()
      const lines = page.getByRole('table', { name: 'What you are ordering' })
      await lines.getByText('Steel Ball Set').waitFor()
      // One tier wording everywhere: the kit page's range, not "tier 1+".
      await lines.getByText('price for 1–9').waitFor()
      expect(await lines.getByRole('cell', { name: '3', exact: true }).count()).toBe(1)
      expect((await page.getByTestId('ship-to').textContent())!.trim().length).toBeGreaterThan(10)
      await page.screenshot({ path: resolve(shots, 'checkout-lines-desktop.png'), fullPage: true })
      await gotoReady(page, '/cart')
      await page.getByRole('button', { name: /^Remove / }).click()
      await page.close()
    })
})

describe('the admin orders table', () => {
  it('keeps its filter, sort and page in the address across a reload', async () => {
    const page = await browser.newPage()
    await signInThroughPage(page, 'admin@tiltwright.test')
    await gotoReady(page, '/admin/orders')
    await page.getByLabel('Status').selectOption('cancelled')
    await page.getByLabel('Search order, school or PO number').fill('TW')
    await page.waitForURL(
      u => u.searchParams.get('status') === 'cancelled' && u.searchParams.get('q') === 'TW',
    )
    await page.reload()
    expect(await page.getByLabel('Status').inputValue()).toBe('cancelled')
    expect(await page.getByLabel('Search order, school or PO number').inputValue()).toBe('TW')
    await gotoReady(page, '/admin/orders?status=bogus&page=0')
    expect(await page.getByLabel('Status').inputValue()).toBe('')
    await page.close()
  })

  it(
    'shows each order\'s number, status and total on a phone without scrolling '
    + 'the table', async () => {
      const page = await browser.newPage({ viewport: { width: 390, height: 844 } })
      await signInThroughPage(page, 'admin@tiltwright.test')
      await gotoReady(page, '/admin/orders')
      for (const name of ['Order', 'Status', 'Total']) {
        const box = await page.getByRole('columnheader', { name }).boundingBox()
        expect(box && box.x + box.width, name).toBeLessThanOrEqual(390)
      }
      await page.close()
    })
})

describe('pages for the role', () => {
  it(
    'shows teachers\' shop pages only to teachers, and sends staff to their desk '
    + 'after sign-in', async () => {
      for (const who of ['support', 'builder'] as const) {
        const page = await browser.newPage()
        await signInThroughPage(page, `${who}@tiltwright.test`)
        if (who === 'support') expect(new URL(page.url()).pathname).toBe('/help-queue')
        for (const path of ['/orders', '/quotes', '/cart', '/checkout']) {
          const reply = await gotoReady(page, path)
          expect({ who, path, status: reply?.status() }).toEqual({ who, path, status: 404 })
        }
        await gotoReady(page, '/kits/rig-kit')
        await page.locator('h1').waitFor()
        expect(await page.getByRole('button', { name: 'Add to cart' }).count()).toBe(0)
        await page.close()
      }
      const page = await browser.newPage()
      await signInThroughPage(page, 'teacher@tiltwright.test')
      expect(new URL(page.url()).pathname).toBe('/')
      // A fresh browser holds no cart: the checkout says so beside its disabled button.
      await gotoReady(page, '/checkout')
      expect(await page.getByTestId('checkout-empty').textContent()).toContain('empty')
      expect(await page.getByRole('button', { name: 'Place the order' })
        .isDisabled()).toBe(true)
      await page.close()
    })

  it('fits the teacher\'s orders on a phone', async () => {
    await fitsPhone(
      'teacher@tiltwright.test',
      '/orders',
      page => page.getByRole('columnheader', { name: 'Status' }),
      'orders-phone-fit',
    )
  })
})
