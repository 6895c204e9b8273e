// The pages issue 9 put in order: sign-out forgets the planner draft on a shared classroom
// computer even when the planner was not opened since the last reload, and the tables read on
// a phone (390×844) and a laptop (1280×800). Screenshots go to tests/.artifacts/house-pages/.

import { resolve } from 'node:path'
import { describe, expect, it } from 'vitest'
import {
  accessibilityViolations,
  artifacts,
  gotoReady,
  launchForFile,
  signInThroughPage,
} from '../helpers/browser'

const { dir: shots } = artifacts('house-pages')

const PLANNER_KEY = 'tiltwright.planner.v1'

const browser = await launchForFile()

describe('signing out of a shared computer', () => {
  it('clears the planner draft though the planner was not opened since the reload', async () => {
    const context = await browser.newContext({ viewport: { width: 1280, height: 800 } })
    const page = await context.newPage()
    await signInThroughPage(page, 'builder@tiltwright.test')
    await gotoReady(page, '/planner')
    const beam = page.getByLabel('Beam length (mm)')
    const before = await beam.inputValue()
    await beam.fill('455')
    await expect
      .poll(() => page.evaluate(k => localStorage.getItem(k), PLANNER_KEY))
      .toContain('"beamLengthMm":455')
    // Saved as a sheet too, so "My sheets" below has a row to lay out.
    await page.getByLabel('Title').fill('Shared computer sheet')
    await page.getByRole('button', { name: 'Save sheet' }).click()
    await page.getByText('Saved.').waitFor()

    // A full page load of another page: the planner's store is not created before sign-out.
    await gotoReady(page, '/safety')
    await page.getByRole('button', { name: 'Sign out' }).click()
    await page.getByRole('link', { name: 'Sign in' }).first().waitFor()
    expect(await page.evaluate(k => localStorage.getItem(k), PLANNER_KEY)).toBeNull()

    await gotoReady(page, '/planner')
    expect(await page.getByLabel('Beam length (mm)').inputValue()).toBe(before)
    expect(before).not.toBe('455')
    await context.close()
  })
})

interface TableCase {
  path: string
  who: string
  caption: string
  /** Headers a phone must show; `folded` ones show from `sm` up. */
  key: string[]
  folded: string[]
}
const tables: TableCase[] = [
  {
    path: '/orders',
    who: 'teacher@tiltwright.test',
    caption: 'Your school\'s orders',
    key: ['Order', 'Total', 'Status'],
    folded: ['Placed', 'Payment'],
  },
  {
    path: '/quotes',
    who: 'teacher@tiltwright.test',
    caption: 'Your school\'s quotes',
    key: ['Quote', 'Total', 'State'],
    folded: ['Issued', 'Valid until'],
  },
  {
    path: '/sheets',
    who: 'builder@tiltwright.test',
    caption: 'Your tuning sheets',
    key: ['Title', 'Predicted'],
    folded: ['Saved', 'Note'],
  },
  {
    path: '/admin/orders',
    who: 'admin@tiltwright.test',
    caption: 'Orders',
    key: ['Order', 'Status', 'Total'],
    folded: ['School', 'Placed', 'Payment'],
  },
  {
    path: '/admin/catalog',
    who: 'admin@tiltwright.test',
    caption: 'Products',
    key: ['Product', 'Left'],
    folded: ['Tiers', 'On sale'],
  },
  {
    path: '/admin/batches',
    who: 'admin@tiltwright.test',
    caption: 'Batches, newest first',
    key: ['Batch', 'Left', 'Recount'],
    folded: ['Product', 'Built', 'Units', 'Held'],
  },
]

const sizes = [
  { name: 'phone', width: 390, height: 844 },
  { name: 'laptop', width: 1280, height: 800 },
]

describe('tables on a phone and a laptop', () => {
  for (const t of tables) {
    it(`${t.path}: key columns without sideways scrolling, the rest from sm up`, async () => {
      for (const size of sizes) {
        const context = await browser.newContext({
          viewport: { width: size.width, height: size.height },
        })
        const page = await context.newPage()
        await signInThroughPage(page, t.who)
        await gotoReady(page, t.path)
        const table = page.getByRole('table', { name: t.caption })
        await table.waitFor()
        await expect.poll(() => table.locator('tbody').getAttribute('aria-busy')).not.toBe('true')
        const phone = size.width < 640
        const header = (name: string) =>
          table.getByRole('columnheader', { name, exact: true }).isVisible()
        for (const name of t.key) expect(await header(name), name).toBe(true)
        for (const name of t.folded) expect(await header(name), name).toBe(!phone)
        // Neither the page nor the table's own scroll box scrolls sideways.
        expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(
          size.width,
        )
        const box = await table.evaluate((el) => {
          const scroller = el.parentElement!
          return { content: scroller.scrollWidth, visible: scroller.clientWidth }
        })
        expect(box.content).toBeLessThanOrEqual(box.visible)
        expect(await accessibilityViolations(page)).toEqual([])
        const name = `${t.path.slice(1).replaceAll('/', '-')}-${size.name}`
        await page.screenshot({ path: resolve(shots, `${name}.png`), fullPage: true })
        await context.close()
      }
    })
  }
})

describe('a page number past the end', () => {
  it('shows the last page, and the address follows it', async () => {
    const page = await browser.newPage({ viewport: { width: 1280, height: 800 } })
    await signInThroughPage(page, 'admin@tiltwright.test')
    await gotoReady(page, '/admin/orders?page=999')
    const pager = page.getByRole('navigation', { name: 'Pages' })
    await expect.poll(() => pager.textContent()).toMatch(/page (\d+) of \1\b/)
    await page.waitForURL(u => u.searchParams.get('page') !== '999')
    const last = Number(/page (\d+) of/.exec((await pager.textContent())!)![1])
    expect(new URL(page.url()).searchParams.get('page') ?? '1').toBe(String(last))
    await page.close()
  })
})
