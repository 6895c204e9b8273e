// A rig that will not settle, in the browser: the demo builder on a phone opens a ticket on
// their rig with a photo and a tuning sheet (the upload's progress bar reaches done, the guide
// suggests entries while they type); support at a desk finds it in the help queue, sees the
// sheet and the photo, inserts a stock reply, edits it, sends it, adds an internal note and
// sends a replacement part; the teacher sees the reply and the part (never the note) on the
// ticket and the order page; the builder sees the count in the navigation. Screenshots go to
// tests/.artifacts/tickets/ for a person to look at.
import { describe, expect, it } from 'vitest'
import type { Page } from 'playwright-core'
import type { BuildSpaceSummary } from '../../shared/types/build'
import {
  accessibilityViolations,
  artifacts,
  gotoReady,
  launchForFile,
  signInThroughPage,
  url,
} from '../helpers/browser'
import { validPng } from '../helpers/tickets'

const { shot } = artifacts('tickets')
const browser = await launchForFile()

const desktop = { width: 1280, height: 800 }
const phone = { width: 390, height: 844 }
const scrollsSideways = (page: Page) =>
  page.evaluate(() => document.documentElement.scrollWidth > document.documentElement.clientWidth)

/** The photo of the thread is drawn, at the size it was sent. */
const photoShown = (page: Page, width: number) =>
  page.waitForFunction(
    w => (document.querySelector('[data-testid="attachment-image"]') as HTMLImageElement | null)
      ?.naturalWidth === w,
    width,
  )

