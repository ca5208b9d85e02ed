/**
 * Quotes, invoices and credit notes as PDFs, in the certificate's look (pdfkit, the embedded IBM
 * Plex Sans of server/services/certificates/pdf.ts, the same colours, header band and footer):
 * title and number, who issues it and to whom, the facts (dates, purchase order, order), the lines
 * with quantity, unit price and amount, net, tax and total, and the notes (payment instructions,
 * the laboratory's message, the reason for a credit). `billingPdf(data)` takes plain data and
 * returns the bytes, so it is tested without HTTP or a database.
 */
import { formatMoney } from '#shared/billing/money'
import { longDate } from '#shared/format'
import { certificateFonts, openLabPdf, type CertificateFonts } from '#server/services/certificates/pdf'

export type BillingDocumentKind = 'quote' | 'invoice' | 'credit-note'

export interface BillingDocumentData {
  kind: BillingDocumentKind
  number: string
  lab: { name: string, addressLines: string[], email: string | null, phone: string | null }
  customer: { name: string, addressLines: string[] }
  /** Label–value facts printed under the parties (dates, purchase order, order, invoice credited). */
  facts: [string, string][]
  lines: { description: string, quantity: number, unitPriceMinor: number, amountMinor: number }[]
  currency: string
  taxRatePercent: number
  netMinor: number
  taxMinor: number
  grossMinor: number
  /** Paragraphs after the totals, each with a heading. */
  notes: { heading: string, text: string }[]
}

const TITLES: Record<BillingDocumentKind, string> = { 'quote': 'Quotation', 'invoice': 'Invoice', 'credit-note': 'Credit note' }
const SUBTITLES: Record<BillingDocumentKind, string> = { 'quote': 'Calibration of radiation thermometers', 'invoice': 'Calibration services', 'credit-note': 'Credit against an invoice' }

const INK = '#231c2c'
const MUTED = '#6c5886'
const RULE = '#d3c9de'
const SHADE = '#f6f4f8'
const ACCENT = '#1d7e75'
const PAGE = { width: 595.28, height: 841.89 }
const MARGIN = { left: 50, right: 50, top: 74, bottom: 64 }
const CONTENT_W = PAGE.width - MARGIN.left - MARGIN.right
const BOTTOM = PAGE.height - MARGIN.bottom

type Doc = PDFKit.PDFDocument

/** A date fact written out ("2 December 2026"), other facts as given. */
export function factDate(iso: string | null): string {
  return iso ? longDate(iso) : '—'
}

class Writer {
  y = MARGIN.top
  constructor(readonly doc: Doc) {}

  font(weight: 'regular' | 'semibold', size: number, colour = INK): this {
    this.doc.font(weight === 'regular' ? 'Plex' : 'PlexSemi').fontSize(size).fillColor(colour)
    return this
  }

  ensure(height: number): void {
    if (this.y + height > BOTTOM) {
      this.doc.addPage()
      this.y = MARGIN.top
    }
  }
}

function titleBlock(w: Writer, d: BillingDocumentData): void {
  const { doc } = w
  w.font('semibold', 22, INK)
  doc.text(TITLES[d.kind], MARGIN.left, w.y, { lineBreak: false })
  w.font('regular', 9.5, MUTED)
  doc.text(SUBTITLES[d.kind], MARGIN.left, w.y + 28, { lineBreak: false })
  const bw = 190
  const bx = PAGE.width - MARGIN.right - bw
  doc.save().roundedRect(bx, w.y - 2, bw, 44, 3).fill(SHADE).restore()
  w.font('regular', 7.5, MUTED)
  doc.text(`${TITLES[d.kind].toUpperCase()} NUMBER`, bx + 10, w.y + 5, { width: bw - 20, characterSpacing: 0.6, lineBreak: false })
  w.font('semibold', 14, INK)
  doc.text(d.number, bx + 10, w.y + 18, { width: bw - 20, lineBreak: false })
  w.y += 52
  doc.save().moveTo(MARGIN.left, w.y).lineTo(PAGE.width - MARGIN.right, w.y).lineWidth(0.6).strokeColor(RULE).stroke().restore()
  w.y += 10
}

