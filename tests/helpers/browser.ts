// Debian's Chromium driven by playwright-core, plus an axe-core accessibility check.
import { mkdirSync, readFileSync } from 'node:fs'
import { createRequire } from 'node:module'
import { resolve } from 'node:path'
import { chromium, type Browser, type Page } from 'playwright-core'
import { afterAll, inject } from 'vitest'

const axeSource = readFileSync(
  createRequire(import.meta.url).resolve('axe-core/axe.min.js'),
  'utf8',
)

// playwright gives every launch a fresh, empty profile of its own.
export async function launch(): Promise<Browser> {
  return chromium.launch({
    executablePath: inject('chromium'),
    args: [
      '--headless',
      '--no-sandbox',
      '--disable-gpu',
      '--disable-quic',
      '--no-first-run',
      '--disable-background-networking',
      '--disable-component-update',
      '--disable-sync',
    ],
  })
}

export const url = (path: string) => new URL(path, inject('baseUrl')).toString()

export interface AxeViolation {
  id: string
  impact: string | null
  help: string
  nodes: { target: string[] }[]
}

/** Serious and critical WCAG 2 A/AA violations on the page as it stands. */
export async function accessibilityViolations(page: Page): Promise<AxeViolation[]> {
  await page.addScriptTag({ content: axeSource })
  const result = await page.evaluate(async () => {
    // @ts-expect-error axe is injected above
    const r = await window.axe.run(document, {
      runOnly: { type: 'tag', values: ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa'] },
    })
    return r.violations.map((v: any) => ({
      id: v.id,
      impact: v.impact,
      help: v.help,
      nodes: v.nodes.map((n: any) => ({ target: n.target })),
    }))
  })
  return (result as AxeViolation[]).filter(v => v.impact === 'serious' || v.impact === 'critical')
}

/** Go to a page and wait until Vue has hydrated it: a click before that would submit the
 *  server-rendered form natively instead of through the page's own handler. */
export async function gotoReady(page: Page, path: string) {
  const reply = await page.goto(url(path))
  await page.waitForFunction(
    () =>
      !!(document.querySelector('#__nuxt') as unknown as { __vue_app__?: unknown } | null)
        ?.__vue_app__,
  )
  return reply
}

export async function signInThroughPage(page: Page, email: string, password = 'tiltwright-demo') {
  await gotoReady(page, '/login')
  await page.getByLabel('E-mail').fill(email)
  await page.getByLabel('Password').fill(password)
  await page.getByRole('button', { name: 'Sign in' }).click()
  await page.waitForURL(u => !u.pathname.startsWith('/login'))
}

/** Chromium for one test file: launched as the file starts, closed after its last test. */
export async function launchForFile(): Promise<Browser> {
  const browser = await launch()
  afterAll(async () => {
    await browser.close()
  })
  return browser
}

/** A test file's folder under tests/.artifacts/, and a whole-page screenshot into it, for a
 *  person to look at. */
export function artifacts(folder: string) {
  const dir = resolve(import.meta.dirname, '../.artifacts', folder)
  mkdirSync(dir, { recursive: true })
  const shot = (page: Page, name: string) =>
    page.screenshot({ path: resolve(dir, `${name}.png`), fullPage: true })
  return { dir, shot }
}
