// A class in the browser: the teacher opens the demo build space's progress board and makes a
// join code; a student on a phone joins with it, is put on a rig by the teacher, ticks two
// checklist steps with a note and saves a tuning sheet to the rig from the Gain Planner; the
// teacher's board shows it after its next refresh. Screenshots go to tests/.artifacts/build/
// for a person to look at.
import { describe, expect, it } from 'vitest'
import type { Page } from 'playwright-core'
import type { BoardReply, BuildSpaceSummary, RigView } from '../../shared/types/build'
import {
  accessibilityViolations,
  artifacts,
  gotoReady,
  launchForFile,
  signInThroughPage,
  url,
} from '../helpers/browser'
import { sql } from '../helpers/db'

const { shot } = artifacts('build')
const browser = await launchForFile()

const desktop = { width: 1280, height: 800 }
const projector = { width: 1920, height: 1080 }
const phone = { width: 390, height: 844 }
const scrollsSideways = (page: Page) =>
  page.evaluate(() => document.documentElement.scrollWidth > document.documentElement.clientWidth)

/** The demo teacher's seeded build space: the oldest of the spaces (other test files pay for
 *  orders of kits too, which open newer ones), else a paid order. */
async function demoOrderId(page: Page): Promise<number> {
  const spaces = (await (await page.request.get(url('/api/build-spaces'))).json()) as
    BuildSpaceSummary[]
  if (spaces.length) return Math.min(...spaces.map(s => s.orderId))
  const [row] = await sql<{ id: number }>(
    'SELECT o.id FROM orders o JOIN users u ON u.school_id = o.school_id '
    + 'WHERE u.email = ? AND o.paid_at IS NOT NULL ORDER BY o.id LIMIT 1',
    ['teacher@tiltwright.test'],
  )
  return row!.id
}

