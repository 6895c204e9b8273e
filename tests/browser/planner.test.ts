// The Gain Planner as a builder uses it: change a measurement, see the suggestion and the
// plots change at once; phone-sized without sideways scrolling; no serious a11y findings.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser } from 'playwright-core'
import {
  accessibilityViolations,
  gotoReady,
  launch,
  signInThroughPage,
  url,
} from '../helpers/browser'

let browser: Browser
beforeAll(async () => {
  browser = await launch()
})
afterAll(async () => {
  await browser?.close()
})

describe('Gain Planner page', () => {
  it('re-plans and redraws when a measurement changes', async () => {
    const page = await browser.newPage({ viewport: { width: 1366, height: 900 } })
    await gotoReady(page, '/planner')
    const kp = page.getByTestId('kp')
    await kp.waitFor()
    const plot = page.getByTestId('response-plot').locator('canvas').first()
    await plot.waitFor()
    const before = {
      kp: await kp.textContent(),
      plot: await plot.screenshot(),
      map: await page.getByTestId('stability-map').screenshot(),
    }

    await page.getByLabel('Servo horn radius (mm)').fill('15')
    await expect.poll(() => kp.textContent()).not.toBe(before.kp)
    await page.waitForTimeout(300)
    expect(Buffer.compare(await plot.screenshot(), before.plot)).not.toBe(0)
    expect(
      Buffer.compare(await page.getByTestId('stability-map').screenshot(), before.map),
    ).not.toBe(0)
    // A shorter horn means a smaller plant gain, so a larger Kp for the same targets.
    expect(parseFloat((await kp.textContent())!)).toBeGreaterThan(parseFloat(before.kp!))
    await page.close()
  })

  it('shows a field error for a nonsense value and keeps what was typed', async () => {
    const page = await browser.newPage()
    await gotoReady(page, '/planner')
    await page.getByLabel('Rail contact spacing (mm)').fill('25')
    await page.locator('#railGapMm-error').waitFor()
    expect(await page.locator('#railGapMm-error').textContent()).toMatch(
      /smaller than the ball diameter/,
    )
    expect(await page.getByLabel('Rail contact spacing (mm)').inputValue()).toBe('25')
    await page.close()
  })

  it('fits on a phone without sideways scrolling and passes the accessibility check', async () => {
    const page = await browser.newPage({ viewport: { width: 390, height: 844 } })
    await page.goto(url('/planner'))
    await page.getByTestId('kp').waitFor()
    await page.waitForTimeout(300)
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(390)
    expect(await page.getByTestId('planner-summary').isVisible()).toBe(true)
    expect(await accessibilityViolations(page)).toEqual([])
    await page.close()
  })

  it('lets a signed-in builder save a tuning sheet and find it under My sheets', async () => {
    const page = await browser.newPage({ viewport: { width: 1366, height: 900 } })
    await signInThroughPage(page, 'builder@tiltwright.test')
    await gotoReady(page, '/planner')
    await page.getByLabel('Title').fill('Browser bench sheet')
    await page.getByRole('button', { name: 'Save sheet' }).click()
    await page.getByText('Saved.').waitFor()
    await page.goto(url('/sheets'))
    await page.getByRole('link', { name: 'Browser bench sheet' }).first().click()
    await page.waitForURL(/\/planner\?sheet=\d+/)
    await page.getByText('Working from the sheet “Browser bench sheet”').waitFor()
    // Overlay the saved sheet on the plot: its series appears in the plot's legend.
    await page.getByLabel('Overlay a sheet').selectOption({ label: 'Browser bench sheet' })
    await expect
      .poll(() => page.getByTestId('response-plot').textContent())
      .toContain('sheet: Browser bench sheet')
    await page.close()
  })
})