describe('a ticket from a phone to the help queue and back', () => {
  it('is opened with a photo and a sheet, answered with a stock reply and a part', async () => {
    const tag = `Q${Date.now().toString(36).toUpperCase()}`
    const subject = `Ball swings past the middle and never settles ${tag}`

    // The builder, on a phone, from their rig's page.
    const builderCtx = await browser.newContext({ viewport: phone, isMobile: true })
    const builder = await builderCtx.newPage()
    await signInThroughPage(builder, 'builder@tiltwright.test')
    const spaces = (await (await builder.request.get(url('/api/build-spaces'))).json()) as
      BuildSpaceSummary[]
    const rigId = spaces.flatMap(s => s.myRigs)[0]!.id
    await gotoReady(builder, `/rigs/${rigId}`)
    const help = builder.getByTestId('rig-help')
    await help.getByRole('heading', { name: 'Help with this rig' }).waitFor()
    await help.scrollIntoViewIfNeeded()
    await shot(builder, '0-builder-rig-phone')
    await help.getByRole('link', { name: 'Ask for help' }).click()
    await builder.waitForURL(u => u.pathname === '/tickets/new')
    await builder.getByRole('heading', { name: 'Ask for help' }).waitFor()
    await builder.waitForFunction(() => !!(document.querySelector('#__nuxt') as unknown as
      { __vue_app__?: unknown }).__vue_app__)

    await builder.getByLabel('What is wrong, in a few words').fill(subject)
    await builder.getByLabel('What does the rig do, and what have you tried?').fill(
      'It oscillates back and forth around the middle and the servo buzzes. '
      + 'I raised Kp and it got worse.',
    )
    const suggestions = builder.getByTestId('guide-suggestions')
    await suggestions.getByRole('heading', { name: 'These may already answer it' }).waitFor()
    expect(await suggestions.getByRole('link').count()).toBeGreaterThan(0)
    expect(await suggestions.getByRole('link').first().getAttribute('target')).toBe('_blank')
    // The suggestions sit under their heading, not spread down a panel as tall as the form.
    const headingBox = await suggestions.getByRole('heading').boundingBox()
    const linkBox = await suggestions.getByRole('link').first().boundingBox()
    expect(linkBox!.y - (headingBox!.y + headingBox!.height)).toBeLessThan(40)
    // A builder has no e-mail address here, so the page promises an answer on the ticket only.
    const intro = await builder.getByRole('heading', { name: 'Ask for help' })
      .locator('xpath=following-sibling::p[1]').textContent()
    expect(intro?.trim()).toMatch(/answers here\.$/)

    const sheetSelect = builder.getByLabel('Tuning sheet (optional)')
    const sheetTitle = (await sheetSelect.locator('option').nth(1).textContent())!.trim()
      .replace(/ \(.*$/, '')
    await sheetSelect.selectOption({ index: 1 })
    await builder.getByLabel('Photos, videos or PDFs (optional)').setInputFiles({
      name: 'rig-side.png',
      mimeType: 'image/png',
      buffer: validPng(240, 160),
    })
    const item = builder.getByTestId('upload')
    await item.getByTestId('upload-state').filter({ hasText: 'Uploaded' }).waitFor()
    expect(await item.locator('progress').getAttribute('value')).toBe('100')
    expect(await item.getByRole('progressbar', { name: 'Uploading rig-side.png' }).count()).toBe(1)
    expect(await scrollsSideways(builder)).toBe(false)
    expect(await accessibilityViolations(builder)).toEqual([])
    await shot(builder, '1-builder-new-ticket-phone')
    await builder.getByRole('button', { name: 'Send to support' }).click()
    await builder.waitForURL(u => /^\/tickets\/\d+$/.test(u.pathname))
    const ticketId = Number(new URL(builder.url()).pathname.split('/').pop())
    await builder.getByText('Your ticket is with Tiltwright support').waitFor()
    await photoShown(builder, 240)
    expect(await builder.getByTestId('ticket-status').first().textContent()).toContain(
      'With Tiltwright support',
    )
    expect(await scrollsSideways(builder)).toBe(false)
    await shot(builder, '2-builder-ticket-phone')

    // Support, at a desk, lands on the help queue and finds it by searching.
    const supportCtx = await browser.newContext({ viewport: desktop })
    const support = await supportCtx.newPage()
    await signInThroughPage(support, 'support@tiltwright.test')
    expect(new URL(support.url()).pathname).toBe('/help-queue')
    await support.getByTestId('queue-counts').getByText(/Needs reply: \d+/).waitFor()
    await support.getByLabel('Search subjects and messages').fill(tag)
    const row = support.getByRole('link', { name: new RegExp(tag) })
    await row.waitFor()
    // The search reaches the server after a pause: the other open tickets then leave the table.
    await expect.poll(() => support.getByTestId('queue-table').locator('tbody tr').count())
      .toBe(1)
    await support.getByText(/^\s*1 in all/).waitFor()
    expect(await accessibilityViolations(support)).toEqual([])
    await shot(support, '3-support-queue-desktop')
    // On a phone the secondary columns fold into the ticket's cell.
    await support.setViewportSize(phone)
    expect(await scrollsSideways(support)).toBe(false)
    await shot(support, '3b-support-queue-phone')
    await support.setViewportSize(desktop)
    await row.click()
    await support.waitForURL(u => u.pathname === `/tickets/${ticketId}`)
    await support.getByRole('navigation', { name: 'Staff' }).waitFor()

    // The sheet inline with its numbers and predicted response, the photo shown.
    const sheet = support.getByTestId('ticket-sheet')
    await sheet.getByText(`Tuning sheet: ${sheetTitle}`).waitFor()
    await sheet.getByText('Phase margin').waitFor()
    await sheet.getByText('Predicted response to a step').waitFor()
    await photoShown(support, 240)
    await support.getByTestId('ticket-context').getByText('Checklist').waitFor()

    // A stock reply inserted, edited, sent.
    const picker = support.getByTestId('stock-picker')
    const stock = picker.getByLabel('Stock reply')
    const saved = stock.locator('optgroup[label="Saved replies"] option')
    expect(await saved.count()).toBeGreaterThan(0)
    await stock.selectOption(await saved.first().getAttribute('value'))
    await picker.getByRole('button', { name: 'Insert into the reply' }).click()
    const box = support.getByLabel('Your reply (the teacher and the builders see it)')
    const inserted = await box.inputValue()
    expect(inserted.length).toBeGreaterThan(20)
    const edited = `Hello Jonah, thanks for the sheet and the photo. ${inserted}\n\nRef ${tag}.`
    await box.fill(edited)
    await support.getByRole('button', { name: 'Send reply' }).click()
    await support.getByText('Reply sent.').waitFor()
    await support.getByTestId('message').filter({ hasText: `Ref ${tag}.` }).waitFor()

    // An internal note, staff only.
    const noteText = `Sheet has Kd far too low; watch the servo ${tag}-note`
    await support.getByRole('textbox', { name: 'Note', exact: true }).fill(noteText)
    await support.getByRole('button', { name: 'Add the note' }).click()
    await support.getByTestId('note').filter({ hasText: noteText }).waitFor()

    // A replacement part sent from the ticket.
    const repl = support.getByTestId('replacement-form')
    const part = repl.getByLabel('Part')
    const firstPart = part.locator('optgroup[label="Parts"] option').first()
    const partName = (await firstPart.textContent())!.trim().replace(/ \(\d+ in stock\)$/, '')
    await part.selectOption((await firstPart.getAttribute('value'))!)
    await repl.getByLabel('How many').fill('1')
    await repl.getByLabel('Carrier').selectOption('usps')
    const tracking = `9400 ${Date.now() % 100000000}`
    await repl.getByLabel('Tracking number').fill(tracking)
    await repl.getByRole('button', { name: 'Send the parts' }).click()
    await repl.getByText(`Sent: 1 × ${partName}`).waitFor()
    await support.getByTestId('ticket-replacements').getByText(tracking).waitFor()
    expect(await scrollsSideways(support)).toBe(false)
    await shot(support, '4-support-ticket-desktop')
    await supportCtx.close()

    // The teacher sees the reply and the part, never the note.
    const teacherCtx = await browser.newContext({ viewport: desktop })
    const teacher = await teacherCtx.newPage()
    await signInThroughPage(teacher, 'teacher@tiltwright.test')
    await gotoReady(teacher, `/tickets/${ticketId}`)
    await teacher.getByTestId('message').filter({ hasText: `Ref ${tag}.` }).waitFor()
    expect(await teacher.getByTestId('ticket-status').first().textContent()).toContain(
      'your turn',
    )
    await teacher.getByTestId('ticket-replacements').getByText(tracking).waitFor()
    const page = (await teacher.locator('main').textContent())!
    expect(page).not.toContain(noteText)
    expect(page).not.toContain('Internal note')
    expect(await teacher.getByTestId('note-form').count()).toBe(0)
    expect(await teacher.getByTestId('stock-picker').count()).toBe(0)
    expect(await teacher.getByTestId('replacement-form').count()).toBe(0)
    await shot(teacher, '5-teacher-ticket-desktop')
    await gotoReady(teacher, '/tickets')
    const listed = teacher.getByRole('row').filter({ hasText: tag })
    await listed.waitFor()
    expect(await listed.textContent()).toContain('Reply from support: your turn')
    await shot(teacher, '5b-teacher-tickets-desktop')
    const order = await (await teacher.request.get(url(`/api/tickets/${ticketId}`))).json() as
      { ticket: { order: { id: number } } }
    await gotoReady(teacher, `/orders/${order.ticket.order.id}`)
    await teacher.getByTestId('replacement-shipment')
      .filter({ hasText: `Replacement parts for ticket T-${ticketId}` })
      .filter({ hasText: partName })
      .waitFor()
    await shot(teacher, '6-teacher-order-desktop')
    await teacherCtx.close()

    // The builder's navigation counts the reply waiting for them.
    await gotoReady(builder, '/rigs')
    await builder.getByRole('button', { name: 'Menu' }).click()
    const count = builder.getByRole('navigation', { name: 'Main' })
      .getByRole('link', { name: /^Tickets/ })
      .getByTestId('ticket-count')
    await count.waitFor()
    expect(Number(await count.evaluate(e => e.firstChild?.textContent))).toBeGreaterThan(0)
    await shot(builder, '7-builder-nav-count-phone')
    await builderCtx.close()
  })
})