function partiesBlock(w: Writer, d: BillingDocumentData): void {
  const col = (CONTENT_W - 20) / 2
  const left = MARGIN.left
  const right = MARGIN.left + col + 20
  w.font('semibold', 8, MUTED)
  w.doc.text('FROM', left, w.y, { characterSpacing: 0.6, lineBreak: false })
  w.doc.text(d.kind === 'quote' ? 'FOR' : 'BILL TO', right, w.y, { characterSpacing: 0.6, lineBreak: false })
  w.y += 13
  const start = w.y
  w.font('semibold', 9.5, INK)
  w.doc.text(d.lab.name, left, w.y, { width: col })
  w.font('regular', 8.6, INK)
  const contact = [d.lab.phone ? `Tel. ${d.lab.phone}` : null, d.lab.email].filter(Boolean).join(' · ')
  w.doc.text([...d.lab.addressLines, contact].filter(Boolean).join('\n'), { width: col, lineGap: 1 })
  const leftEnd = w.doc.y
  w.font('semibold', 9.5, INK)
  w.doc.text(d.customer.name, right, start, { width: col })
  w.font('regular', 8.6, INK)
  w.doc.text(d.customer.addressLines.join('\n') || 'Address not recorded', { width: col, lineGap: 1 })
  w.y = Math.max(leftEnd, w.doc.y) + 12
}

function factsBlock(w: Writer, d: BillingDocumentData): void {
  if (!d.facts.length) return
  // Facts side by side in up to four columns: label above, value below.
  const perRow = Math.min(4, d.facts.length)
  const cw = CONTENT_W / perRow
  for (let i = 0; i < d.facts.length; i += perRow) {
    const row = d.facts.slice(i, i + perRow)
    w.ensure(34)
    w.doc.save().rect(MARGIN.left, w.y, CONTENT_W, 30).fill(SHADE).restore()
    row.forEach(([label, value], j) => {
      const x = MARGIN.left + j * cw + 8
      w.font('regular', 7.4, MUTED)
      w.doc.text(label.toUpperCase(), x, w.y + 5, { width: cw - 14, characterSpacing: 0.4, lineBreak: false })
      w.font('semibold', 9, INK)
      w.doc.text(value, x, w.y + 16, { width: cw - 14, height: 11, ellipsis: true })
    })
    w.y += 34
  }
  w.y += 6
}

const COLS = [
  { title: 'Description', w: CONTENT_W - 60 - 90 - 95, align: 'left' as const },
  { title: 'Quantity', w: 60, align: 'right' as const },
  { title: 'Unit price', w: 90, align: 'right' as const },
  { title: 'Amount', w: 95, align: 'right' as const },
]

function linesTable(w: Writer, d: BillingDocumentData): void {
  const { doc } = w
  const header = () => {
    doc.save().rect(MARGIN.left, w.y, CONTENT_W, 20).fill(INK).restore()
    let x = MARGIN.left
    w.font('semibold', 7.8, '#ffffff')
    for (const c of COLS) {
      doc.text(c.title, x + 6, w.y + 6, { width: c.w - 12, align: c.align, lineBreak: false })
      x += c.w
    }
    w.y += 20
  }
  w.ensure(60)
  header()
  d.lines.forEach((l, i) => {
    w.font('regular', 8.8, INK)
    const h = Math.max(17, doc.heightOfString(l.description, { width: COLS[0]!.w - 12, lineGap: 1 }) + 8)
    if (w.y + h > BOTTOM) {
      doc.addPage()
      w.y = MARGIN.top
      header()
    }
    if (i % 2 === 1) doc.save().rect(MARGIN.left, w.y, CONTENT_W, h).fill(SHADE).restore()
    let x = MARGIN.left
    const cells = [l.description, String(l.quantity), formatMoney(l.unitPriceMinor, d.currency), formatMoney(l.amountMinor, d.currency)]
    w.font('regular', 8.8, INK)
    cells.forEach((c, j) => {
      doc.text(c, x + 6, w.y + 4.5, { width: COLS[j]!.w - 12, align: COLS[j]!.align, lineGap: 1, lineBreak: j === 0 })
      x += COLS[j]!.w
    })
    w.y += h
  })
  doc.save().moveTo(MARGIN.left, w.y).lineTo(PAGE.width - MARGIN.right, w.y).lineWidth(0.6).strokeColor(RULE).stroke().restore()
  w.y += 8
}

