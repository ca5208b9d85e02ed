/**
 * The management-review summary (ISO/IEC 17025:2017 8.9) as a PDF: pdfkit with the certificate's
 * embedded IBM Plex Sans and look (server/services/certificates/pdf.ts). Each count is one line of
 * text ("Nonconformities raised: 2"), so the document reads the same when its text is extracted.
 * `managementReviewPdf(data, lab)` takes plain data and returns the bytes.
 */
import type { ManagementReviewDTO } from '#shared/types'
import { certificateFonts, openLabPdf, type CertificateFonts } from '#server/services/certificates/pdf'

const INK = '#231c2c'
const MUTED = '#6c5886'
const RULE = '#d3c9de'
const ACCENT = '#1d7e75'
const PAGE = { width: 595.28, height: 841.89 }
const MARGIN = { left: 50, right: 50, top: 60, bottom: 60 }
const WIDTH = PAGE.width - MARGIN.left - MARGIN.right

/** The count lines, in the order printed: label and the value's key. */
export const REVIEW_COUNT_LINES: [string, keyof ManagementReviewDTO['counts']][] = [
  ['Intermediate checks performed', 'checksPerformed'],
  ['Intermediate checks failed', 'checksFailed'],
  ['Proficiency results', 'proficiencyResults'],
  ['Proficiency results satisfactory', 'proficiencySatisfactory'],
  ['Proficiency results questionable', 'proficiencyQuestionable'],
  ['Proficiency results unsatisfactory', 'proficiencyUnsatisfactory'],
  ['Nonconformities raised', 'nonconformitiesRaised'],
  ['Nonconformities closed', 'nonconformitiesClosed'],
  ['Nonconformities open at the end of the period', 'nonconformitiesOpenAtEnd'],
  ['Complaints received', 'complaintsReceived'],
  ['Complaints closed', 'complaintsClosed'],
  ['Corrective actions opened', 'correctiveActionsOpened'],
  ['Corrective actions closed', 'correctiveActionsClosed'],
  ['Actions overdue at the end of the period', 'actionItemsOverdueAtEnd'],
  ['Calibration runs', 'runs'],
  ['Certificates issued', 'certificatesIssued'],
]

type Doc = PDFKit.PDFDocument

class Page {
  y = MARGIN.top + 20
  constructor(readonly doc: Doc) {}

  ensure(h: number): void {
    if (this.y + h > PAGE.height - MARGIN.bottom) {
      this.doc.addPage()
      this.y = MARGIN.top + 20
    }
  }

  heading(s: string): void {
    this.ensure(50)
    this.y += 8
    this.doc.save().rect(MARGIN.left, this.y + 1, 3, 11).fill(ACCENT).restore()
    this.doc.font('PlexSemi').fontSize(11).fillColor(INK).text(s, MARGIN.left + 9, this.y, { width: WIDTH - 9, lineBreak: false })
    this.y += 20
  }

  line(s: string, size = 9, colour = INK, font: 'Plex' | 'PlexSemi' = 'Plex'): void {
    this.doc.font(font).fontSize(size).fillColor(colour)
    const h = this.doc.heightOfString(s, { width: WIDTH, lineGap: 1.5 })
    this.ensure(h)
    this.doc.text(s, MARGIN.left, this.y, { width: WIDTH, lineGap: 1.5 })
    this.y += h + 3
  }

  /** A list of rows, or "None in the period." */
  list(rows: string[]): void {
    if (!rows.length) return this.line('None in the period.', 9, MUTED)
    for (const r of rows) this.line(`• ${r}`)
  }
}

function frame(doc: Doc, lab: string, period: string): void {
  const range = doc.bufferedPageRange()
  for (let i = range.start; i < range.start + range.count; i++) {
    doc.switchToPage(i)
    doc.page.margins.bottom = 0
    doc.save().rect(0, 0, PAGE.width, 6).fill(INK).restore()
    doc.save().rect(0, 6, PAGE.width, 1.5).fill(ACCENT).restore()
    doc.font('Plex').fontSize(7.5).fillColor(MUTED)
    doc.text(`${lab} · Management review summary ${period}`, MARGIN.left, PAGE.height - 40, { width: WIDTH - 100, lineBreak: false })
    doc.text(`Page ${i - range.start + 1} of ${range.count}`, PAGE.width - MARGIN.right - 100, PAGE.height - 40, { width: 100, align: 'right', lineBreak: false })
    doc.save().moveTo(MARGIN.left, PAGE.height - 46).lineTo(PAGE.width - MARGIN.right, PAGE.height - 46).lineWidth(0.5).strokeColor(RULE).stroke().restore()
  }
}

/**
 * The summary as a PDF.
 * @param data - the summary (GET /api/quality/management-review)
 * @param lab - the laboratory's name, printed on every page
 * @param generatedOn - the date it was made (lab-local `YYYY-MM-DD`)
 * @param fonts - the embedded fonts (default: the certificate's)
 * @returns the PDF bytes
 */
export async function managementReviewPdf(data: ManagementReviewDTO, lab: string, generatedOn: string, fonts?: CertificateFonts): Promise<Buffer> {
  const period = `${data.from} to ${data.to}`
  const { doc, done } = openLabPdf(fonts ?? await certificateFonts(), { margins: MARGIN, info: { Title: `Management review summary ${period}`, Author: lab } })
  const p = new Page(doc)
  p.line('Management review summary', 20, INK, 'PlexSemi')
  p.line(`${lab} · period ${period} · made on ${generatedOn}`, 9.5, MUTED)
  p.line('ISO/IEC 17025:2017 8.9: inputs on the validity of results, nonconforming work, complaints and corrective actions.', 8.5, MUTED)

  p.heading('Counts')
  for (const [label, key] of REVIEW_COUNT_LINES) p.line(`${label}: ${data.counts[key]}`)

  p.heading('Runs and certificates per month')
  for (const m of data.perMonth) p.line(`${m.month}: ${m.runs} run(s), ${m.certificates} certificate(s) issued`)

  p.heading('Nonconformities raised')
  p.list(data.nonconformities.map(n => `${n.number} (${n.raisedOn}, ${n.status}${n.withhold ? ', issuing withheld' : ''}): ${n.title}`))
  p.heading('Failed intermediate checks')
  p.list(data.failedChecks.map(c => `${c.checkedOn} ${c.equipmentTag ?? ''}: ${c.statement}${c.nonconformityNumber ? ` (${c.nonconformityNumber})` : ''}`))
  p.heading('Proficiency tests and comparisons')
  p.list(data.proficiencyResults.map(r => `${r.reportedOn} ${r.scheme}, round ${r.round}: ${r.verdict} (E_n = ${r.en.toFixed(2)}${r.z !== null ? `, z = ${r.z.toFixed(2)}` : ''})`))
  p.heading('Complaints received')
  p.list(data.complaints.map(c => `${c.number} (${c.receivedOn}, ${c.status}): ${c.subject}`))
  p.heading('Corrective actions opened')
  p.list(data.correctiveActions.map(a => `${a.number} (${a.openedOn}, ${a.status}${a.overdue ? ', overdue' : ''}${a.awaitingEffectiveness ? ', awaiting its effectiveness check' : ''}): ${a.title}`))

  frame(doc, lab, period)
  doc.end()
  return done
}
