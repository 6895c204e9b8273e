// The troubleshooting guide (/help) on a phone (390×844) and a laptop (1280×800): every entry's
// anchor exists and a link to it scrolls there, the page never scrolls sideways, its headings go
// in order, axe finds nothing serious, and the footer links to it. Screenshots go to
// tests/.artifacts/help/.
import type { Page } from 'playwright-core'
import { describe, expect, it } from 'vitest'
import {
  accessibilityViolations,
  artifacts,
  gotoReady,
  launchForFile,
  signInThroughPage,
} from '../helpers/browser'
import { GUIDE_SLUGS, HELP_GUIDE } from '../../shared/utils/help-guide'

const { shot } = artifacts('help')
const browser = await launchForFile()

/** The entry's heading is on screen (its link or the address scrolled there). */
const inView = (page: Page, slug: string) =>
  page.locator(`[id="${slug}"]`).evaluate((el) => {
    const r = el.getBoundingClientRect()
    return r.top >= 0 && r.top < window.innerHeight
  })

describe.each([
  ['phone', 390, 844],
  ['desktop', 1280, 800],
] as const)('/help on a %s', (name, width, height) => {
  it('shows every entry at its anchor, without sideways scrolling, and passes axe', async () => {
    const context = await browser.newContext({ viewport: { width, height } })
    const page = await context.newPage()
    const reply = await gotoReady(page, '/help')
    expect(reply?.status()).toBe(200)
    await page.getByRole('heading', { level: 1, name: 'Troubleshooting guide' }).waitFor()

    for (const e of HELP_GUIDE) {
      const heading = page.locator(`[id="${e.slug}"]`)
      expect(await heading.evaluate(el => el.tagName)).toBe('H2')
      expect((await heading.textContent())?.trim()).toBe(e.title)
      // The list of symptoms links to it.
      expect(await page.locator(`#symptoms a[href="#${e.slug}"]`).count()).toBe(1)
    }
    expect(GUIDE_SLUGS.length).toBe(8)

    const wide = await page.evaluate(() => document.documentElement.scrollWidth)
    expect(wide).toBeLessThanOrEqual(width)

    // Headings never skip a level (h1, then h2s, h3s inside an entry).
    const levels = await page.evaluate(() =>
      [...document.querySelectorAll('main h1, main h2, main h3, main h4')].map(h =>
        Number(h.tagName.slice(1))))
    expect(levels[0]).toBe(1)
    for (let i = 1; i < levels.length; i++)
      expect(levels[i]! - levels[i - 1]!).toBeLessThanOrEqual(1)

    expect(await accessibilityViolations(page)).toEqual([])
    await shot(page, `help-${name}`)

    // Following a symptom's link scrolls its entry into view.
    await page.locator('#symptoms a[href="#oscillates"]').click()
    await expect.poll(() => page.evaluate(() => location.hash)).toBe('#oscillates')
    await expect.poll(() => inView(page, 'oscillates')).toBe(true)
    await context.close()
  })
}, 60_000)

describe('getting to /help', () => {
  it('opens at an entry from a deep link and is linked from the footer', async () => {
    const context = await browser.newContext({ viewport: { width: 390, height: 844 } })
    const page = await context.newPage()
    await gotoReady(page, '/help#reads-backwards')
    await expect.poll(() => inView(page, 'reads-backwards')).toBe(true)

    await gotoReady(page, '/safety')
    await page.getByRole('contentinfo').getByRole('link', { name: 'troubleshooting guide' })
      .click()
    await page.waitForURL(u => u.pathname === '/help')
    // A visitor is not offered the ticket pages.
    expect(await page.getByRole('link', { name: /ask for help/i }).count()).toBe(0)
    await context.close()
  })

  it('offers a signed-in builder the way to ask for help', async () => {
    const context = await browser.newContext({ viewport: { width: 390, height: 844 } })
    const page = await context.newPage()
    await signInThroughPage(page, 'builder@tiltwright.test')
    await gotoReady(page, '/help')
    const ask = page.getByRole('main').getByRole('link', { name: /ask for help/i })
    expect(await ask.count()).toBeGreaterThan(0)
    expect(await ask.first().getAttribute('href')).toBe('/tickets')
    expect(await accessibilityViolations(page)).toEqual([])
    await context.close()
  })
})