function totalsBlock(w: Writer, d: BillingDocumentData): void {
  const { doc } = w
  const width = 240
  const x = PAGE.width - MARGIN.right - width
  w.ensure(70)
  const rows: [string, string, boolean][] = [
    ['Net', formatMoney(d.netMinor, d.currency), false],
    [`Tax ${String(d.taxRatePercent)} %`, formatMoney(d.taxMinor, d.currency), false],
    [d.kind === 'credit-note' ? 'Total credited' : d.kind === 'invoice' ? 'Total due' : 'Total', formatMoney(d.grossMinor, d.currency), true],
  ]
  for (const [label, value, strong] of rows) {
    if (strong) {
      doc.save().rect(x, w.y - 2, width, 22).fill(SHADE).restore()
      doc.save().rect(x, w.y - 2, 3, 22).fill(ACCENT).restore()
    }
    w.font(strong ? 'semibold' : 'regular', strong ? 10.5 : 9, strong ? INK : MUTED)
    doc.text(label, x + 10, w.y + (strong ? 3 : 0), { width: 110, lineBreak: false })
    w.font(strong ? 'semibold' : 'regular', strong ? 10.5 : 9, INK)
    doc.text(value, x + 110, w.y + (strong ? 3 : 0), { width: width - 118, align: 'right', lineBreak: false })
    w.y += strong ? 24 : 15
  }
  w.y += 10
}

function notesBlock(w: Writer, d: BillingDocumentData): void {
  for (const n of d.notes) {
    w.font('regular', 8.6, INK)
    const h = w.doc.heightOfString(n.text, { width: CONTENT_W - 9, lineGap: 1.5 })
    w.ensure(h + 24)
    w.doc.save().rect(MARGIN.left, w.y + 1, 3, 11).fill(ACCENT).restore()
    w.font('semibold', 10, INK)
    w.doc.text(n.heading, MARGIN.left + 9, w.y, { width: CONTENT_W - 9, lineBreak: false })
    w.y += 16
    w.font('regular', 8.6, INK)
    w.doc.text(n.text, MARGIN.left + 9, w.y, { width: CONTENT_W - 9, lineGap: 1.5 })
    w.y += h + 10
  }
}

function frame(doc: Doc, d: BillingDocumentData): void {
  const range = doc.bufferedPageRange()
  for (let i = range.start; i < range.start + range.count; i++) {
    doc.switchToPage(i)
    doc.page.margins.bottom = 0
    doc.save().rect(0, 0, PAGE.width, 6).fill(INK).restore()
    doc.save().rect(0, 6, PAGE.width, 1.5).fill(ACCENT).restore()
    doc.font('PlexSemi').fontSize(8.5).fillColor(INK)
    doc.text(d.lab.name, MARGIN.left, 26, { width: 300, lineBreak: false })
    doc.font('PlexSemi').fontSize(8.5).fillColor(INK)
    doc.text(`${TITLES[d.kind]} ${d.number}`, PAGE.width - MARGIN.right - 220, 26, { width: 220, align: 'right', lineBreak: false })
    doc.font('Plex').fontSize(8).fillColor(MUTED)
    doc.text(`Page ${i - range.start + 1} of ${range.count}`, PAGE.width - MARGIN.right - 220, 38, { width: 220, align: 'right', lineBreak: false })
    doc.save().moveTo(MARGIN.left, 54).lineTo(PAGE.width - MARGIN.right, 54).lineWidth(0.5).strokeColor(RULE).stroke().restore()
    const fy = PAGE.height - 42
    doc.save().moveTo(MARGIN.left, fy).lineTo(PAGE.width - MARGIN.right, fy).lineWidth(0.5).strokeColor(RULE).stroke().restore()
    doc.font('Plex').fontSize(6.8).fillColor(MUTED)
    doc.text([d.lab.name, ...d.lab.addressLines].join(' · '), MARGIN.left, fy + 6, { width: CONTENT_W - 130, height: 9, ellipsis: true })
    doc.text(d.number, PAGE.width - MARGIN.right - 130, fy + 6, { width: 130, align: 'right', lineBreak: false })
  }
}

/**
 * A quote, invoice or credit note as a PDF.
 * @param data - what the document states (amounts in minor units of `currency`)
 * @param fonts - the embedded fonts (default: the certificate's)
 * @returns the PDF bytes
 */
export async function billingPdf(data: BillingDocumentData, fonts?: CertificateFonts): Promise<Buffer> {
  const { doc, done } = openLabPdf(fonts ?? await certificateFonts(), {
    margins: MARGIN,
    info: { Title: `${TITLES[data.kind]} ${data.number}`, Author: data.lab.name, Subject: `${TITLES[data.kind]} for ${data.customer.name}` },
  })
  const w = new Writer(doc)
  titleBlock(w, data)
  partiesBlock(w, data)
  factsBlock(w, data)
  linesTable(w, data)
  totalsBlock(w, data)
  notesBlock(w, data)
  frame(doc, data)
  doc.end()
  return done
}