describe('a class builds in the browser', () => {
  it('joins with a code, ticks steps, saves a sheet and shows on the board', async () => {
    const teacherCtx = await browser.newContext({ viewport: desktop })
    const board = await teacherCtx.newPage()
    await signInThroughPage(board, 'teacher@tiltwright.test')
    const orderId = await demoOrderId(board)
    await gotoReady(board, `/orders/${orderId}/build`)
    await board.getByRole('heading', { name: /^Build space / }).waitFor()
    expect(await board.getByTestId('board-updated').textContent()).toMatch(/Updated /)
    expect(await board.getByTestId('board-rig').count()).toBeGreaterThan(0)

    // A join code for this lesson, shown to the class full-screen and closed with Escape.
    await board.getByLabel('Works for').selectOption('1')
    await board.getByRole('button', { name: 'Make a join code' }).click()
    const shown = board.getByTestId('overlay-code')
    await shown.waitFor()
    const code = (await shown.textContent())!.trim()
    expect(code).toMatch(/^[2-9A-Z]{4}-[2-9A-Z]{4}$/)
    await board.keyboard.press('Escape')
    await shown.waitFor({ state: 'detached' })
    await board.getByTestId('join-code').filter({ hasText: code }).waitFor()

    // A student on a phone types the code in lower case without the dash.
    const studentCtx = await browser.newContext({ viewport: phone, isMobile: true })
    const student = await studentCtx.newPage()
    await gotoReady(student, '/join')
    await student.getByLabel('Join code').fill(code.replace('-', '').toLowerCase())
    await student.getByRole('button', { name: 'Continue' }).click()
    await student.getByTestId('join-account-form').waitFor()
    expect(await student.getByTestId('join-account-form').textContent()).toContain('class at')
    const name = `Wren ${String.fromCharCode(65 + (Date.now() % 26))}.`
    await student.getByLabel('Your name').fill(name)
    const username = await student.getByLabel('Username').inputValue()
    expect(username).toMatch(/^[a-z][a-z0-9-]{2,29}$/)
    await student.getByLabel('Password').fill('wobbly-pivot-2026')
    expect(await scrollsSideways(student)).toBe(false)
    expect(await accessibilityViolations(student)).toEqual([])
    await shot(student, 'join-phone')
    await student.getByRole('button', { name: 'Join the class' }).click()
    await student.waitForURL(u => u.pathname === '/rigs')
    await student.getByRole('heading', { name: 'Your rigs' }).waitFor()
    expect(await student.locator('main').textContent()).not.toMatch(/\$\d/)

    // The teacher puts the student on a rig nobody has started (the board refreshes itself).
    const reply = (await (
      await board.request.get(url(`/api/orders/${orderId}/board`))
    ).json()) as BoardReply
    const rig = reply.rigs.find(r => r.done === 0) ?? reply.rigs[0]!
    const move = board.getByLabel(`Rig of ${name}`)
    await move.waitFor({ timeout: 20_000 })
    await Promise.all([
      board.waitForResponse(r => r.url().includes('/builders/') && r.status() === 200),
      move.selectOption(String(rig.id)),
    ])

    await student.reload()
    await student.getByTestId('my-rig').filter({ hasText: rig.serial }).click()
    await student.waitForURL(u => u.pathname === `/rigs/${rig.id}`)
    await student.getByRole('heading', { name: 'Build checklist' }).waitFor()
    for (const [step, note] of [
      ['frame', 'Pivot squared against the bench edge.'],
      ['linkage', 'Pushrod in the middle hole of the lever arm.'],
    ] as const) {
      const item = student.getByTestId(`step-${step}`)
      await item.getByLabel('Note').fill(note)
      await item.getByRole('checkbox').check()
      await item.getByText(`Ticked by ${name}`).waitFor()
      expect(await item.getByLabel('Note').inputValue()).toBe(note)
    }
    expect(await student.getByTestId('caution-linkage').textContent()).toMatch(/school/i)
    expect(await scrollsSideways(student)).toBe(false)
    expect(await accessibilityViolations(student)).toEqual([])
    await shot(student, 'rig-phone')

    // The rig page opens the Gain Planner for this rig; the sheet is saved to the rig.
    await student.getByRole('link', { name: 'Open in the Gain Planner' }).click()
    await student.waitForURL(u => u.pathname === '/planner' && u.search === `?rig=${rig.id}`)
    await student.getByRole('heading', { name: 'Save a tuning sheet to this rig' }).waitFor()
    const title = `First gains ${Date.now() % 10_000}`
    await student.locator('#sheet-title').fill(title)
    await student.locator('#sheet-verdict').selectOption('balances')
    await student.getByRole('button', { name: 'Save sheet' }).click()
    await student.getByRole('link', { name: 'See it on the rig page' }).click()
    await student.waitForURL(u => u.pathname === `/rigs/${rig.id}`)
    const row = student.getByTestId('rig-sheet').filter({ hasText: title })
    await row.waitFor()
    expect(await row.textContent()).toContain('Balances')

    // The teacher's board picks it up on its next refresh, without a reload.
    const card = board.getByTestId('board-rig').filter({ hasText: rig.serial })
    await card.getByTestId('latest-sheet').filter({ hasText: title }).waitFor({ timeout: 25_000 })
    expect(await card.textContent()).toContain('Wiring')
    expect(await card.textContent()).toContain(name)
    expect(await card.getByTestId('progress-strip').getAttribute('aria-label')).toBe(
      '2 of 7 steps done; now Wiring',
    )
    expect(await accessibilityViolations(board)).toEqual([])
    await shot(board, 'board-desktop')

    // A filter shows only the rigs on that step, and stays in the address.
    const cards = board.getByTestId('board-rig')
    const before = await cards.count()
    await board.locator('#board-step').selectOption('wiring')
    await board.waitForURL(u => u.searchParams.get('step') === 'wiring')
    const onWiring = await cards.allTextContents()
    expect(onWiring.length).toBeGreaterThan(0)
    expect(onWiring.length).toBeLessThan(before)
    expect(onWiring.every(t => t.includes('Wiring'))).toBe(true)
    expect(onWiring.some(t => t.includes(rig.serial))).toBe(true)
    // A reload (or the link shared) shows the same filter.
    await gotoReady(board, new URL(board.url()).pathname + new URL(board.url()).search)
    expect(await board.locator('#board-step').inputValue()).toBe('wiring')
    expect(await cards.allTextContents()).toHaveLength(onWiring.length)
    await board.locator('#board-step').selectOption('')
    await board.waitForURL(u => !u.searchParams.has('step'))
    expect(await cards.count()).toBe(before)

    // Printed, the board is a table on one landscape page, without the controls.
    await board.emulateMedia({ media: 'print' })
    expect(await board.locator('table.board-print').isVisible()).toBe(true)
    expect(await board.getByRole('search').isVisible()).toBe(false)
    const pdf = (await board.pdf({ preferCSSPageSize: true })).toString('latin1')
    expect(pdf.match(/\/Type\s*\/Page(?!s)/g)?.length).toBe(1)
    await board.emulateMedia({ media: 'screen' })

    await board.setViewportSize(projector)
    await board.getByRole('button', { name: 'Projector view' }).click()
    await board.getByTestId('join-codes').waitFor({ state: 'detached' })
    const columns = await board.evaluate(() => {
      const list = document.querySelector('.board-cards')!
      return getComputedStyle(list).gridTemplateColumns.split(' ').length
    })
    expect(columns).toBeGreaterThanOrEqual(4)
    expect(await scrollsSideways(board)).toBe(false)
    await shot(board, 'board-projector')

    // A rig with several sheets: two of them ticked draw their predicted responses together.
    const views = await Promise.all(
      reply.rigs.map(async r =>
        (await (await board.request.get(url(`/api/rigs/${r.id}`))).json()) as RigView),
    )
    const tuned = views.find(v => v.sheets.length >= 2)!
    await board.setViewportSize(desktop)
    await gotoReady(board, `/rigs/${tuned.id}`)
    const sheets = board.getByTestId('rig-sheet')
    await sheets.first().getByRole('checkbox').check()
    expect(await board.getByTestId('sheet-overlay').count()).toBe(0)
    await sheets.nth(1).getByRole('checkbox').check()
    await board.getByTestId('sheet-overlay').getByTestId('response-plot').locator('canvas')
      .first()
      .waitFor()
    expect(await accessibilityViolations(board)).toEqual([])
    await shot(board, 'rig-overlay-desktop')
    await Promise.all([teacherCtx.close(), studentCtx.close()])
  })
})
