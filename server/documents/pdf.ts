// Tiltwright's business documents (quote, invoice, receipt, packing list) as PDFs: pdfkit,
// Nunito embedded from @fontsource's WOFF files, US Letter. One layout serves them all.
import { readFileSync } from 'node:fs'
import { join } from 'node:path'
import PDFDocument from 'pdfkit'
import { formatCents } from '../../shared/utils/pricing'
import { VENDOR } from '../../shared/utils/vendor'
import { palette } from '../../shared/utils/palette'

export interface DocLineSpec {
  description: string
  quantity: number
  note?: string
  unitCents?: number
  totalCents?: number
}

export interface DocSpec {
  title: string
  number: string
  meta: [string, string][]
  /** Address blocks on the left (e.g. Bill to, Ship to), stacked. */
  parties: { label: string, lines: string[] }[]
  lines: DocLineSpec[]
  showPrices: boolean
  totals?: { label: string, cents: number, strong?: boolean }[]
  /** Headed blocks after the totals (e.g. How to pay). */
  blocks?: { heading: string, lines: string[] }[]
  notes: string[]
  stamp?: string
}

/** The documents' colours, all from the palette the pages use. */
const COLORS = {
  beam: palette.beam[700],
  brass: palette.brass[500],
  ink: palette.ink.DEFAULT,
  faint: palette.ink.faint,
  rule: palette.beam[100],
  go: palette.go.DEFAULT,
  stop: palette.stop.DEFAULT,
}

let fonts: { regular: Buffer, bold: Buffer, heavy: Buffer } | undefined
function loadFonts() {
  const dir = useRuntimeConfig().fontDir
  fonts ??= {
    regular: readFileSync(join(dir, 'nunito-latin-400-normal.woff')),
    bold: readFileSync(join(dir, 'nunito-latin-700-normal.woff')),
    heavy: readFileSync(join(dir, 'nunito-latin-800-normal.woff')),
  }
  return fonts
}

