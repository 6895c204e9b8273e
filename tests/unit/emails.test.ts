// The e-mail renderer and every mail Tiltwright sends: the header, the greeting by name, the
// order's items, the lifetimes and terms read from their constants, and colours only from the
// palette.
import { readdirSync, readFileSync } from 'node:fs'
import { join } from 'node:path'
import { describe, expect, it } from 'vitest'
import * as account from '../../server/emails/account'
import { buildSpaceReadyMail } from '../../server/emails/build'
import { MAIL_BRAND, renderMail, type RenderedMail } from '../../server/emails/layout'
import * as shop from '../../server/emails/shop'
import { staffInvitationMail } from '../../server/emails/staff'
import * as tickets from '../../server/emails/tickets'
import { hoursInWords, LINK_LIFETIME_HOURS } from '../../shared/utils/lifetimes'
import { palette } from '../../shared/utils/palette'
import { INVOICE_NET_DAYS } from '../../shared/utils/pricing'

const lines = [
  { name: 'Classroom Rig Kit', quantity: 12, lineTotalCents: 29_400 },
  { name: 'Spare steel balls <19 mm>', quantity: 3, lineTotalCents: 450 },
]
const url = 'https://shop.example/orders/7'
const order = { number: 'TW-2026-0007', totalCents: 29_850, lines }
const po = { ...order, poNumber: 'PO-55' }
const invoice = { ...po, invoiceNumber: 'INV-9', dueAt: 'Jan 1, 2027' }
const name = 'Dana Ferrow'

/** Every order or quote mail, rendered for Dana (or for accounts payable where no name). */
const orderMails: Record<string, RenderedMail> = {
  quoteIssued: shop.quoteIssuedMail(name, { ...order, validUntil: 'Jan 1, 2027' }, url),
  orderPlaced: shop.orderPlacedMail(name, { ...order, method: 'purchase-order' }, url),
  poReview: shop.poReviewMail(name, { ...po, schoolName: 'Wrenfield Middle School' }, url),
  poApproved: shop.poApprovedMail(name, { ...po, exemptionAccepted: true }, url),
  poRejected: shop.poRejectedMail(name, { ...po, reason: 'Unsigned.' }, url, {
    label: 'Send a corrected purchase order',
    url: `${url}/again`,
  }),
  invoiceIssued: shop.invoiceIssuedMail(invoice, 'https://pay.example/i/9', name),
  paymentReceived: shop.paymentReceivedMail(name, order, url),
  shipped: shop.shippedMail(name, { ...order, carrier: 'UPS', tracking: '1Z 999' }, url),
  orderCancelled: shop.orderCancelledMail(name, { ...order, reason: 'Ordered twice.' }, url),
  invoiceVoided: shop.invoiceVoidedMail({ ...invoice, reason: 'Ordered twice.' }, name),
  paymentRefunded: shop.paymentRefundedMail(
    name,
    { ...order, amountCents: 29_850, status: 'cancelled' },
    url,
  ),
}

const accountMails: Record<string, RenderedMail> = {
  verification: account.verificationMail(name, url),
  passwordReset: account.passwordResetMail(name, url),
  passwordChanged: account.passwordChangedMail(name),
  accountExists: account.accountExistsMail(name, url, url),
  staffInvitation: staffInvitationMail(name, 'Marcus Teel', 'support', url),
}

const buildMails: Record<string, RenderedMail> = {
  buildSpaceReady: buildSpaceReadyMail(
    name,
    { number: 'TW-10007', rigs: 12 },
    'https://shop.example/orders/7/build',
  ),
}

