// The Gain Planner for the bench (issue 12): P only draws its swing, an out-of-range loop rate is
// refused and never restored, typing while the worker computes, the firmware format toggle and
// the bring-up, the stability map from the keyboard, the summary bar out of the way while
// editing on a phone, and the new panels. Screenshots at phone and desktop sizes go to
// tests/.artifacts/planner-bench/ for a person to look at.
import { describe, expect, it } from 'vitest'
import { artifacts, gotoReady, launchForFile } from '../helpers/browser'
import { DEFAULT_TARGETS, KIT_PRESETS, planGains } from '../../shared/utils/planner'
import { simulatedLog } from '../unit/planner/runs'

const browser = await launchForFile()
const { shot } = artifacts('planner-bench')

describe('Gain Planner on the bench', () => {
  it('draws the swing P only predicts, with its verdict', async () => {
    const page = await browser.newPage({ viewport: { width: 1280, height: 800 } })
    await gotoReady(page, '/planner')
    await page.getByTestId('kp').waitFor()
    await page.getByLabel('Controller').selectOption('P')
    const verdict = page.getByTestId('planner-verdict')
    await verdict.getByText('P only cannot hold the ball').waitFor()
    // The swing's words: its period, and that it grows (doubling) or never dies.
    expect(await page.getByTestId('p-only-swing').textContent()).toMatch(
      /once every [\d.]+ s and\s+(the swing doubles every [\d.]+ s|the swing never dies)/,
    )
    // The plot is drawn with P only's run as its series.
    await expect
      .poll(() => page.getByTestId('response-plot').textContent())
      .toContain('P only')
    expect(await page.getByTestId('p-only-verdict').textContent()).toMatch(/never settles/)
    // No suggestion to offer: the radio names the P gain, and checking one's own starts from it
    // (the method's Kp = ω_n²/K_b, three significant figures on the field).
    await page.getByLabel('Use the planner’s P gain').waitFor()
    await page.getByLabel('Check my own gains').check()
    const pGain = planGains(KIT_PRESETS[0]!.rig, { ...DEFAULT_TARGETS, form: 'P' }).proportional!
    await expect
      .poll(async () => Number(await page.locator('#own-kp').inputValue()))
      .toBeCloseTo(pGain.kp, 2)
    expect(await page.getByTestId('planner-failure').count()).toBe(0)
    await shot(page, 'p-only-desktop')
    await page.close()
  })

  it('refuses a 5000 Hz loop rate with the range and does not restore it after a reload',
    async () => {
      const page = await browser.newPage({ viewport: { width: 1280, height: 800 } })
      await gotoReady(page, '/planner')
      await page.getByTestId('kp').waitFor()
      const rate = page.getByLabel('Loop rate (Hz)')
      await rate.fill('5000')
      await page.locator('#loopRateHz-error').waitFor()
      expect(await page.locator('#loopRateHz-error').textContent()).toMatch(
        /Loop rate must be at most 1000 Hz/,
      )
      await page.reload()
      await page.waitForFunction(
        () => !!(document.querySelector('#__nuxt') as unknown as { __vue_app__?: unknown })
          ?.__vue_app__,
      )
      const notice = page.getByTestId('draft-refused')
      await notice.waitFor()
      expect(await notice.textContent()).toMatch(/not restored[\s\S]*at most 1000 Hz/)
      // The kit's own rate is back, and results with it.
      expect(Number(await rate.inputValue())).toBeLessThanOrEqual(1000)
      await page.getByTestId('kp').waitFor()
      await page.close()
    })

  it('keeps the field responsive while the planner computes, and the results follow',
    async () => {
      const page = await browser.newPage({ viewport: { width: 1280, height: 800 } })
      await gotoReady(page, '/planner')
      const kp = page.getByTestId('kp')
      await kp.waitFor()
      const before = await kp.textContent()
      const horn = page.getByLabel('Servo horn radius (mm)')
      await horn.click()
      await horn.press('Control+A')
      // Typed key by key: each keystroke starts the jobs again while earlier ones still run.
      await horn.pressSequentially('14.5', { delay: 5 })
      expect(await horn.inputValue()).toBe('14.5')
      await expect.poll(() => kp.textContent()).not.toBe(before)
      await expect.poll(() => page.getByTestId('planner-busy').textContent()).toBe('')
      // A shorter horn: a smaller plant gain, so a larger Kp for the same targets.
      expect(parseFloat((await kp.textContent())!)).toBeGreaterThan(parseFloat(before!))
      await page.close()
    })

  it('shows which firmware format is chosen and lists the bring-up in order', async () => {
    const page = await browser.newPage({ viewport: { width: 1280, height: 800 } })
    await gotoReady(page, '/planner')
    const block = page.getByTestId('firmware-block')
    await block.waitFor()
    const c = page.getByTestId('firmware-format-c')
    const json = page.getByTestId('firmware-format-json')
    expect(await c.getAttribute('aria-pressed')).toBe('true')
    expect(await json.getAttribute('aria-pressed')).toBe('false')
    expect(await block.textContent()).toContain('#define TW_KP')
    await json.click()
    expect(await json.getAttribute('aria-pressed')).toBe('true')
    expect(await c.getAttribute('aria-pressed')).toBe('false')
    expect((await block.textContent())!.trim().startsWith('{')).toBe(true)
    // The lines wrap inside the panel: nothing scrolls sideways.
    expect(await block.evaluate(el => el.scrollWidth <= el.clientWidth)).toBe(true)
    const steps = page.getByTestId('bring-up').first().locator('li')
    expect(await steps.evaluateAll(els => els.map(e => e.getAttribute('data-step')))).toEqual([
      'neutral',
      'direction',
      'p-only',
      'suggested',
    ])
    // The steps come with their cautions where hands go near the linkage.
    const list = page.locator('section', { has: page.locator('#firmware-heading') })
      .getByTestId('bring-up')
    expect(await list.locator('[data-step="neutral"]').textContent()).toMatch(/Caution:/)
    expect(await list.textContent()).toMatch(/TW_SERVO_TRIM_US/)
    // On paper: only the sheet, with the rig, the constants and the same steps.
    const sheet = page.getByTestId('print-sheet')
    expect(await sheet.isVisible()).toBe(false)
    await page.emulateMedia({ media: 'print' })
    expect(await sheet.isVisible()).toBe(true)
    expect(await page.getByTestId('planner-verdict').isVisible()).toBe(false)
    const paper = (await sheet.textContent())!
    expect(paper).toMatch(/Beam length\s*400 mm/)
    expect(paper).toContain('#define TW_KP')
    expect(await sheet.getByTestId('bring-up').locator('li').count()).toBe(4)
    await page.close()
  })

  it('moves a cursor over the stability map with the keys and tries it with Enter', async () => {
    const page = await browser.newPage({ viewport: { width: 1280, height: 800 } })
    await gotoReady(page, '/planner')
    const map = page.getByTestId('stability-map')
    await map.waitFor()
    await map.focus()
    const readout = page.getByTestId('stability-map-readout')
    await map.press('ArrowRight')
    await expect.poll(() => readout.textContent()).toMatch(/Kp [\d.]+ rad\/m, Kd [\d.]+/)
    const first = await readout.textContent()
    await map.press('Shift+ArrowUp')
    await expect.poll(() => readout.textContent()).not.toBe(first)
    const words = (await readout.textContent())!
    expect(words).toMatch(/unstable|stable, (thin|comfortable) margins/)
    const [, kp, kd] = words.match(/Kp ([\d.]+) rad\/m, Kd ([\d.]+)/)!
    await map.press('Enter')
    expect(await page.getByLabel('Check my own gains').isChecked()).toBe(true)
    expect(Number(await page.getByLabel('Kp (rad/m)').inputValue())).toBeCloseTo(Number(kp), 2)
    expect(Number(await page.getByLabel('Kd (rad·s/m)').inputValue())).toBeCloseTo(Number(kd), 2)
    await page.close()
  })

  it('hides the summary bar on a phone while a field is being edited', async () => {
    const page = await browser.newPage({ viewport: { width: 390, height: 844 } })
    await gotoReady(page, '/planner')
    await page.getByTestId('kp').waitFor()
    const summary = page.getByTestId('planner-summary')
    await summary.waitFor()
    await shot(page, 'phone')
    await page.getByLabel('Ball diameter (mm)').focus()
    await expect.poll(() => summary.isVisible()).toBe(false)
    await page.getByLabel('Ball diameter (mm)').blur()
    await expect.poll(() => summary.isVisible()).toBe(true)
    await page.close()
  })

  it('renders the new inputs and panels: details, envelope, loop view, jitter, glossary',
    async () => {
      for (const [name, viewport] of [
        ['desktop', { width: 1280, height: 800 }],
        ['phone', { width: 390, height: 844 }],
      ] as const) {
        const page = await browser.newPage({ viewport })
        await gotoReady(page, '/planner')
        await page.getByTestId('kp').waitFor()
        const details = page.getByTestId('servo-sensor-details')
        await details.getByLabel('Sensor noise (counts)').fill('3')
        await page.getByTestId('toggle-envelope').check()
        await page.getByTestId('planner-glossary').getByText('Extra delay tolerated').waitFor()
        await page.getByTestId('what-if-envelope').waitFor()
        await page.getByTestId('loop-view').waitFor()
        // The jitter panel follows the noise typed in the details.
        await expect.poll(() => page.getByTestId('servo-jitter').textContent()).toMatch(
          /3 counts of noise/,
        )
        await page.getByTestId('measured-run').waitFor()
        await expect.poll(() => page.getByTestId('planner-busy').textContent()).toBe('')
        expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(
          viewport.width,
        )
        await shot(page, `panels-${name}`)
        await page.close()
      }
    })

  it('starts a motor on the pivot at a gear reduction of 1, not an error', async () => {
    const page = await browser.newPage({ viewport: { width: 1280, height: 800 } })
    await gotoReady(page, '/planner')
    await page.getByTestId('kp').waitFor()
    await page.getByLabel('Drive').selectOption('direct')
    const gear = page.getByLabel('Gear reduction (: 1)')
    await expect.poll(() => gear.inputValue()).toBe('1')
    expect(await page.locator('#gearRatio-error').count()).toBe(0)
    await page.close()
  })

  it('fits a measured run and puts the corrected servo speed in the form', async () => {
    // A run logged on a kit rig whose servo is slower than its data sheet says (0.24 s per 60°
    // where the form has 0.16), with the kit's suggested gains.
    const kit = KIT_PRESETS[0]!.rig
    const gains = planGains(kit, DEFAULT_TARGETS).gains!
    const log = simulatedLog({ ...kit, servoSecondsPer60: 0.24 }, gains, { noiseCounts: 1 })
    const page = await browser.newPage({ viewport: { width: 1280, height: 800 } })
    await gotoReady(page, '/planner')
    await page.getByTestId('kp').waitFor()
    await page.getByTestId('measured-run-file').setInputFiles({
      name: 'run.csv',
      mimeType: 'text/csv',
      buffer: Buffer.from(log),
    })
    await page.getByTestId('measured-run-fit').waitFor()
    await page.getByRole('button', { name: 'Use these values' }).click()
    const speed = page.getByLabel('Servo speed (s per 60°)')
    await expect.poll(async () => Number(await speed.inputValue())).toBeGreaterThan(0.2)
    expect(Number(await speed.inputValue())).toBeLessThan(0.28)
    await shot(page, 'measured-run-desktop')
    await page.close()
  })
})
