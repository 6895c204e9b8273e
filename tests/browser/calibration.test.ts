// The planner's rail calibration panel (docs/planner-model.md §6): a value that is not a number
// is an error on its row; residuals as a ruler reads them; a share of the ADC range over 1 is
// explained, not capped; a track that reads backwards turns the plan's reading round and says so.
import { describe, expect, it } from 'vitest'
import { accessibilityViolations, artifacts, gotoReady, launchForFile } from '../helpers/browser'

const browser = await launchForFile()
const { dir, shot } = artifacts('calibration')

describe('rail calibration panel', () => {
  it('marks a row that is not a number, rounds residuals to half a millimetre, and explains '
    + 'a share over 1', async () => {
    const page = await browser.newPage({ viewport: { width: 1366, height: 900 } })
    await gotoReady(page, '/planner')
    const panel = page.locator('section[aria-labelledby="calibration-heading"]')
    await panel.getByTestId('calibration-fit').waitFor()

    const reading2 = panel.getByLabel('ADC reading 2')
    await reading2.fill('31O')
    const error = panel.locator('#calibration-row-1-error')
    await error.waitFor()
    expect(await error.textContent()).toMatch(/Row 2: the ADC reading “31O” is not a number/)
    expect(await reading2.getAttribute('aria-invalid')).toBe('true')
    expect(await reading2.inputValue()).toBe('31O') // kept as typed
    expect(await panel.getByTestId('calibration-residual-1').textContent()).toMatch(/—/)
    await reading2.fill('310')
    await error.waitFor({ state: 'detached' })

    for (let i = 0; i < 5; i++) {
      const text = (await panel.getByTestId(`calibration-residual-${i}`).textContent())!.trim()
      expect(Math.abs(Number(text) * 2 - Math.round(Number(text) * 2)), text).toBe(0)
    }

    // 5 mm between readings 200 counts apart over a 400 mm rail: far more counts per mm than a
    // 10-bit ADC can spread over the rail.
    const positions = ['40', '45', '50', '55', '60']
    for (const [i, mm] of positions.entries())
      await panel.getByLabel(`Position ${i + 1} in mm`).fill(mm)
    const problem = panel.getByTestId('calibration-span-problem')
    await problem.waitFor()
    expect(await problem.textContent()).toMatch(/times the ADC's whole range/)
    expect(await panel.getByRole('button', { name: 'Use it in the plan' }).count()).toBe(0)
    expect(await accessibilityViolations(page)).toEqual([])
    await page.close()
  })

  it('turns the plan\'s reading round for a track that reads backwards, on a phone', async () => {
    const page = await browser.newPage({ viewport: { width: 390, height: 844 } })
    await gotoReady(page, '/planner')
    const panel = page.locator('section[aria-labelledby="calibration-heading"]')
    await panel.getByTestId('calibration-fit').waitFor()
    const readings = ['921', '716', '512', '310', '102']
    for (const [i, r] of readings.entries())
      await panel.getByLabel(`ADC reading ${i + 1}`).fill(r)
    await expect
      .poll(() => panel.getByTestId('calibration-applied').textContent())
      .toMatch(/plan now flips the reading \(TW_READING_SIGN −1/)
    expect(await panel.textContent()).toMatch(/The track reads backwards/)
    await panel.getByRole('button', { name: 'Use it in the plan' }).click()
    await expect
      .poll(() => panel.getByTestId('calibration-applied').textContent())
      .toMatch(/carry TW_READING_SIGN −1/)
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(390)
    await panel.scrollIntoViewIfNeeded()
    await panel.screenshot({ path: `${dir}/calibration-phone.png` })
    await shot(page, 'planner-phone-backwards')
    await page.close()
  })
})