const ticket = {
  ref: 'T-12',
  subject: 'The ball will not settle',
  schoolName: 'Wrenfield Middle School',
  about: 'rig TW-10007-03 of order TW-10007',
}
const ticketUrl = 'https://shop.example/tickets/12'
const ticketMails: Record<string, RenderedMail> = {
  customerMessage: tickets.customerMessageMail(
    name,
    ticket,
    { name: 'Ada R.', role: 'Builder' },
    'It still rolls off.',
    ticketUrl,
  ),
  staffReply: tickets.staffReplyMail(name, ticket, 'Ruth', 'Level the beam.', false, ticketUrl),
  replacementShipped: tickets.replacementShippedMail(
    name,
    { ...ticket, orderNumber: 'TW-10007' },
    [{ name: 'Servo horn', quantity: 2 }],
    { name: 'UPS', tracking: '1Z 999', url: 'https://www.ups.com/track?tracknum=1Z999' },
    ticketUrl,
  ),
}

const allMails = { ...orderMails, ...accountMails, ...buildMails, ...ticketMails }

describe('every e-mail', () => {
  it('covers every mail the shop module exports', () => {
    const renderers = Object.entries(shop).filter(([, v]) => typeof v === 'function')
    expect(renderers.map(([k]) => k.replace(/Mail$/, '')).sort())
      .toEqual(Object.keys(orderMails).sort())
  })

  it.each(Object.entries(allMails))('%s carries the Tiltwright header', (_, mail) => {
    expect(mail.text.split('\n')[0]).toContain(MAIL_BRAND)
    // The header block comes before the greeting in the HTML body.
    const header = mail.html.indexOf(`>${MAIL_BRAND}</span>`)
    expect(header).toBeGreaterThan(mail.html.indexOf('<body'))
    expect(header).toBeLessThan(mail.html.indexOf('Hello '))
  })

  it.each(Object.entries(allMails))('%s greets the person by name', (_, mail) => {
    expect(mail.text).toContain(`\nHello ${name},\n`)
    expect(mail.html).toContain(`<p>Hello ${name},</p>`)
  })

  it.each(Object.entries(orderMails))('%s lists the items with quantity and total', (_, mail) => {
    expect(mail.text).toContain('- Classroom Rig Kit × 12: $294.00')
    expect(mail.text).toContain('- Spare steel balls <19 mm> × 3: $4.50')
    const row = /<td[^>]*>Classroom Rig Kit<\/td><td[^>]*>12<\/td><td[^>]*>\$294\.00</
    expect(mail.html).toMatch(row)
    expect(mail.html).toContain('Spare steel balls &lt;19 mm&gt;')
    expect(mail.html).not.toContain('<19 mm>')
  })

  it.each(Object.entries(allMails))('%s uses colours from the palette only', (_, mail) => {
    const ours = new Set(
      Object.values(palette).flatMap(shades => Object.values(shades).map(c => c.toLowerCase())),
    )
    const used = mail.html.match(/#[0-9a-f]{3,8}\b/gi) ?? []
    expect(used.length).toBeGreaterThan(0)
    for (const c of used) expect(ours).toContain(c.toLowerCase())
    expect(mail.html).not.toMatch(/rgba?\(|hsla?\(/)
  })
})

describe('the build space mail', () => {
  const mail = buildMails.buildSpaceReady!

  it('names the order, counts the rigs and links to the progress board', () => {
    expect(mail.subject).toBe('The build space of order TW-10007 is ready')
    expect(mail.text).toContain('12 rigs are ready for your class')
    expect(mail.text).toContain('Open the progress board: https://shop.example/orders/7/build')
    expect(mail.html).toContain('href="https://shop.example/orders/7/build"')
  })

  it('says one rig in the singular', () => {
    const one = buildSpaceReadyMail(name, { number: 'TW-10008', rigs: 1 }, url)
    expect(one.text).toContain('1 rig is ready')
  })

  it('reminds the teacher that students join with a code and need no e-mail address', () => {
    expect(mail.text).toMatch(/join with the code[^.]*need no e-mail\s+address/)
  })
})

describe('the ticket mails', () => {
  it('name the ticket ref in the subject and link to the ticket', () => {
    for (const mail of Object.values(ticketMails)) {
      expect(mail.subject).toMatch(/^T-12: /)
      expect(mail.text).toContain(ticketUrl)
    }
  })

  it('greet support by role when a new ticket arrives, quoting the first message', () => {
    const mail = tickets.ticketOpenedMail(
      ticket,
      { name: 'Ada R.', role: 'Builder' },
      'It rolls off.',
      ticketUrl,
    )
    expect(mail.text).toContain('\nHello Tiltwright support,\n')
    expect(mail.text).toContain('It rolls off.')
    expect(mail.subject).toBe('T-12: new ticket — The ball will not settle')
  })

  it('quote the staff reply and list replacement parts with their tracking', () => {
    expect(ticketMails.staffReply!.text).toContain('Level the beam.')
    const shipped = ticketMails.replacementShipped!.text
    expect(shipped).toContain('Servo horn × 2')
    expect(shipped).toContain('UPS, tracking 1Z 999')
    expect(shipped).toContain('Track the parcel: https://www.ups.com/track?tracknum=1Z999')
  })
})

describe('accounts payable', () => {
  it('is greeted as such when no name is known', () => {
    const mail = shop.invoiceIssuedMail(invoice, null)
    expect(mail.text).toContain('\nHello accounts payable,\n')
    expect(mail.text).toContain('Classroom Rig Kit × 12')
  })
})

describe('numbers come from their constants', () => {
  it('says each link lifetime in words', () => {
    expect(hoursInWords(1)).toBe('1 hour')
    expect(hoursInWords(48)).toBe('48 hours')
    expect(hoursInWords(72)).toBe('3 days')
    const reset = `expires in ${hoursInWords(LINK_LIFETIME_HOURS.reset)}.`
    expect(accountMails.passwordReset!.text).toContain(reset)
    const confirm = `expires in ${hoursInWords(LINK_LIFETIME_HOURS.confirmation)}.`
    expect(accountMails.verification!.text).toContain(confirm)
    const invite = `expires in ${hoursInWords(LINK_LIFETIME_HOURS.invitation)}.`
    expect(accountMails.staffInvitation!.text).toContain(invite)
  })

  it('states the net terms of INVOICE_NET_DAYS', () => {
    expect(orderMails.invoiceIssued!.text).toContain(`(net ${INVOICE_NET_DAYS})`)
    expect(orderMails.quoteIssued!.text).toContain(`net ${INVOICE_NET_DAYS} terms`)
    for (const mail of Object.values(allMails)) expect(mail.text).not.toMatch(/net-\d/)
  })
})

describe('renderMail', () => {
  it('escapes what it is given in the HTML and keeps the text part plain', () => {
    const mail = renderMail('Subject', 'Ann <b>', [
      { paragraph: 'a & b' },
      { link: { label: 'Go "now"', url: 'https://x.example/?a=1&b=2' } },
      { items: [] },
    ])
    expect(mail.html).toContain('<p>Hello Ann &lt;b&gt;,</p>')
    expect(mail.html).toContain('<p>a &amp; b</p>')
    expect(mail.html).toContain('href="https://x.example/?a=1&amp;b=2"')
    expect(mail.html).not.toContain('<table')
    expect(mail.text).toContain('Go "now": https://x.example/?a=1&b=2')
    expect(mail.text).not.toContain('Items:')
  })
})

describe('colour literals', () => {
  // The mails and the PDFs take every colour from shared/utils/palette.ts.
  const sources = (dir: string) =>
    readdirSync(dir, { recursive: true, encoding: 'utf8' })
      .filter(f => f.endsWith('.ts'))
      .map(f => join(dir, f))
  it.each([...sources('server/emails'), ...sources('server/documents')])(
    '%s has none of its own',
    (file) => {
      const text = readFileSync(file, 'utf8')
      expect(text).not.toMatch(/['"`(:,\s]#[0-9a-f]{3,8}\b/i)
      expect(text).not.toMatch(/rgba?\(|hsla?\(/)
    },
  )
})
