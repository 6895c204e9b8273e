// The Gain Planner as a builder uses it: change a measurement, see the suggestion and the
// plots change at once; phone-sized without sideways scrolling; no serious a11y findings;
// planning for a rig of the demo build space (?rig=) and getting the draft back.
import { describe, expect, it } from 'vitest'
import {
  accessibilityViolations,
  gotoReady,
  launchForFile,
  signInThroughPage,
  url,
} from '../helpers/browser'
import { sql } from '../helpers/db'

const browser = await launchForFile()

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

  it('plans for a rig of the demo build space, saves to it, and gives the draft back', async () => {
    const rigs = await sql<{ id: number, serial: string }>(
      'SELECT id, serial FROM rigs ORDER BY id',
    )
    // The demo build space (scripts/demo-build.ts): 02 is tuning with two sheets, 05 is fresh.
    const tuning = rigs.find(r => r.serial.endsWith('-02'))!
    const fresh = rigs.find(r => r.serial.endsWith('-05'))!
    const page = await browser.newPage({ viewport: { width: 1366, height: 900 } })
    await signInThroughPage(page, 'builder@tiltwright.test')
    await gotoReady(page, '/planner')
    const beam = page.getByLabel('Beam length (mm)')
    await beam.fill('455')

    await gotoReady(page, `/planner?rig=${tuning.id}`)
    const band = page.getByTestId('planner-rig-band')
    await band.getByText(`Planning for rig ${tuning.serial} · Bench 1`).waitFor()
    expect(await band.getByRole('link', { name: 'Back to the rig page' }).getAttribute('href'))
      .toBe(`/rigs/${tuning.id}`)
    // The kit's classroom rig, from the rig's saved dimensions; the newest sheet's gains.
    await expect.poll(() => beam.inputValue()).toBe('400')
    expect(await page.getByLabel('Check my own gains').isChecked()).toBe(true)
    await page.getByLabel('Overlay a sheet').selectOption({ label: 'Bench 1 right, first try' })
    await expect
      .poll(() => page.getByTestId('response-plot').textContent())
      .toContain('sheet: Bench 1 right, first try')
    expect(await accessibilityViolations(page)).toEqual([])

    // The fresh rig has no measurements: the draft's stay, and can be saved to it.
    await gotoReady(page, `/planner?rig=${fresh.id}`)
    await band.getByText('This rig has no measurements saved yet').waitFor()
    expect(await beam.inputValue()).toBe('455')
    await page.getByRole('button', { name: 'Save measurements to this rig' }).click()
    await band.getByText('Saved to the rig').waitFor()
    const [dims] = await sql<{ beam: number }>(
      'SELECT JSON_VALUE(dimensions, \'$.beamLength\') AS beam FROM rigs WHERE id = ?',
      [fresh.id],
    )
    expect(Number(dims!.beam)).toBeCloseTo(0.455, 6)

    await page.getByRole('button', { name: 'Save calibration to this rig' }).click()
    await page.locator('#calibration-heading').locator('..').getByText('Saved to the rig').waitFor()

    await page.getByLabel('Title').fill('Bench 3, first sheet')
    await page.getByLabel('How did the real rig behave? (optional)').selectOption('slow')
    await page.getByLabel('Measured settling time (optional) (s)').fill('6.5')
    await page.getByRole('button', { name: 'Save sheet' }).click()
    await page.getByRole('link', { name: 'See it on the rig page' }).waitFor()
    const [sheet] = await sql<{ verdict: string, settling: number }>(
      'SELECT verdict, JSON_VALUE(measured, \'$.settlingTime\') AS settling FROM tuning_sheets '
      + 'WHERE rig_id = ? AND title = ?',
      [fresh.id, 'Bench 3, first sheet'],
    )
    expect(sheet).toMatchObject({ verdict: 'slow' })
    expect(Number(sheet!.settling)).toBe(6.5)

    // Leaving ?rig= gives the ordinary draft back; a rig that cannot be read leaves it too.
    await beam.fill('430')
    await gotoReady(page, '/planner')
    await expect.poll(() => beam.inputValue()).toBe('455')
    expect(await page.getByTestId('planner-rig-band').count()).toBe(0)
    await gotoReady(page, '/planner?rig=999999')
    await page.getByText('That rig was not found').waitFor()
    expect(await beam.inputValue()).toBe('455')
    await page.close()
    // The fresh demo rig is fresh again for the tests after this one.
    await sql('DELETE FROM tuning_sheets WHERE rig_id = ?', [fresh.id])
    await sql(
      'UPDATE rigs SET dimensions = NULL, dimensions_updated_at = NULL, calibration = NULL, '
      + 'calibrated_at = NULL, last_activity_at = NULL WHERE id = ?',
      [fresh.id],
    )
  })
})
