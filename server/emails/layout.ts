// Every Tiltwright e-mail has a text part and a simple HTML part built from the same blocks: the
// Tiltwright header, a greeting by name, the blocks, and the footer. Colours come from the
// palette only (shared/utils/palette.ts).
import { palette } from '../../shared/utils/palette'
import { formatCents } from '../../shared/utils/pricing'

export interface RenderedMail {
  subject: string
  text: string
  html: string
}

export const MAIL_BRAND = 'Tiltwright'
export const MAIL_TAGLINE = 'Balancing-rig kits for classrooms'

const escape = (s: string) =>
  s.replace(
    /[&<>"']/g,
    c => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', '\'': '&#39;' })[c]!,
  )

/** One line of an order or quote as an e-mail lists it. */
export interface MailItem {
  name: string
  quantity: number
  lineTotalCents: number
}

export interface MailBlock {
  paragraph?: string
  link?: { label: string, url: string }
  /** The items of an order or quote: product, quantity, line total. */
  items?: MailItem[]
}

/** Who the mail greets: a person's name, or a role when no name is known (accounts payable). */
export const greetingFor = (name: string) => `Hello ${name},`

const itemText = (i: MailItem) => `- ${i.name} × ${i.quantity}: ${formatCents(i.lineTotalCents)}`

function blockText(b: MailBlock): string[] {
  if (b.paragraph) return [b.paragraph, '']
  if (b.link) return [`${b.link.label}: ${b.link.url}`, '']
  if (b.items?.length) return ['Items:', ...b.items.map(itemText), '']
  return []
}

const cell = 'padding:6px 8px;border-bottom:1px solid ' + palette.chalk.dark
const num = `${cell};text-align:right;white-space:nowrap`

function blockHtml(b: MailBlock): string {
  if (b.paragraph) return `<p>${escape(b.paragraph)}</p>`
  if (b.link) {
    return `<p><a href="${escape(b.link.url)}" style="color:${palette.beam[600]}">`
      + `${escape(b.link.label)}</a></p>`
  }
  if (b.items?.length) {
    const head = `<tr style="color:${palette.ink.soft};text-align:left">`
      + `<th style="${cell}">Item</th><th style="${num}">Quantity</th>`
      + `<th style="${num}">Line total</th></tr>`
    const rows = b.items.map(i =>
      `<tr><td style="${cell}">${escape(i.name)}</td><td style="${num}">${i.quantity}</td>`
      + `<td style="${num}">${escape(formatCents(i.lineTotalCents))}</td></tr>`,
    )
    return '<table style="border-collapse:collapse;margin:0 0 16px" role="presentation">'
      + `${head}${rows.join('')}</table>`
  }
  return ''
}

const header = `<div style="background:${palette.beam[700]};color:${palette.chalk.DEFAULT};`
  + 'padding:14px 20px;border-radius:6px 6px 0 0">'
  + `<span style="font-size:20px;font-weight:800;letter-spacing:0.5px">${MAIL_BRAND}</span>`
  + `<span style="color:${palette.brass[300]};font-size:13px;margin-left:10px">`
  + `${MAIL_TAGLINE}</span></div>`

/** `name` is the person greeted (or, with no name known, their role: "accounts payable"). */
export function renderMail(
  subject: string,
  name: string,
  blocks: MailBlock[],
  footer = 'Tiltwright — balancing-rig kits for classrooms',
): RenderedMail {
  const greeting = greetingFor(name)
  const text = [
    `${MAIL_BRAND} · ${MAIL_TAGLINE}`,
    '',
    greeting,
    '',
    ...blocks.flatMap(blockText),
    '—',
    footer,
  ].join('\n')
  const html = '<!doctype html><html>'
    + `<body style="margin:0;padding:16px;background:${palette.chalk.dark};`
    + `font-family:Nunito,Arial,sans-serif;color:${palette.ink.DEFAULT};line-height:1.5">\n`
    + `<div style="max-width:600px;margin:0 auto;background:${palette.chalk.DEFAULT}">`
    + `${header}\n<div style="padding:4px 20px 12px">`
    + `<p>${escape(greeting)}</p>\n`
    + `${blocks.map(blockHtml).join('\n')}\n`
    + `<p style="color:${palette.ink.faint};font-size:12px">${escape(footer)}</p>`
    + '</div></div></body></html>'
  return { subject, text, html }
}
