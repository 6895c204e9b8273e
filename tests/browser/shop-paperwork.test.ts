// The paperwork in the browser: a refused purchase order leads back to a corrected one with the
// same lines; leaving the payment page comes back to the order, whose "Pay now" works and whose
// cart is kept until it is paid; the teacher corrects the school's address. Screenshots go to
// tests/.artifacts/shop/.

import { resolve } from 'node:path'
import { describe, expect, it } from 'vitest'
import { artifacts, gotoReady, launchForFile, signInThroughPage } from '../helpers/browser'
import { newTeacher, poForm, productWithStock, signedIn } from '../helpers/shop'

const { dir: shots } = artifacts('shop')
const browser = await launchForFile()
const PASSWORD = 'a-long-password-1' // newTeacher's

describe('paperwork in the browser', () => {
  it('leads from a refused purchase order to a corrected one for the same lines', async () => {
    const admin = await signedIn('admin@tiltwright.test')
    const { productId, slug } = await productWithStock(admin, 30)
    const t = await newTeacher('wayback')
    const po = await t.client.post(
      '/api/checkout/purchase-order',
      poForm({ lines: [{ productId, quantity: 4 }], poNumber: 'UNSIGNED-9' }),
    )
    await admin.post(`/api/admin/orders/${po.body.orderId}/reject`, {
      reason: 'The PO is not signed.',
    })

    const page = await browser.newPage()
    await signInThroughPage(page, t.email, PASSWORD)
    await gotoReady(page, `/orders/${po.body.orderId}`)
    await page.getByTestId('way-back').click()
    await page.waitForURL(/\/checkout\?resubmit=/)
    await page.getByText(/The cart now holds the items of order/).waitFor()
    const lines = page.getByRole('table', { name: 'What you are ordering' })
    await lines.getByText(`Test part ${slug}`).waitFor()
    expect(await lines.getByRole('cell', { name: '4', exact: true }).count()).toBe(1)
    await page.screenshot({ path: resolve(shots, 'checkout-resubmit.png'), fullPage: true })
    await page.close()
  })

  it(
    'comes back from the payment page to the order with a working "Pay now", and '
    + 'keeps the cart', async () => {
      const admin = await signedIn('admin@tiltwright.test')
      const { productId } = await productWithStock(admin, 30)
      const t = await newTeacher('abandon')
      const page = await browser.newPage()
      await signInThroughPage(page, t.email, PASSWORD)
      await gotoReady(page, '/cart')
      await page.evaluate(
        id =>
          localStorage.setItem(
            'tiltwright-cart-v1',
            JSON.stringify([{ productId: id, quantity: 2 }]),
          ),
        productId,
      )
      await gotoReady(page, '/checkout?method=card')
      await page.getByRole('button', { name: 'Continue to the payment page' }).click()
      await page.waitForURL(/\/fake-pay\/checkout\//)
      await page.getByRole('link', { name: 'Cancel and go back' }).click()
      await page.waitForURL(/\/orders\/\d+\?card=cancelled/)
      await page.getByText('The card payment was not completed.').waitFor()
      expect(await page.evaluate(() => localStorage.getItem('tiltwright-cart-v1'))).toContain(
        String(productId),
      )
      await page.getByRole('link', { name: 'Pay now' }).click()
      await page.waitForURL(/\/fake-pay\/checkout\//)
      await page.getByRole('button', { name: 'Approve this payment' }).click()
      await page.getByText('Payment received.').waitFor()
      // Paid: the cart that held exactly these lines has done its work.
      await expect
        .poll(() => page.evaluate(() => localStorage.getItem('tiltwright-cart-v1')))
        .toBe('[]')
      await page.close()
    })

  it('lets the teacher correct the school\'s address, field by field', async () => {
    const t = await newTeacher('moving')
    const page = await browser.newPage()
    await signInThroughPage(page, t.email, PASSWORD)
    await gotoReady(page, '/account')
    await page.getByLabel('ZIP code').fill('9810')
    await page.getByRole('button', { name: 'Save the school\'s address' }).click()
    expect(await page.locator('#school-postal-error').textContent()).toMatch(/US ZIP code/)
    await page.getByLabel('ZIP code').fill('98101')
    await page.getByLabel('State').selectOption('WA')
    await page.getByRole('button', { name: 'Save the school\'s address' }).click()
    await page.getByText('The school\'s address is saved.').waitFor()
    expect((await t.client.get('/api/account')).body.school).toMatchObject({
      region: 'WA',
      postalCode: '98101',
    })
    await page.screenshot({ path: resolve(shots, 'account-school-address.png'), fullPage: true })
    await page.close()
  })
})
