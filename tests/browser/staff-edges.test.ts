// The staff side as a new colleague finds it, on a phone (390×844) and a desktop (1280×800):
// the desk opens on its to-do list (purchase orders wait there, counted, each linking to its
// order page; an empty list says so), support sees no order lists, and on the staff page an admin
// sees each colleague's status, changes a role, disables (after confirming) and enables an
// account, and reads the server's refusal. Screenshots go to tests/.artifacts/shop-edges/.

import { beforeAll, describe, expect, it } from 'vitest'
import {
  accessibilityViolations,
  artifacts,
  gotoReady,
  launchForFile,
  signInThroughPage,
} from '../helpers/browser'
import { uniqueEmail } from '../helpers/client'
import { newTeacher, poForm, productWithStock, signedIn } from '../helpers/shop'

const { shot } = artifacts('shop-edges')
const browser = await launchForFile()
const SIZES = [
  { name: 'phone', viewport: { width: 390, height: 844 } },
  { name: 'desktop', viewport: { width: 1280, height: 800 } },
] as const
async function signedInPage(email: string, viewport: { width: number, height: number }) {
  const ctx = await browser.newContext({ viewport })
  const page = await ctx.newPage()
  await signInThroughPage(page, email)
  return { ctx, page }
}

describe('the staff desk', () => {
  let admin: Awaited<ReturnType<typeof signedIn>>
  let newest = ''
  beforeAll(async () => {
    admin = await signedIn('admin@tiltwright.test')
    const { productId } = await productWithStock(admin, 10)
    const t = await newTeacher('desk')
    const placed = await t.client.post(
      '/api/checkout/purchase-order',
      poForm({ lines: [{ productId, quantity: 1 }] }),
    )
    if (placed.status !== 201) throw new Error(`order failed: ${placed.status}`)
    newest = (await admin.get(`/api/orders/${placed.body.orderId}`)).body.number
    if (!/^TW-\d+$/.test(newest)) throw new Error(`no order number: ${newest}`)
  })

  it.each(SIZES)('lists the purchase orders waiting for the admin on a $name', async ({
    name,
    viewport,
  }) => {
    // What the desk holds now: the new order, and any that other tests left waiting before it
    // (the list shows the oldest 20, so the first one listed is the one to follow).
    const desk = (await admin.get('/api/staff/desk')).body
    const waiting: number = desk.waiting.poToReview
    expect(waiting).toBeGreaterThanOrEqual(1)
    const first = desk.poToReview[0]
    const { ctx, page } = await signedInPage('admin@tiltwright.test', viewport)
    await gotoReady(page, '/staff')
    const review = page.getByRole('region', { name: /Purchase orders to review/ })
    // The badge closes the heading: the count of all that wait, not of the rows shown.
    expect((await review.getByRole('heading').textContent())!.trim())
      .toMatch(new RegExp(`\\s${waiting}$`))
    expect(await review.getByTestId('desk-more').count()).toBe(waiting > 20 ? 1 : 0)
    const link = review.getByRole('link', { name: first.number, exact: true })
    expect(await link.getAttribute('href')).toBe(`/admin/orders/${first.id}`)
    expect(
      await page.evaluate(
        () => document.documentElement.scrollWidth - document.documentElement.clientWidth,
      ),
    ).toBe(0)
    expect(await accessibilityViolations(page)).toEqual([])
    await shot(page, `staff-desk-admin-${name}`)
    await link.click()
    await page.waitForURL(`**/admin/orders/${first.id}`)
    await page.getByRole('button', { name: 'Approve and send the invoice' }).waitFor()
    await ctx.close()
  })

  it('says kindly when nothing is waiting', async () => {
    const { ctx, page } = await signedInPage('admin@tiltwright.test', SIZES[0].viewport)
    // The desk's reply, empty, as the page fetches it after a move within the app.
    await page.route('**/api/staff/desk', route =>
      route.fulfill({
        json: { poToReview: [], toAllocate: [], toShip: [], waiting: null, failedMail: 0 },
      }),
    )
    await gotoReady(page, '/account')
    await page.getByRole('button', { name: 'Menu' }).click()
    await page.getByRole('link', { name: 'Staff desk' }).first().click()
    await page.getByTestId('desk-empty').waitFor()
    expect(await page.getByTestId('desk-empty').textContent()).toContain('Nothing is waiting')
    await shot(page, 'staff-desk-empty-phone')
    await ctx.close()
  })

  it('shows support no order lists', async () => {
    const { ctx, page } = await signedInPage('support@tiltwright.test', SIZES[1].viewport)
    await gotoReady(page, '/staff')
    await page.getByRole('heading', { name: 'What support can do today' }).waitFor()
    await page.getByRole('heading', { name: 'To do' }).waitFor()
    expect(await page.getByText('Purchase orders to review').count()).toBe(0)
    expect(await page.getByText(newest).count()).toBe(0)
    expect(await accessibilityViolations(page)).toEqual([])
    await shot(page, 'staff-desk-support-desktop')
    await ctx.close()
  })
})

describe('the staff page', () => {
  it.each(SIZES)('lets an admin change a colleague\'s role and account on a $name', async ({
    name,
    viewport,
  }) => {
    const admin = await signedIn('admin@tiltwright.test')
    const email = uniqueEmail('colleague')
    const colleague = `Colleague ${name} ${Date.now().toString(36)}`
    const added = await admin.post('/api/admin/staff', { name: colleague, email, role: 'support' })
    expect(added.status).toBe(201)

    const { ctx, page } = await signedInPage('admin@tiltwright.test', viewport)
    await gotoReady(page, '/admin/staff')
    await page.getByRole('searchbox').fill(email)
    const row = page.getByRole('row').filter({ hasText: email })
    await row.getByText('Invited: not signed in yet').waitFor()
    expect(await row.getByText('Never').count()).toBe(1)

    await row.getByRole('button', { name: `Make admin: ${colleague}` }).click()
    await row.getByRole('cell', { name: 'Admin', exact: true }).waitFor()

    await row.getByRole('button', { name: `Disable…: ${colleague}` }).click()
    await page.getByTestId('confirm-disable').waitFor()
    expect(await accessibilityViolations(page)).toEqual([])
    await shot(page, `staff-confirm-disable-${name}`)
    await row.getByRole('button', { name: 'Yes, disable' }).click()
    await row.getByRole('cell', { name: 'Disabled', exact: true }).waitFor()
    await row.getByRole('button', { name: `Enable: ${colleague}` }).click()
    await row.getByText('Invited: not signed in yet').waitFor()

    // The server refuses an admin's own demotion; the page says why.
    await page.getByRole('searchbox').fill('admin@tiltwright.test')
    const own = page.getByRole('row').filter({ hasText: 'admin@tiltwright.test' })
    await own.getByRole('button', { name: /^Make support/ }).click()
    expect(await own.getByTestId('staff-refusal').textContent()).toContain(
      'You cannot change your own role.',
    )
    await own.getByRole('cell', { name: 'Admin', exact: true }).waitFor()
    await shot(page, `staff-refused-${name}`)
    await ctx.close()
  })
})
