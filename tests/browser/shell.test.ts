// A person's view of the shell: signing in through the page, the role's navigation,
// field errors tied to their inputs, and an automated accessibility check.
import { describe, expect, it } from 'vitest'
import {
  accessibilityViolations,
  gotoReady,
  launchForFile,
  signInThroughPage,
  url,
} from '../helpers/browser'

const browser = await launchForFile()

const navFor: Record<string, { has: string[], lacks: string[] }> = {
  teacher: {
    has: ['Gain Planner', 'Tickets'],
    lacks: ['Staff desk', 'Staff accounts', 'Help queue'],
  },
  builder: {
    has: ['Gain Planner', 'Tickets'],
    lacks: ['Staff desk', 'Staff accounts', 'Help queue'],
  },
  support: { has: ['Staff desk', 'Help queue'], lacks: ['Staff accounts'] },
  admin: { has: ['Staff desk', 'Staff accounts', 'Help queue'], lacks: [] },
}

describe('signing in through the page', () => {
  for (const [role, nav] of Object.entries(navFor)) {
    it(`shows the ${role} their name, role and navigation`, async () => {
      const context = await browser.newContext()
      const page = await context.newPage()
      await signInThroughPage(page, `${role}@tiltwright.test`)
      const main = page.getByRole('navigation', { name: 'Main' })
      await expect(main.getByTestId('account-link').textContent()).resolves.toMatch(
        new RegExp(role, 'i'),
      )
      // A link's name may end with its count badge ("Tickets 2 waiting for you").
      const named = (label: string) => new RegExp(`^${label}( \\d.*)?$`)
      for (const label of nav.has)
        expect(await main.getByRole('link', { name: named(label) }).count()).toBe(1)
      for (const label of nav.lacks)
        expect(await main.getByRole('link', { name: named(label) }).count()).toBe(0)
      await context.close()
    })
  }

  it('fits every staff link on a phone, none cut off at the edge', async () => {
    const context = await browser.newContext({ viewport: { width: 390, height: 844 } })
    const page = await context.newPage()
    await signInThroughPage(page, 'admin@tiltwright.test')
    await gotoReady(page, '/staff')
    const links = page.getByRole('navigation', { name: 'Staff' }).getByRole('link')
    expect(await links.count()).toBeGreaterThanOrEqual(5)
    for (const box of await links.evaluateAll(els =>
      els.map(e => e.getBoundingClientRect()).map(r => ({ left: r.left, right: r.right })),
    )) {
      expect(box.left).toBeGreaterThanOrEqual(0)
      expect(box.right).toBeLessThanOrEqual(390)
    }
    await page.screenshot({ path: 'tests/.artifacts/shell/staff-nav-phone.png' })
    await context.close()
  })

  it('signs out: the header and the session both forget the user', async () => {
    const context = await browser.newContext()
    const page = await context.newPage()
    await signInThroughPage(page, 'teacher@tiltwright.test')
    await page.getByRole('button', { name: 'Sign out' }).click()
    await page.getByRole('link', { name: 'Sign in' }).waitFor()
    expect(await page.getByTestId('account-link').count()).toBe(0)
    const session = await page.evaluate(() => fetch('/api/_auth/session').then(r => r.json()))
    expect(session.user).toBeUndefined()
    await page.goto(url('/account'))
    await page.waitForURL(/\/login/)
    await context.close()
  })

  it(
    'shows Tiltwright\'s own page, with the header, for an address that does not '
    + 'exist', async () => {
      const page = await browser.newPage()
      const res = await page.goto(url('/no-such-page'))
      expect(res?.status()).toBe(404)
      await page.getByRole('heading', { name: 'There is nothing here' }).waitFor()
      expect(await page.getByRole('navigation', { name: 'Main' }).count()).toBe(1)
      expect(await page.title()).toBe('Not found — Tiltwright')
      await page.close()
    })

  it('keeps what was typed and ties the error to the field on a wrong password', async () => {
    const page = await browser.newPage()
    await gotoReady(page, '/login')
    await page.getByLabel('E-mail').fill('teacher@tiltwright.test')
    await page.getByLabel('Password').fill('wrong-password')
    await page.getByRole('button', { name: 'Sign in' }).click()
    const error = page.locator('#password-error')
    await error.waitFor()
    expect(await error.textContent()).toMatch(/do not match/)
    expect(await page.getByLabel('Password').getAttribute('aria-describedby')).toContain(
      'password-error',
    )
    expect(await page.getByLabel('E-mail').inputValue()).toBe('teacher@tiltwright.test')
    await page.close()
  })

  it('shows field errors on the registration form before anything is sent', async () => {
    const page = await browser.newPage()
    await gotoReady(page, '/register')
    await page.getByRole('button', { name: 'Open the account' }).click()
    await page.locator('#name-error').waitFor()
    expect(await page.locator('#school-city-error').textContent()).toBe('Enter the city.')
    expect(await page.getByLabel('Your name').getAttribute('aria-invalid')).toBe('true')
    await page.close()
  })

  it('lets a keyboard user reach the sign-in form', async () => {
    const page = await browser.newPage()
    await gotoReady(page, '/login')
    await page.getByLabel('E-mail').focus()
    await page.keyboard.type('admin@tiltwright.test')
    await page.keyboard.press('Tab')
    await page.keyboard.type('tiltwright-demo')
    await page.keyboard.press('Enter')
    // Staff land on their desk after signing in.
    await page.waitForURL(u => u.pathname === '/staff')
    expect(await page.getByTestId('account-link').textContent()).toMatch(/admin/i)
    await page.close()
  })
})

describe('accessibility (axe-core, WCAG 2.1 A/AA, serious and critical)', () => {
  for (const path of ['/', '/login', '/register', '/forgot-password', '/safety']) {
    it(`finds no serious violations on ${path}`, async () => {
      const page = await browser.newPage()
      await page.goto(url(path))
      expect(await accessibilityViolations(page)).toEqual([])
      await page.close()
    })
  }

  it('finds no serious violations on the signed-in account and staff pages', async () => {
    const page = await browser.newPage()
    await signInThroughPage(page, 'admin@tiltwright.test')
    for (const path of ['/account', '/staff', '/admin/staff']) {
      await page.goto(url(path))
      await page.locator('h1').first().waitFor()
      expect({ path, violations: await accessibilityViolations(page) }).toEqual({
        path,
        violations: [],
      })
    }
    await page.close()
  })
})
