// The bench panels in the browser, on a desk and on a phone: a logged run picked as a CSV file
// (a bad one names its rows, a good one is drawn over the prediction and fitted, and "Use these
// values" puts the fitted servo speed into the form), the loop view read from the keyboard, and
// the support staff seeing a sheet's measured run and fit on a ticket. Screenshots go to
// tests/.artifacts/bench-panels/ for a person to look at.
import { describe, expect, it } from 'vitest'
import { resolve } from 'node:path'
import type { Locator, Page } from 'playwright-core'
import type { BuildSpaceSummary } from '../../shared/types/build'
import { storedRun } from '../../shared/utils/measured-runs'
import { fitRun, parseRunCsv } from '../../shared/utils/planner/measured-run'
import { planGains } from '../../shared/utils/planner/plan'
import { DEFAULT_TARGETS, KIT_PRESETS } from '../../shared/utils/planner/presets'
import {
  accessibilityViolations,
  artifacts,
  gotoReady,
  launchForFile,
  signInThroughPage,
} from '../helpers/browser'
import { signedIn } from '../helpers/shop'
import { openTicket } from '../helpers/tickets'
import { simulatedLog } from '../unit/planner/runs'

const browser = await launchForFile()
const { dir, shot } = artifacts('bench-panels')
/** The panel alone, beside the whole page, so a person can look at it closely. */
const part = (locator: Locator, name: string) =>
  locator.screenshot({ path: resolve(dir, `${name}.png`) })
const desktop = { width: 1280, height: 800 }
const phone = { width: 390, height: 844 }
const sideways = (page: Page) =>
  page.evaluate(() => document.documentElement.scrollWidth > document.documentElement.clientWidth)

const kit = KIT_PRESETS[0]!.rig
const gains = planGains(kit, DEFAULT_TARGETS).gains!
/** The kit with a servo 40 % slower than the one entered: the fit should find it. */
const slower = { ...kit, servoSecondsPer60: kit.servoSecondsPer60 * 1.4 }
const goodCsv = simulatedLog(slower, gains, { duration: 6, noiseCounts: 1 })
const badCsv = 'time_s,position_counts,command_deg\n0,500,0\n0.02,abc,0.1\n0.04,502\n'

async function pickCsv(page: Page, name: string, text: string) {
  await page.getByTestId('measured-run-file').setInputFiles({
    name,
    mimeType: 'text/csv',
    buffer: Buffer.from(text),
  })
}

describe('the bench panels on the planner', () => {
  for (const [name, viewport] of [['desktop', desktop], ['phone', phone]] as const) {
    it(`compares a logged run and fits it (${name})`, async () => {
      const page = await browser.newPage({ viewport, isMobile: name === 'phone' })
      await gotoReady(page, '/planner')
      await page.getByTestId('kp').waitFor()
      const panel = page.getByTestId('measured-run')
      await panel.waitFor()

      await pickCsv(page, 'bad.csv', badCsv)
      const errors = panel.getByTestId('measured-run-errors')
      await errors.getByText('Line 3: position_counts "abc" is not a number.').waitFor()
      await errors.getByText('Line 4: This row has 2 values; the first row names 3.').waitFor()
      expect(await panel.getByTestId('measured-run-fit').count()).toBe(0)

      await pickCsv(page, 'run.csv', goodCsv)
      const fit = panel.getByTestId('measured-run-fit')
      await fit.waitFor()
      expect(await errors.count()).toBe(0)
      expect(await panel.getByTestId('response-plot').getAttribute('data-measured')).toBe('yes')
      // The fitted servo speed is close to the slower servo that made the run.
      const speedRow = fit.getByRole('row', { name: /Servo speed/ })
      const fitted = Number(/([\d.]+) s per 60°\s*$/.exec((await speedRow.textContent())!)![1])
      expect(fitted / slower.servoSecondsPer60).toBeGreaterThan(0.9)
      expect(fitted / slower.servoSecondsPer60).toBeLessThan(1.1)
      await panel.scrollIntoViewIfNeeded()
      expect(await sideways(page)).toBe(false)
      await shot(page, `measured-run-${name}`)
      await part(panel, `measured-run-panel-${name}`)

      await panel.getByRole('button', { name: 'Use these values' }).click()
      await expect
        .poll(async () => Number(await page.locator('#servoSecondsPer60').inputValue()))
        .toBeGreaterThan(kit.servoSecondsPer60 * 1.2)

      // The loop view from the keyboard: the arrow keys move a cursor that reads the values.
      const view = page.getByTestId('loop-view')
      await view.locator('svg').focus()
      await page.keyboard.press('ArrowRight')
      await expect.poll(() => view.getByTestId('loop-view-readout').textContent())
        .toMatch(/At [\d.]+ Hz: loop gain -?[\d.]+ dB, phase -?[\d.]+°\./)
      await view.getByText(/Sensitivity peak Ms = [\d.]+/).waitFor()
      await view.scrollIntoViewIfNeeded()
      await shot(page, `loop-view-${name}`)
      await part(view, `loop-view-panel-${name}`)
      const envelopeToggle = page.getByTestId('toggle-envelope')
      await envelopeToggle.check()
      const envelope = page.getByTestId('what-if-envelope')
      await envelope.waitFor()
      expect(await envelope.locator('tbody tr').count()).toBe(5)
      await part(envelope, `envelope-panel-${name}`)
      await part(page.getByTestId('response-plot').first(), `response-band-${name}`)
      expect(await accessibilityViolations(page)).toEqual([])
      await page.close()
    })
  }
})

describe('a measured run on a ticket', () => {
  it('shows the staff the run, the fit and the overlay', async () => {
    const builder = await signedIn('builder@tiltwright.test')
    const spaces = (await builder.get('/api/build-spaces')).body as BuildSpaceSummary[]
    const rigId = spaces.flatMap(s => s.myRigs)[0]!.id
    const parsed = parseRunCsv(goodCsv, kit)
    const saved = await builder.post('/api/sheets', {
      title: `Logged run ${Date.now().toString(36)}`,
      rigId,
      inputs: { rig: kit, targets: DEFAULT_TARGETS, gains },
      measured: storedRun(parsed, fitRun(kit, gains, parsed.samples)),
    })
    expect(saved.status).toBe(201)
    const ticketId = await openTicket(builder, { rigId, sheetId: saved.body.id })

    for (const [name, viewport] of [['desktop', desktop], ['phone', phone]] as const) {
      const ctx = await browser.newContext({ viewport, isMobile: name === 'phone' })
      const support = await ctx.newPage()
      await signInThroughPage(support, 'support@tiltwright.test')
      await gotoReady(support, `/tickets/${ticketId}`)
      const sheet = support.getByTestId('ticket-sheet')
      await sheet.getByText('Servo lag').waitFor()
      await sheet.getByText(/ms fitted \(planner: [\d.]+ ms\)/).waitFor()
      const run = sheet.getByTestId('ticket-sheet-run')
      await run.getByText(`Measured run (${parsed.samples.length} rows)`, { exact: false })
        .waitFor()
      await expect.poll(() => run.getByTestId('response-plot').getAttribute('data-measured'))
        .toBe('yes')
      await run.scrollIntoViewIfNeeded()
      expect(await sideways(support)).toBe(false)
      await shot(support, `ticket-run-${name}`)
      await part(sheet, `ticket-sheet-${name}`)
      await ctx.close()
    }
  })
})