export function renderDocument(spec: DocSpec): Promise<Buffer> {
  const f = loadFonts()
  // The default font is Nunito itself, so pdfkit never loads its built-in Helvetica metrics.
  const doc = new PDFDocument({
    size: 'LETTER',
    margin: 50,
    font: f.regular as unknown as string,
    info: { Title: `${spec.title} ${spec.number}`, Author: 'Tiltwright', Creator: 'Tiltwright' },
  })
  doc.registerFont('regular', f.regular)
  doc.registerFont('bold', f.bold)
  doc.registerFont('heavy', f.heavy)
  const chunks: Buffer[] = []
  doc.on('data', (c: Buffer) => chunks.push(c))
  const done = new Promise<Buffer>((ok, fail) => {
    doc.on('end', () => ok(Buffer.concat(chunks)))
    doc.on('error', fail)
  })

  const left = doc.page.margins.left
  const right = doc.page.width - doc.page.margins.right
  const width = right - left

  doc.font('heavy').fontSize(22).fillColor(COLORS.beam).text('Tiltwright', left, 50)
  doc
    .font('regular')
    .fontSize(9)
    .fillColor(COLORS.faint)
    .text(`${VENDOR.tagline} · ${VENDOR.address} · ${VENDOR.email}`, left, 76)
  doc
    .font('heavy')
    .fontSize(18)
    .fillColor(COLORS.ink)
    .text(`${spec.title} ${spec.number}`, left, 50, { width, align: 'right' })
  let y = 104
  doc.moveTo(left, y).lineTo(right, y).lineWidth(1.5).strokeColor(COLORS.brass).stroke()
  y += 14

  let partyBottom = y
  for (const p of spec.parties) {
    doc
      .font('bold')
      .fontSize(10)
      .fillColor(COLORS.faint)
      .text(p.label.toUpperCase(), left, partyBottom)
    doc
      .font('regular')
      .fontSize(10.5)
      .fillColor(COLORS.ink)
      .text(p.lines.join('\n'), left, partyBottom + 14, { width: width / 2 - 10 })
    partyBottom = doc.y + 10
  }
  let my = y
  for (const [k, v] of spec.meta) {
    doc
      .font('bold')
      .fontSize(10)
      .fillColor(COLORS.faint)
      .text(k, left + width / 2, my, { width: 110 })
    doc
      .font('regular')
      .fontSize(10)
      .fillColor(COLORS.ink)
      .text(v, left + width / 2 + 115, my, { width: width / 2 - 115 })
    my = doc.y + 3
  }
  y = Math.max(partyBottom, my) + 18

  const cols = spec.showPrices
    ? ([
        { h: 'Item', w: width * 0.46, a: 'left' },
        { h: 'Qty', w: width * 0.1, a: 'right' },
        { h: 'Unit price', w: width * 0.2, a: 'right' },
        { h: 'Amount', w: width * 0.24, a: 'right' },
      ] as const)
    : ([
        { h: 'Item', w: width * 0.7, a: 'left' },
        { h: 'Qty', w: width * 0.3, a: 'right' },
      ] as const)
  const row = (cells: string[], font: 'regular' | 'bold', size = 10) => {
    let x = left
    let h = 0
    cells.forEach((c, i) => {
      doc
        .font(font)
        .fontSize(size)
        .fillColor(COLORS.ink)
        .text(c, x + (i ? 0 : 4), y, { width: cols[i]!.w - 8, align: cols[i]!.a })
      h = Math.max(h, doc.y - y)
      x += cols[i]!.w
    })
    y += h + 6
  }
  doc.rect(left, y - 4, width, 20).fill(COLORS.rule)
  row(
    cols.map(c => c.h),
    'bold',
  )
  for (const l of spec.lines) {
    if (y > doc.page.height - 160) {
      doc.addPage()
      y = 60
    }
    const item = l.note ? `${l.description}\n${l.note}` : l.description
    row(
      spec.showPrices
        ? [
            item,
            String(l.quantity),
            l.unitCents === undefined ? '' : formatCents(l.unitCents),
            l.totalCents === undefined ? '' : formatCents(l.totalCents),
          ]
        : [item, String(l.quantity)],
      'regular',
    )
    doc
      .moveTo(left, y - 3)
      .lineTo(right, y - 3)
      .lineWidth(0.5)
      .strokeColor(COLORS.rule)
      .stroke()
  }
  y += 6
  const totalsTop = y
  for (const t of spec.totals ?? []) {
    doc
      .font(t.strong ? 'heavy' : 'regular')
      .fontSize(t.strong ? 12 : 10)
      .fillColor(COLORS.ink)
    // A long label (e.g. the tax-exemption note) may wrap: the next row starts below the taller
    // cell.
    const label = { x: left + width * 0.3, width: width * 0.46 }
    const amount = formatCents(t.cents)
    const height = Math.max(
      doc.heightOfString(t.label, { width: label.width }),
      doc.heightOfString(amount, { width: width * 0.24 - 4 }),
    )
    doc.text(t.label, label.x, y, { width: label.width, align: 'right' })
    doc.text(amount, left + width * 0.76, y, { width: width * 0.24 - 4, align: 'right' })
    y += height + 4
  }
  if (spec.stamp) {
    // Beside the totals, on the empty left of their rows: nothing else is printed there.
    doc.save().rotate(-12, { origin: [left + 80, totalsTop + 24] })
    doc
      .font('heavy')
      .fontSize(30)
      .fillColor(spec.stamp === 'VOID' ? COLORS.stop : COLORS.go)
      .opacity(0.75)
      .text(spec.stamp, left, totalsTop + 6, { width: 160, align: 'center' })
    doc.restore().opacity(1)
  }
  y += 16
  // A block or note that would cross the bottom margin starts a new page (never a lone line).
  const bottom = doc.page.height - doc.page.margins.bottom
  for (const b of spec.blocks ?? []) {
    if (y + 14 + doc.heightOfString(b.lines.join('\n'), { width: width - 6 }) > bottom) {
      doc.addPage()
      y = 60
    }
    doc.font('bold').fontSize(10.5).fillColor(COLORS.beam).text(b.heading, left, y, { width })
    y = doc.y + 3
    for (const l of b.lines) {
      doc
        .font('regular')
        .fontSize(9.5)
        .fillColor(COLORS.ink)
        .text(`•  ${l}`, left + 6, y, { width: width - 6 })
      y = doc.y + 3
    }
    y += 8
  }
  for (const n of spec.notes) {
    doc.font('regular').fontSize(9.5)
    if (y + doc.heightOfString(n, { width }) > bottom) {
      doc.addPage()
      y = 60
    }
    doc.font('regular').fontSize(9.5).fillColor(COLORS.faint).text(n, left, y, { width })
    y = doc.y + 6
  }
  doc.end()
  return done
}
