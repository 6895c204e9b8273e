// A person's walk through issue 8, in two browsers at once (a school laptop and a phone):
// sign in on both, reset the password on one (which signs the other out), sign in again and
// sign out everywhere. Screenshots go to tests/.artifacts/accounts/.

import { describe, expect, it } from 'vitest'
import { artifacts, gotoReady, launchForFile, signInThroughPage } from '../helpers/browser'
import { Client, uniqueEmail } from '../helpers/client'
import { linkIn, waitForMail } from '../helpers/mail'

const { shot } = artifacts('accounts')
const browser = await launchForFile()

describe('sign-in, reset and sign-out in two browsers at once', () => {
  it(
    'ends the other browser\'s session on a reset, and every session on "sign out '
    + 'everywhere"', async () => {
      const email = uniqueEmail('walk')
      const school = {
        name: 'Two Browsers School',
        addressLine1: '1 Tab Street',
        city: 'Dual',
        region: 'OR',
        postalCode: '97004',
      }
      expect(
        (
          await new Client().post('/api/auth/register', {
            name: 'Robin Tabb',
            email,
            password: 'first-password-1',
            school,
          })
        ).status,
      ).toBe(201)

      const laptopContext = await browser.newContext({ viewport: { width: 1200, height: 900 } })
      const phoneContext = await browser.newContext({
        viewport: { width: 390, height: 844 },
        isMobile: true,
      })
      const laptop = await laptopContext.newPage()
      const phone = await phoneContext.newPage()
      await Promise.all([
        signInThroughPage(laptop, email, 'first-password-1'),
        signInThroughPage(phone, email, 'first-password-1'),
      ])

      await gotoReady(laptop, '/account')
      await laptop.getByTestId('session-list').getByRole('listitem').nth(1).waitFor()
      expect(await laptop.getByTestId('session-list').getByRole('listitem').count()).toBe(2)
      await shot(laptop, '1-laptop-account-two-sessions')

      // The phone forgets the password: it signs out and resets it from the e-mailed link.
      if (!(await phone.getByRole('button', { name: 'Sign out' }).isVisible()))
        await phone.getByRole('button', { name: /menu/i }).click()
      await phone.getByRole('button', { name: 'Sign out' }).click()
      await phone.getByRole('link', { name: 'Sign in' }).first().waitFor({ state: 'attached' })
      await gotoReady(phone, '/forgot-password')
      await phone.getByLabel('E-mail').fill(email)
      await phone.getByRole('button', { name: 'Send the reset link' }).click()
      await phone.getByText(/reset link is on its way/).waitFor()
      await shot(phone, '2-phone-reset-asked')
      const link = linkIn(
        await waitForMail(email, /Reset your Tiltwright password/),
        /http\S+reset-password\/[A-Za-z0-9_-]+/,
      )
      await gotoReady(phone, new URL(link).pathname)
      await phone.getByLabel('New password').fill('second-password-2')
      await phone.getByRole('button', { name: 'Save the new password' }).click()
      await phone.waitForURL(/\/account\?reset=1/)
      await phone.getByText('Your new password is saved').waitFor()
      await shot(phone, '3-phone-after-reset')

      // The laptop's session ended with the reset: reloading its account page asks it to sign in.
      await laptop.reload()
      await laptop.waitForURL(/\/login/)
      await shot(laptop, '4-laptop-signed-out-by-reset')

      await signInThroughPage(laptop, email, 'second-password-2')
      await gotoReady(laptop, '/account')
      await laptop.getByRole('button', { name: 'Sign out everywhere' }).click()
      await laptop.waitForURL(/signedOut=everywhere/)
      await laptop.getByText('You are signed out everywhere.').waitFor()
      await shot(laptop, '5-laptop-signed-out-everywhere')

      await phone.reload()
      await phone.waitForURL(/\/login/)
      await shot(phone, '6-phone-signed-out-everywhere')
      await Promise.all([laptopContext.close(), phoneContext.close()])
    })

  it('lands a builder at their rigs and support at their desk', async () => {
    const context = await browser.newContext()
    const page = await context.newPage()
    await signInThroughPage(page, 'builder@tiltwright.test')
    expect(new URL(page.url()).pathname).toBe('/rigs')
    await gotoReady(page, '/kits')
    await page.getByRole('heading', { name: 'Kits and parts' }).waitFor()
    expect(await page.locator('main').textContent()).not.toMatch(/\$\d/)
    await shot(page, '7-builder-kits-without-prices')
    await context.close()

    const support = await browser.newContext()
    const desk = await support.newPage()
    await signInThroughPage(desk, 'support@tiltwright.test')
    expect(new URL(desk.url()).pathname).toBe('/help-queue')
    await gotoReady(desk, '/staff')
    await desk.getByRole('heading', { name: 'What support can do today' }).waitFor()
    await shot(desk, '8-support-desk')
    await support.close()
  })
})
