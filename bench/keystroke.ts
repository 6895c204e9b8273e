// Keystroke to updated results in Chromium, on the kit preset: the jobs the planner page runs
// for a keystroke (bench/keystroke-page.ts), bundled with esbuild and run in module workers as
// the page runs them. The keystrokes alternate the beam length between two valid values
// ("400.5" and "400."), so each one re-plans. Returns the median and 95th percentile.
import { fileURLToPath } from 'node:url'
import { build } from 'esbuild'
import { chromium } from 'playwright-core'

const here = (p: string) => fileURLToPath(new URL(p, import.meta.url))

async function bundle(entry: string) {
  const out = await build({
    entryPoints: [entry],
    bundle: true,
    format: 'esm',
    write: false,
    minify: true,
    target: 'es2022',
  })
  return out.outputFiles[0]!.text
}

export async function measureKeystroke(
  options: { runs?: number, warmup?: number } = {},
): Promise<{ medianMs: number, p95Ms: number, samples: number }> {
  const runs = Math.max(30, options.runs ?? 40)
  const warmup = options.warmup ?? 5
  const worker = await bundle(here('../workers/planner.worker.ts'))
  const page = await bundle(here('./keystroke-page.ts'))
  // Served from one made-up origin, as the built app serves its page and worker.
  const files: Record<string, string> = {
    '/': '<!doctype html><html><body><input id="field" type="text">'
      + '<script type="module" src="/page.js"></script></body></html>',
    '/page.js': page,
    '/worker.js': worker,
  }
  const browser = await chromium.launch({
    executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
    args: ['--no-sandbox'],
  })
  try {
    const tab = await browser.newPage()
    await tab.route('http://keystroke.bench/**', (route) => {
      const path = new URL(route.request().url()).pathname
      const body = files[path]
      if (body === undefined) return route.fulfill({ status: 404 })
      return route.fulfill({
        body,
        contentType: path === '/' ? 'text/html' : 'text/javascript',
      })
    })
    await tab.goto('http://keystroke.bench/')
    await tab.waitForFunction(() => 'keystrokeSamples' in window)
    const field = tab.locator('#field')
    await field.click()
    await field.press('End')
    await field.pressSequentially('.5')
    await tab.waitForFunction(
      () => (window as unknown as { keystrokeSamples: number[] }).keystrokeSamples.length >= 2,
    )
    const total = warmup + runs + 2
    for (let i = 2; i < total; i++) {
      await field.press(i % 2 ? '5' : 'Backspace')
      await tab.waitForFunction(
        n => (window as unknown as { keystrokeSamples: number[] }).keystrokeSamples.length >= n,
        i + 1,
      )
    }
    const { samples, errors } = await tab.evaluate(() => {
      const w = window as unknown as { keystrokeSamples: number[], keystrokeErrors: string[] }
      return { samples: w.keystrokeSamples, errors: w.keystrokeErrors }
    })
    if (errors.length) throw new Error(`keystroke page failed: ${errors[0]}`)
    const timed = samples.slice(warmup + 2).sort((a, b) => a - b)
    const at = (q: number) => timed[Math.min(timed.length - 1, Math.floor(q * timed.length))]!
    return { medianMs: at(0.5), p95Ms: at(0.95), samples: timed.length }
  } finally {
    await browser.close()
  }
}

// `npx tsx bench/keystroke.ts` prints the figures on its own.
if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  const r = await measureKeystroke()
  console.log(
    `keystroke → results (kit preset, Chromium, ${r.samples} runs): `
    + `median ${r.medianMs.toFixed(1)} ms, p95 ${r.p95Ms.toFixed(1)} ms`,
  )
}
