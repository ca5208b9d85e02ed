/**
 * The calibration certificate as a PDF (pdfkit, IBM Plex Sans embedded from server/assets/fonts).
 * `certificatePdf(data)` takes a plain `CertificateData` object and returns the bytes, so it is
 * tested and benchmarked without HTTP or a database. It prints what ISO/IEC 17025:2017 7.8.2.1 and
 * 7.8.4.1 ask of a calibration certificate: title, laboratory, unique identification and
 * "page x of y" on every page, customer, item and its condition, method, dates, conditions,
 * results with units and uncertainty (k, p), as found / as left, traceability, conformity with
 * the decision rule, who authorized it, and a clear end. A chart of error against temperature with
 * ±U bars and the tolerance limits, and a QR code to the public verification page, close it.
 */
import fs from 'node:fs'
import path from 'node:path'
import { fileURLToPath } from 'node:url'
import zlib from 'node:zlib'
import PDFDocument from 'pdfkit'
import QRCode from 'qrcode'
import { celsiusFixed, formatFixed, longDate, typographicMinus } from '#shared/format'

type Verdict = 'pass' | 'conditional-pass' | 'conditional-fail' | 'fail'

export interface CertificatePoint {
  stage: 'as-found' | 'as-left'
  referenceK: number
  expectedK: number
  meanK: number
  errorK: number
  /** Stated expanded uncertainty U, K. */
  uncertaintyK: number
  coverageFactor: number
  /** Rounded error and U as the engine stated them (GUM 7.2.6), in K (= °C differences). */
  errorText: string
  uncertaintyText: string
  /** Number of readings averaged. */
  n: number
  /** Tolerance limit TL at the point, K. */
  toleranceK: number
  /** TL − w, K. */
  acceptanceLimitK: number
  verdict: Verdict
  /**
   * Probability that the error lies within ±TL (JCGM 106:2012, 7.4; normal PDF with u = U/k), stated
   * beside the verdict; null for results computed before it was recorded.
   */
  probabilityOfConformity?: number | null
  /** A thermal imager's point: the non-uniformity over its ROIs as printed (max − min, s of the ROI means), K. */
  imager?: { roiCount: number, rangeText: string | null, sdText: string | null } | null
}

/** What a ratio (two-colour) pyrometer's certificate adds: both bands, the ratio setting, the source's ε in each band. */
export interface CertificateRatio {
  band1: string
  band2: string
  emissivityRatioSetting: number
  /** Per source: the emissivity used in each band, as the points were computed. */
  sources: { assetTag: string, emissivity1: string, emissivity2: string }[]
}

/** What a thermal imager's certificate adds (IEC TS 63144-1, VDI/VDE 5585 list these; from memory). */
export interface CertificateImager {
  lens: string
  fieldOfView: string
  rangeSetting: string
  nonUniformityCorrection: boolean
  /** Regions of interest as used (name, top-left corner and size in pixels), in order. */
  rois: { name: string, xPx: number, yPx: number, widthPx: number, heightPx: number }[]
  centreRoi: string
  /** NETD where a frame series on the uniform source was recorded: at which point, the value and how many ROIs and frames. */
  netd: { referenceK: number, netdText: string, roiCount: number, frameCount: number }[]
}

/** A calibration equation with its interpolated table (spot and reference pyrometers). */
export interface CertificateEquation {
  /** 'as-left' (adjusted run) or 'all' points fitted. */
  points: 'as-left' | 'all'
  pointCount: number
  pointCorrelation: number
  /** A, B, C with their standard uncertainties, as printed. */
  parameters: { name: string, valueText: string, uText: string, unit: string }[]
  /** The nominal band's A₀, B₀ and c₂ that turn a reading into the signal fitted. */
  nominalText: string
  chiSquaredText: string
  degreesOfFreedom: number
  rangeK: { min: number, max: number }
  coverageFactor: number
  rows: { temperatureK: number, readingText: string, correctionText: string, uncertaintyText: string }[]
}

export interface CertificateEquipment {
  /** e.g. 'Blackbody source' or 'Reference thermometer'. */
  role: string
  assetTag: string
  description: string
  /** The latest external calibration before the run: who issued it, its number and date. */
  certificateNumber: string | null
  provider: string | null
  calibrationDate: string | null
}

/** Everything the certificate states, as plain data (temperatures in kelvin, dates YYYY-MM-DD). */
export interface CertificateData {
  number: string
  revision: number
  /** The revision this one replaces, why, and what changed; null for a first issue. */
  amends: { number: string, issueDate: string, reason: string, changes: string[] } | null
  /** A preview before signing: watermarked, not valid. */
  draft?: boolean
  lab: {
    name: string
    addressLines: string[]
    email: string | null
    phone: string | null
    accreditationBody: string
    accreditationNumber: string
  }
  customer: { name: string, addressLines: string[] }
  instrument: {
    maker: string
    model: string
    serial: string
    assetTag: string | null
    kind: string
    band: string
    rangeText: string
    resolutionText: string
    accuracyText: string
  }
  /** The receipt record of the item (ISO/IEC 17025 7.4), word for word. */
  receipt: {
    receivedOn: string
    packaging: string
    condition: string
    accessories: string | null
    deviations: string | null
    customerConsulted: boolean
    customerDecision: string | null
  }
  /** Where the calibration was done. */
  place: { kind: 'laboratory' | 'on-site', addressLines: string[] }
  /** Deviations from the method, as recorded; null when none was recorded. */
  methodDeviations: string | null
  /** What the "reference temperature" of the results is (its basis, per source) and the source emissivity ε_s used. */
  referenceBasis: string
  method: { procedureName: string, documentReference: string, versionNumber: number }
  dates: { received: string, calibrated: string, issued: string }
  environment: {
    ambientK: number
    relativeHumidityPct: number
    distanceMm: number
    /** Null for a ratio pyrometer's run, whose model has no emissivity setting (its ratio setting is in `ratio`). */
    emissivitySetting: number | null
    reflectedK: number
    /** Null for a ratio pyrometer's run when it was not entered (its model does not use it). */
    instrumentK: number | null
    /** The reference instrument that measured the ambient conditions, when recorded. */
    measuredWith: string | null
  }
  adjusted: boolean
  points: CertificatePoint[]
  coverageProbability: number
  equipment: CertificateEquipment[]
  statements: {
    traceability: string
    decisionRule: string
    items: string
    reproduction: string | null
  }
  /**
   * The terms agreed with the customer (ISO/IEC 17025 7.1.3): the decision rule (label, guard band
   * `r = 1` or empty, the document it follows) and the specification. Null when no agreement is on
   * record: then no statement of conformity is made.
   */
  agreement: {
    agreedOn: string
    how: string
    ruleLabel: string
    guardBandText: string
    ruleReference: string
    specificationText: string
  } | null
  /** Remarks for the customer (never the laboratory's internal notes). */
  remarks: string | null
  /** A ratio pyrometer's bands, ratio setting and source emissivities (absent for other kinds). */
  ratio?: CertificateRatio | null
  /** A thermal imager's settings, regions of interest and NETD (absent for other kinds). */
  imager?: CertificateImager | null
  /** The calibration equation and its interpolated table, when the run asked for one. */
  equation?: CertificateEquation | null
  signatory: { name: string, function: string, meaning: string, signedAt: string }
  verification: { code: string, url: string }
}

export interface CertificateFonts {
  regular: Uint8Array
  semibold: Uint8Array
}

const FONT_FILES = { regular: 'IBMPlexSans-Regular.woff', semibold: 'IBMPlexSans-SemiBold.woff' } as const

let fontCache: CertificateFonts | undefined

/**
 * WOFF 1.0 (W3C Recommendation, 2012) → the plain OpenType/TrueType file it wraps: every table
 * inflated once and laid out again behind an sfnt table directory. pdfkit's font engine reads a
 * WOFF file by inflating tables again on each access, which makes every line of text slow; the
 * unwrapped font is read directly. The bytes of each table are unchanged (so are its checksums).
 */
export function woffToSfnt(woff: Uint8Array): Buffer {
  const src = Buffer.from(woff.buffer, woff.byteOffset, woff.byteLength)
  if (src.toString('latin1', 0, 4) !== 'wOFF') return src // already sfnt (or not a WOFF file)
  const flavor = src.readUInt32BE(4)
  const numTables = src.readUInt16BE(12)
  const tables: { tag: number, checksum: number, data: Buffer }[] = []
  for (let i = 0; i < numTables; i++) {
    const e = 44 + i * 20
    const tag = src.readUInt32BE(e)
    const offset = src.readUInt32BE(e + 4)
    const compLength = src.readUInt32BE(e + 8)
    const origLength = src.readUInt32BE(e + 12)
    const checksum = src.readUInt32BE(e + 16)
    const raw = src.subarray(offset, offset + compLength)
    const data = compLength < origLength ? zlib.inflateSync(raw) : Buffer.from(raw)
    if (data.length !== origLength) throw new Error('damaged WOFF table')
    tables.push({ tag, checksum, data })
  }
  tables.sort((a, b) => a.tag - b.tag)
  const pow = 2 ** Math.floor(Math.log2(numTables))
  const head = Buffer.alloc(12 + 16 * numTables)
  head.writeUInt32BE(flavor, 0)
  head.writeUInt16BE(numTables, 4)
  head.writeUInt16BE(pow * 16, 6)
  head.writeUInt16BE(Math.log2(pow), 8)
  head.writeUInt16BE(numTables * 16 - pow * 16, 10)
  const parts: Buffer[] = [head]
  let offset = head.length
  tables.forEach((t, i) => {
    const r = 12 + i * 16
    head.writeUInt32BE(t.tag, r)
    head.writeUInt32BE(t.checksum, r + 4)
    head.writeUInt32BE(offset, r + 8)
    head.writeUInt32BE(t.data.length, r + 12)
    const padded = Buffer.alloc((t.data.length + 3) & ~3)
    t.data.copy(padded)
    parts.push(padded)
    offset += padded.length
  })
  return Buffer.concat(parts)
}

function toBytes(v: unknown): Uint8Array | null {
  if (v instanceof Uint8Array) return v
  if (v instanceof ArrayBuffer) return new Uint8Array(v)
  return null
}

/**
 * The embedded fonts: through Nitro's server assets (`assets:server`, bundled into the build) in
 * the server; from server/assets/fonts on disk when run outside Nitro (unit tests, benchmarks).
 */
export async function certificateFonts(): Promise<CertificateFonts> {
  if (fontCache) return fontCache
  if (typeof useStorage === 'function') {
    const storage = useStorage('assets:server')
    const regular = toBytes(await storage.getItemRaw(`fonts/${FONT_FILES.regular}`))
    const semibold = toBytes(await storage.getItemRaw(`fonts/${FONT_FILES.semibold}`))
    if (!regular || !semibold) throw new Error('The certificate fonts are missing from the server assets (server/assets/fonts)')
    fontCache = { regular: woffToSfnt(regular), semibold: woffToSfnt(semibold) }
    return fontCache
  }
  const dir = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../../assets/fonts')
  fontCache = {
    regular: woffToSfnt(fs.readFileSync(path.join(dir, FONT_FILES.regular))),
    semibold: woffToSfnt(fs.readFileSync(path.join(dir, FONT_FILES.semibold))),
  }
  return fontCache
}

// ---------------------------------------------------------------- look

const INK = '#231c2c' // kiln 900
const MUTED = '#6c5886' // kiln 500
const RULE = '#d3c9de' // kiln 200
const SHADE = '#f6f4f8' // kiln 50
const ACCENT = '#1d7e75' // band 600
const AMBER = '#bf6513' // glow 600
const VERDICT_COLOUR: Record<Verdict, string> = { 'pass': '#1d7e75', 'conditional-pass': '#1d7e75', 'conditional-fail': '#bf6513', 'fail': '#b42335' }
const VERDICT_TEXT: Record<Verdict, string> = { 'pass': 'Pass', 'conditional-pass': 'Conditional pass', 'conditional-fail': 'Conditional fail', 'fail': 'Fail' }

const PAGE = { width: 595.28, height: 841.89 }
const MARGIN = { left: 50, right: 50, top: 74, bottom: 64 }
const CONTENT_W = PAGE.width - MARGIN.left - MARGIN.right
const BOTTOM = PAGE.height - MARGIN.bottom

const C0 = 273.15
/** Kelvin → Celsius text to `d` places, computed in decimal, with a typographic minus. */
const celsius = (k: number, d: number) => celsiusFixed(k, d)
const signed = (s: string) => (Number(s) === 0 ? s.replace(/^-/, '') : s.startsWith('-') ? `−${s.slice(1)}` : `+${s}`)
const tick = (v: number, d: number) => typographicMinus(formatFixed(v, d))
const decimalsOf = (s: string) => (s.includes('.') ? s.split('.')[1]!.length : 0)

type Doc = PDFKit.PDFDocument

class Writer {
  y = MARGIN.top
  constructor(readonly doc: Doc) {}

  font(weight: 'regular' | 'semibold', size: number, colour = INK): this {
    this.doc.font(weight === 'regular' ? 'Plex' : 'PlexSemi').fontSize(size).fillColor(colour)
    return this
  }

  /** Start a new page when fewer than `height` points remain. */
  ensure(height: number): void {
    if (this.y + height > BOTTOM) {
      this.doc.addPage()
      this.y = MARGIN.top
    }
  }

  text(s: string, x: number, width: number, opts: PDFKit.Mixins.TextOptions = {}): number {
    const h = this.doc.heightOfString(s, { width, ...opts })
    this.doc.text(s, x, this.y, { width, ...opts })
    return h
  }

  paragraph(s: string, size = 8.6, colour = INK, gap = 6): void {
    this.font('regular', size, colour)
    const h = this.doc.heightOfString(s, { width: CONTENT_W, lineGap: 1.5 })
    this.ensure(h)
    this.doc.text(s, MARGIN.left, this.y, { width: CONTENT_W, lineGap: 1.5 })
    this.y += h + gap
  }

  heading(s: string, keepWith = 60): void {
    this.ensure(22 + keepWith)
    this.y += 6
    this.doc.save().rect(MARGIN.left, this.y + 1, 3, 11).fill(ACCENT).restore()
    this.font('semibold', 10.5, INK)
    this.doc.text(s, MARGIN.left + 9, this.y, { width: CONTENT_W - 9, lineBreak: false })
    this.y += 18
  }

  /** Label–value rows in a column; returns the height used. */
  fields(rows: [string, string][], x: number, width: number, labelWidth = 92): number {
    const start = this.y
    for (const [label, value] of rows) {
      this.font('regular', 8.6, INK)
      const h = Math.max(this.doc.heightOfString(value, { width: width - labelWidth, lineGap: 1 }), 11)
      this.font('regular', 7.8, MUTED)
      this.doc.text(label, x, this.y + 0.8, { width: labelWidth - 6, lineBreak: false })
      this.font('regular', 8.6, INK)
      this.doc.text(value, x + labelWidth, this.y, { width: width - labelWidth, lineGap: 1 })
      this.y += h + 3
    }
    const used = this.y - start
    this.y = start
    return used
  }
}

// ---------------------------------------------------------------- sections

function titleBlock(w: Writer, d: CertificateData): void {
  const { doc } = w
  w.font('semibold', 22, INK)
  doc.text('Calibration Certificate', MARGIN.left, w.y, { lineBreak: false })
  w.font('regular', 9.5, MUTED)
  doc.text('Radiation thermometer', MARGIN.left, w.y + 28, { lineBreak: false })
  // Number box on the right.
  const bw = 190
  const bx = PAGE.width - MARGIN.right - bw
  doc.save().roundedRect(bx, w.y - 2, bw, 44, 3).fill(SHADE).restore()
  w.font('regular', 7.5, MUTED)
  doc.text('CERTIFICATE NUMBER', bx + 10, w.y + 5, { width: bw - 20, characterSpacing: 0.6, lineBreak: false })
  w.font('semibold', 14, INK)
  doc.text(d.number, bx + 10, w.y + 18, { width: bw - 20, lineBreak: false })
  w.y += 52
  doc.save().moveTo(MARGIN.left, w.y).lineTo(PAGE.width - MARGIN.right, w.y).lineWidth(0.6).strokeColor(RULE).stroke().restore()
  w.y += 10
}

function amendmentNotice(w: Writer, d: CertificateData): void {
  if (!d.amends) return
  const changes = d.amends.changes.length ? ` What changed: ${d.amends.changes.join('; ')}.` : ''
  const s = `Revision ${d.revision}. This certificate replaces certificate ${d.amends.number} issued on ${longDate(d.amends.issueDate)}, which is superseded and no longer valid. Reason for the amendment: ${d.amends.reason}.${changes}`
  w.font('regular', 8.6, INK)
  const h = w.doc.heightOfString(s, { width: CONTENT_W - 20 }) + 12
  w.ensure(h)
  w.doc.save().rect(MARGIN.left, w.y, CONTENT_W, h).fill('#fff8ec').restore()
  w.doc.save().rect(MARGIN.left, w.y, 3, h).fill(AMBER).restore()
  w.font('regular', 8.6, INK)
  w.doc.text(s, MARGIN.left + 12, w.y + 6, { width: CONTENT_W - 20 })
  w.y += h + 8
}

function partiesBlock(w: Writer, d: CertificateData): void {
  const col = (CONTENT_W - 20) / 2
  const left = MARGIN.left
  const right = MARGIN.left + col + 20
  w.ensure(150)
  w.font('semibold', 8, MUTED)
  w.doc.text('ISSUED BY', left, w.y, { characterSpacing: 0.6, lineBreak: false })
  w.doc.text('CUSTOMER', right, w.y, { characterSpacing: 0.6, lineBreak: false })
  w.y += 13
  const start = w.y
  w.font('semibold', 9.5, INK)
  w.doc.text(d.lab.name, left, w.y, { width: col })
  w.font('regular', 8.6, INK)
  const contact = [d.lab.phone ? `Tel. ${d.lab.phone}` : null, d.lab.email].filter(Boolean).join(' · ')
  w.doc.text([...d.lab.addressLines, contact].filter(Boolean).join('\n'), { width: col, lineGap: 1 })
  w.font('regular', 8, MUTED)
  w.doc.text(`Accredited by ${d.lab.accreditationBody}, calibration laboratory No. ${d.lab.accreditationNumber}`, { width: col, lineGap: 1 })
  const leftEnd = w.doc.y
  w.font('semibold', 9.5, INK)
  w.doc.text(d.customer.name, right, start, { width: col })
  w.font('regular', 8.6, INK)
  w.doc.text(d.customer.addressLines.join('\n') || 'Address not recorded', { width: col, lineGap: 1 })
  w.y = Math.max(leftEnd, w.doc.y) + 10
}

function itemBlock(w: Writer, d: CertificateData): void {
  w.heading('Item calibrated', 110)
  const col = (CONTENT_W - 20) / 2
  const i = d.instrument
  const left = w.fields([
    ['Instrument', `${i.maker} ${i.model}`],
    ['Type', i.kind],
    ['Serial number', i.serial],
    ['Asset tag', i.assetTag ?? '—'],
  ], MARGIN.left, col, 80)
  const right = w.fields([
    // a ratio pyrometer's two bands on two rows
    ...(d.ratio ? [['Band 1', d.ratio.band1], ['Band 2', d.ratio.band2]] as [string, string][] : [['Spectral band', i.band]] as [string, string][]),
    ['Measuring range', i.rangeText],
    ['Resolution', i.resolutionText],
    ['Specification', i.accuracyText],
  ], MARGIN.left + col + 20, col, 86)
  w.y += Math.max(left, right) + 2
  receiptBlock(w, d)
}

/** The condition on receipt, as the receipt record states it (ISO/IEC 17025 7.4, 7.8.2.1 e). */
function receiptBlock(w: Writer, d: CertificateData): void {
  const r = d.receipt
  const rows: [string, string][] = [
    ['Received', longDate(r.receivedOn)],
    ['Packaging', r.packaging],
    ['Condition on receipt', r.condition],
  ]
  if (r.accessories) rows.push(['Accessories', r.accessories])
  if (r.deviations) rows.push(['Deviations found', r.deviations])
  if (r.customerConsulted) rows.push(['Customer consulted', r.customerDecision ?? 'Yes'])
  w.ensure(14 * rows.length + 10)
  w.y += w.fields(rows, MARGIN.left, CONTENT_W, 110) + 2
  if (d.adjusted) w.paragraph('The instrument was adjusted during the calibration: results are given as found and as left.', 8.2, INK, 4)
}

function methodBlock(w: Writer, d: CertificateData): void {
  w.heading('Method, dates and conditions', 120)
  const col = (CONTENT_W - 20) / 2
  const e = d.environment
  const left = w.fields([
    ['Procedure', d.method.procedureName],
    ['Document', `${d.method.documentReference}, procedure version ${d.method.versionNumber}`],
    ['Item received', longDate(d.dates.received)],
    ['Calibrated', longDate(d.dates.calibrated)],
    ['Issued', longDate(d.dates.issued)],
    ['Place', d.place.kind === 'laboratory' ? `In the laboratory: ${d.place.addressLines.join(', ')}` : `At the customer’s site: ${d.place.addressLines.join(', ')}`],
  ], MARGIN.left, col, 80)
  const conditions: [string, string][] = [
    ['Ambient', `${celsius(e.ambientK, 1)} °C, ${formatFixed(e.relativeHumidityPct, 0)} %RH${e.measuredWith ? ` (${e.measuredWith})` : ''}`],
    ['Distance', `${formatFixed(e.distanceMm, 0)} mm from the source`],
  ]
  if (d.ratio) conditions.push(['Emissivity-ratio setting', formatFixed(d.ratio.emissivityRatioSetting, 3)])
  if (e.emissivitySetting !== null) conditions.push(['Emissivity setting', formatFixed(e.emissivitySetting, 3)])
  conditions.push(['Reflected temperature', `${celsius(e.reflectedK, 1)} °C`])
  if (e.instrumentK !== null) conditions.push(['Instrument temperature', `${celsius(e.instrumentK, 1)} °C`])
  if (d.imager) {
    conditions.push(['Lens', d.imager.lens], ['Field of view', d.imager.fieldOfView], ['Range setting', d.imager.rangeSetting], ['Non-uniformity correction', d.imager.nonUniformityCorrection ? 'done before measuring' : 'not done'])
  }
  const right = w.fields(conditions, MARGIN.left + col + 20, col, 108)
  w.y += Math.max(left, right) + 2
  w.paragraph(`Deviations from the method: ${d.methodDeviations ?? 'none recorded.'}`, 8.2, INK, 4)
  const model = d.ratio
    ? `The instrument is a ratio (two-colour) pyrometer: its expected reading is the temperature T_R whose blackbody band radiances in band 1 (${d.ratio.band1}) and band 2 (${d.ratio.band2}) have the ratio of the source’s signals divided by the emissivity-ratio setting k = ${formatFixed(d.ratio.emissivityRatioSetting, 3)}, each signal holding the source emissivity in its band and the reflected radiation. Source emissivity used: ${d.ratio.sources.map(x => `${x.assetTag} ε1 = ${x.emissivity1} in band 1, ε2 = ${x.emissivity2} in band 2`).join('; ')}.`
    : d.imager
      ? `The instrument is a thermal imager: the error is stated at its centre region of interest (“${d.imager.centreRoi}”); the expected reading accounts for the source emissivity, the reflected radiation and the instrument temperature in the instrument’s spectral band.`
      : 'The expected reading accounts for the source emissivity, the reflected radiation and the instrument temperature in the instrument’s spectral band.'
  w.paragraph(`The instrument viewed the blackbody source at the distance and ${d.ratio ? 'ratio setting' : 'emissivity setting'} stated. ${d.referenceBasis} ${model}`, 8, MUTED, 4)
}

/** The result columns; tolerance and verdict only where a statement of conformity is made. */
function resultColumns(withConformity: boolean): { title: string, w: number }[] {
  const cols = [
    { title: 'Reference\ntemperature °C', w: 66 },
    { title: 'Expected\nreading °C', w: 60 },
    { title: 'Mean\nreading °C', w: 58 },
    { title: 'n', w: 22 },
    { title: 'Error\n°C', w: 50 },
    { title: 'Expanded\nuncertainty U °C', w: 70 },
    { title: 'k', w: 30 },
  ]
  if (withConformity) cols.push({ title: 'Tolerance\n±TL °C', w: 54 }, { title: 'Verdict', w: 0 })
  const used = cols.reduce((a, c) => a + c.w, 0)
  // The last column takes the rest of the width.
  if (withConformity) cols[cols.length - 1]!.w = CONTENT_W - used
  else cols[0]!.w += CONTENT_W - used
  return cols
}

function resultsTable(w: Writer, title: string, points: CertificatePoint[], withConformity: boolean): void {
  const { doc } = w
  const rowH = 15.5
  const COLS = resultColumns(withConformity)
  const header = () => {
    doc.save().rect(MARGIN.left, w.y, CONTENT_W, 26).fill(INK).restore()
    let x = MARGIN.left
    w.font('semibold', 7.4, '#ffffff')
    for (const c of COLS) {
      doc.text(c.title, x + 4, w.y + 4, { width: c.w - 8, align: c.title === 'Verdict' ? 'left' : 'right', lineGap: -0.5 })
      x += c.w
    }
    w.y += 26
  }
  w.ensure(44 + rowH * Math.min(points.length, 3))
  w.font('semibold', 9, ACCENT)
  doc.text(title, MARGIN.left, w.y, { lineBreak: false })
  w.y += 14
  header()
  points.forEach((p, i) => {
    if (w.y + rowH > BOTTOM) {
      doc.addPage()
      w.y = MARGIN.top
      w.font('semibold', 9, ACCENT)
      doc.text(`${title} (continued)`, MARGIN.left, w.y, { lineBreak: false })
      w.y += 14
      header()
    }
    if (i % 2 === 1) doc.save().rect(MARGIN.left, w.y, CONTENT_W, rowH).fill(SHADE).restore()
    const dec = Math.max(2, decimalsOf(p.uncertaintyText))
    const cells = [
      celsius(p.referenceK, dec),
      celsius(p.expectedK, dec),
      celsius(p.meanK, dec),
      String(p.n),
      signed(p.errorText),
      p.uncertaintyText,
      formatFixed(p.coverageFactor, 2),
      ...(withConformity ? [formatFixed(p.toleranceK, dec)] : []),
    ]
    let x = MARGIN.left
    w.font('regular', 8.6, INK)
    cells.forEach((c, j) => {
      doc.text(c, x + 4, w.y + 3.6, { width: COLS[j]!.w - 8, align: 'right', lineBreak: false })
      x += COLS[j]!.w
    })
    if (withConformity) {
      const vc = VERDICT_COLOUR[p.verdict]
      doc.save().circle(x + 8, w.y + rowH / 2, 2.6).fill(vc).restore()
      w.font('semibold', 8.2, vc)
      doc.text(VERDICT_TEXT[p.verdict], x + 14, w.y + 3.9, { width: COLS[COLS.length - 1]!.w - 16, lineBreak: false })
    }
    w.y += rowH
  })
  doc.save().moveTo(MARGIN.left, w.y).lineTo(PAGE.width - MARGIN.right, w.y).lineWidth(0.6).strokeColor(RULE).stroke().restore()
  w.y += 8
}

function resultsBlock(w: Writer, d: CertificateData): void {
  w.heading('Results', 90)
  const found = d.points.filter(p => p.stage === 'as-found')
  const left = d.points.filter(p => p.stage === 'as-left')
  const withConformity = d.agreement !== null
  resultsTable(w, d.adjusted ? 'As found (before adjustment)' : 'As found and as left (no adjustment made)', found, withConformity)
  if (d.adjusted && left.length) resultsTable(w, 'As left (after adjustment)', left, withConformity)
  w.paragraph(`Temperatures are stated on the International Temperature Scale of 1990 in degrees Celsius; t/°C = T/K − 273.15, and a difference of 1 °C equals 1 K. Error = mean reading − expected reading${d.imager ? ` at the centre region of interest (“${d.imager.centreRoi}”)` : ''}; the correction is the error with its sign reversed. n is the number of readings averaged at each point. Values are rounded to the decimal place of their expanded uncertainty.`, 8, MUTED)
  if (d.imager) imagerBlock(w, d, d.imager)
}

/** A small table: header row and rows of text cells, columns right-aligned but the first. */
function smallTable(w: Writer, cols: { title: string, w: number, align?: 'left' | 'right' }[], rows: string[][]): void {
  const { doc } = w
  const rowH = 14
  const head = () => {
    doc.save().rect(MARGIN.left, w.y, CONTENT_W, 24).fill(INK).restore()
    let x = MARGIN.left
    w.font('semibold', 7.4, '#ffffff')
    for (const c of cols) {
      doc.text(c.title, x + 4, w.y + 4, { width: c.w - 8, align: c.align ?? 'right', lineGap: -0.5 })
      x += c.w
    }
    w.y += 24
  }
  w.ensure(24 + rowH * Math.min(rows.length, 3))
  head()
  rows.forEach((cells, i) => {
    if (w.y + rowH > BOTTOM) {
      doc.addPage()
      w.y = MARGIN.top
      head()
    }
    if (i % 2 === 1) doc.save().rect(MARGIN.left, w.y, CONTENT_W, rowH).fill(SHADE).restore()
    let x = MARGIN.left
    w.font('regular', 8.4, INK)
    cells.forEach((c, j) => {
      doc.text(c, x + 4, w.y + 3.2, { width: cols[j]!.w - 8, align: cols[j]!.align ?? 'right', lineBreak: false })
      x += cols[j]!.w
    })
    w.y += rowH
  })
  doc.save().moveTo(MARGIN.left, w.y).lineTo(PAGE.width - MARGIN.right, w.y).lineWidth(0.6).strokeColor(RULE).stroke().restore()
  w.y += 8
}

/** Widths that fill the content width: the last column takes the rest. */
function widths(ws: number[]): number[] {
  const used = ws.slice(0, -1).reduce((a, b) => a + b, 0)
  return [...ws.slice(0, -1), CONTENT_W - used]
}

/** A thermal imager: the centre ROI's error with U and the non-uniformity per point, the ROIs, the NETD. */
function imagerBlock(w: Writer, d: CertificateData, im: CertificateImager): void {
  w.heading('Thermal imager: centre region of interest and uniformity', 90)
  const ws = widths([78, 78, 70, 34, 100, 90, 0])
  const rows = d.points.map((p) => {
    const dec = Math.max(2, decimalsOf(p.uncertaintyText))
    return [
      `${p.stage === 'as-left' ? 'as left' : d.adjusted ? 'as found' : ''} ${celsius(p.referenceK, dec)}`.trim(),
      signed(p.errorText),
      p.uncertaintyText,
      formatFixed(p.coverageFactor, 2),
      p.imager?.rangeText ?? '—',
      p.imager?.sdText ?? '—',
      String(p.imager?.roiCount ?? '—'),
    ]
  })
  smallTable(w, [
    { title: 'Reference\ntemperature °C', w: ws[0]!, align: 'left' },
    { title: 'Error at the\ncentre ROI °C', w: ws[1]! },
    { title: 'Expanded\nuncertainty U °C', w: ws[2]! },
    { title: 'k', w: ws[3]! },
    { title: 'Non-uniformity\nmax − min °C', w: ws[4]! },
    { title: 'Standard deviation\nof the ROI means °C', w: ws[5]! },
    { title: 'ROIs', w: ws[6]! },
  ], rows)
  w.paragraph('The non-uniformity is evaluated over the regions of interest on the uniform source: the largest minus the smallest ROI mean, and the sample standard deviation of the ROI means (n − 1), every ROI counted, the centre included (IEC TS 63144-1 and VDI/VDE 5585 ask for the non-uniformity; this evaluation is common practice). The uncertainty U applies to the error at the centre.', 8, MUTED)
  const rw = widths([150, 80, 80, 90, 0])
  smallTable(w, [
    { title: 'Region of interest', w: rw[0]!, align: 'left' },
    { title: 'x (px)', w: rw[1]! },
    { title: 'y (px)', w: rw[2]! },
    { title: 'Width (px)', w: rw[3]! },
    { title: 'Height (px)', w: rw[4]! },
  ], im.rois.map(r => [r.name === im.centreRoi ? `${r.name} (centre)` : r.name, String(r.xPx), String(r.yPx), String(r.widthPx), String(r.heightPx)]))
  w.paragraph('Positions are those of each region’s top-left corner in the image, in pixels from its top-left corner.', 8, MUTED)
  if (im.netd.length) {
    const text = im.netd.map(n => `at ${celsius(n.referenceK, 1)} °C: NETD = ${n.netdText} K (${n.roiCount} region${n.roiCount === 1 ? '' : 's'} of interest, ${n.frameCount} frames)`).join('; ')
    w.paragraph(`Noise-equivalent temperature difference (NETD), ${text}. Evaluated as the temporal standard deviation (n − 1) of each region’s value over a series of frames on the uniform, stable source, averaged over the regions: common practice — no standard is named for this evaluation.`)
  }
}

/** The calibration equation and its table of interpolated values, clearly marked as such. */
function equationBlock(w: Writer, d: CertificateData, eq: CertificateEquation): void {
  w.heading('Calibration equation (interpolated values)', 120)
  const params = eq.parameters.map(p => `${p.name} = ${p.valueText} ${p.unit === '1' ? '' : p.unit} (u = ${p.uText}${p.unit === '1' ? '' : ` ${p.unit}`})`.replace(/\s+\(/, ' (')).join(', ')
  w.paragraph(`The Sakuma–Hattori equation was fitted by weighted least squares through the ${eq.pointCount} ${eq.points === 'as-left' ? 'as-left ' : ''}calibration points (${celsius(eq.rangeK.min, 1)} °C to ${celsius(eq.rangeK.max, 1)} °C), each weighted by its uncertainty${eq.pointCorrelation > 0 ? `, with a correlation coefficient r = ${formatFixed(eq.pointCorrelation, 2)} between the points` : ', taken as independent'}: T = c₂/(A·ln(C/s + 1)) − B/A, where s = 1/(exp(c₂/(A₀·R + B₀)) − 1) is the signal of the reading R in the instrument’s nominal band (${eq.nominalText}). Parameters: ${params}; χ² = ${eq.chiSquaredText} with ${eq.degreesOfFreedom} degree${eq.degreesOfFreedom === 1 ? '' : 's'} of freedom.`)
  const ws = widths([130, 120, 100, 0])
  smallTable(w, [
    { title: 'Temperature °C\n(interpolated)', w: ws[0]!, align: 'left' },
    { title: 'Indicated reading °C\n(from the equation)', w: ws[1]! },
    { title: 'Correction °C', w: ws[2]! },
    { title: `Expanded uncertainty U °C\n(k = ${formatFixed(eq.coverageFactor, 0)}) of the interpolated value`, w: ws[3]! },
  ], eq.rows.map(r => [`${celsius(r.temperatureK, Math.max(1, decimalsOf(r.uncertaintyText)))} (interpolated)`, r.readingText, signed(r.correctionText), r.uncertaintyText]))
  w.paragraph(`The values in this table are interpolated with the calibration equation between the calibration points; they were not measured. U comes from the covariance of the equation’s parameters, which carries the points’ uncertainties (JCGM 100:2008 with correlations); k = ${formatFixed(eq.coverageFactor, 0)} gives a coverage probability of about 95 % for a normal distribution. The equation is not valid outside ${celsius(eq.rangeK.min, 1)} °C to ${celsius(eq.rangeK.max, 1)} °C and must not be extrapolated.`, 8, MUTED)
}

function chart(w: Writer, d: CertificateData): void {
  const { doc } = w
  const height = 190
  w.ensure(height + 40)
  w.font('semibold', 9, ACCENT)
  doc.text(d.agreement ? 'Error against temperature, with ±U and the tolerance limits' : 'Error against temperature, with ±U', MARGIN.left, w.y, { lineBreak: false })
  w.y += 16
  const plot = { x: MARGIN.left + 44, y: w.y + 6, w: CONTENT_W - 60, h: height - 40 }
  const temps = d.points.map(p => p.referenceK - C0)
  let tMin = Math.min(...temps)
  let tMax = Math.max(...temps)
  if (tMax - tMin < 1e-9) { tMin -= 10; tMax += 10 }
  const padT = (tMax - tMin) * 0.08
  tMin -= padT
  tMax += padT
  const withLimits = d.agreement !== null
  const eMax = Math.max(...d.points.map(p => Math.max(Math.abs(p.errorK) + p.uncertaintyK, withLimits ? p.toleranceK : 0))) * 1.15 || 1
  const X = (t: number) => plot.x + ((t - tMin) / (tMax - tMin)) * plot.w
  const Y = (e: number) => plot.y + plot.h / 2 - (e / eMax) * (plot.h / 2)

  // Frame, zero line, grid and ticks.
  doc.save().rect(plot.x, plot.y, plot.w, plot.h).lineWidth(0.6).strokeColor(RULE).stroke().restore()
  const step = niceStep(eMax)
  w.font('regular', 7, MUTED)
  for (let v = -Math.floor(eMax / step) * step; v <= eMax + 1e-9; v += step) {
    const y = Y(v)
    doc.save().moveTo(plot.x, y).lineTo(plot.x + plot.w, y).lineWidth(v === 0 ? 0.8 : 0.3).strokeColor(v === 0 ? MUTED : RULE).stroke().restore()
    doc.text(tick(v, step < 0.1 ? 2 : step < 1 ? 1 : 0), plot.x - 40, y - 3.5, { width: 36, align: 'right', lineBreak: false })
  }
  const tStep = niceStep((tMax - tMin) / 2)
  for (let t = Math.ceil(tMin / tStep) * tStep; t <= tMax + 1e-9; t += tStep) {
    const x = X(t)
    doc.save().moveTo(x, plot.y + plot.h).lineTo(x, plot.y + plot.h + 3).lineWidth(0.6).strokeColor(MUTED).stroke().restore()
    doc.text(tick(t, tStep < 1 ? 1 : 0), x - 20, plot.y + plot.h + 5, { width: 40, align: 'center', lineBreak: false })
  }
  doc.text('Reference temperature / °C', plot.x, plot.y + plot.h + 16, { width: plot.w, align: 'center', lineBreak: false })
  doc.save().rotate(-90, { origin: [MARGIN.left + 6, plot.y + plot.h / 2] })
  doc.text('Error / °C', MARGIN.left + 6 - 40, plot.y + plot.h / 2 - 4, { width: 80, align: 'center', lineBreak: false })
  doc.restore()

  // Tolerance limits ±TL: a dashed line through the points' limits, in order of temperature.
  const byT = [...d.points].sort((a, b) => a.referenceK - b.referenceK)
  const limit = (sign: 1 | -1) => {
    const pts = byT.length === 1
      ? [[byT[0]!.referenceK - C0 - padT * 0.8, byT[0]!.toleranceK], [byT[0]!.referenceK - C0 + padT * 0.8, byT[0]!.toleranceK]] as const
      : byT.map(p => [p.referenceK - C0, p.toleranceK] as const)
    doc.save()
    pts.forEach(([t, tl], i) => (i === 0 ? doc.moveTo(X(t), Y(sign * tl)) : doc.lineTo(X(t), Y(sign * tl))))
    doc.lineWidth(1).dash(4, { space: 3 }).strokeColor(AMBER).stroke().undash().restore()
  }
  if (withLimits) {
    limit(1)
    limit(-1)
  }

  // Points with ±U bars; as left drawn as hollow squares beside the as-found dots.
  const shift = d.adjusted ? plot.w * 0.008 : 0
  for (const p of d.points) {
    const x = X(p.referenceK - C0) + (p.stage === 'as-left' ? shift : -shift)
    const colour = p.stage === 'as-left' ? ACCENT : INK
    doc.save().moveTo(x, Y(p.errorK - p.uncertaintyK)).lineTo(x, Y(p.errorK + p.uncertaintyK)).lineWidth(0.9).strokeColor(colour).stroke()
    for (const e of [p.errorK - p.uncertaintyK, p.errorK + p.uncertaintyK]) doc.moveTo(x - 3, Y(e)).lineTo(x + 3, Y(e)).stroke()
    doc.restore()
    if (p.stage === 'as-left') doc.save().rect(x - 2.6, Y(p.errorK) - 2.6, 5.2, 5.2).lineWidth(1).fillAndStroke('#ffffff', colour).restore()
    else doc.save().circle(x, Y(p.errorK), 2.8).fill(colour).restore()
  }

  // Legend.
  const ly = plot.y + plot.h + 30
  let lx = plot.x
  w.font('regular', 7.5, INK)
  doc.save().circle(lx + 3, ly + 3.5, 2.8).fill(INK).restore()
  doc.text(d.adjusted ? 'As found, error ± U' : 'Error ± U', lx + 10, ly, { lineBreak: false })
  lx += 90
  if (d.adjusted) {
    doc.save().rect(lx, ly + 1, 5.2, 5.2).lineWidth(1).fillAndStroke('#ffffff', ACCENT).restore()
    doc.text('As left, error ± U', lx + 10, ly, { lineBreak: false })
    lx += 90
  }
  if (withLimits) {
    doc.save().moveTo(lx, ly + 3.5).lineTo(lx + 16, ly + 3.5).lineWidth(1).dash(4, { space: 3 }).strokeColor(AMBER).stroke().undash().restore()
    doc.text('Tolerance limits ±TL (agreed specification)', lx + 22, ly, { lineBreak: false })
  }
  w.y = ly + 18
}

function niceStep(range: number): number {
  const raw = range / 3
  const p = 10 ** Math.floor(Math.log10(raw))
  const m = raw / p
  return (m < 1.5 ? 1 : m < 3.5 ? 2 : m < 7.5 ? 5 : 10) * p
}

function uncertaintyBlock(w: Writer, d: CertificateData): void {
  w.heading('Measurement uncertainty', 80)
  const ks = [...new Set(d.points.map(p => p.coverageFactor.toFixed(2)))]
  const normal = ks.every(k => k === '2.00')
  const kText = ks.length === 1 ? `k = ${ks[0]}` : `k from ${ks[0]} to ${ks[ks.length - 1]} as stated for each point`
  w.paragraph(`The expanded uncertainty U stated is the standard uncertainty of measurement multiplied by the coverage factor ${kText}, which ${normal ? 'for a normal distribution corresponds' : 'for a t-distribution with the effective degrees of freedom of the budget (Welch–Satterthwaite, GUM G.4) corresponds'} to a coverage probability of approximately ${(d.coverageProbability * 100).toFixed(0)} %. It has been determined in accordance with the Guide to the Expression of Uncertainty in Measurement (JCGM 100:2008) and includes contributions from the reference standard, the source emissivity and uniformity, reflected radiation, the instrument’s resolution and the repeatability of the readings. Where the laboratory’s calibration and measurement capability exceeds the computed value, the capability is stated. The uncertainty does not include the long-term stability of the instrument.`)
}

function traceabilityBlock(w: Writer, d: CertificateData): void {
  w.heading('Traceability', 80)
  w.paragraph(d.statements.traceability)
  const { doc } = w
  const cols = [{ t: 'Role', w: 110 }, { t: 'Asset tag', w: 70 }, { t: 'Equipment', w: 145 }, { t: 'Calibration certificate', w: 170.28 }]
  w.ensure(20 + 15 * d.equipment.length)
  let x = MARGIN.left
  w.font('semibold', 7.6, MUTED)
  for (const c of cols) {
    doc.text(c.t, x, w.y, { width: c.w - 6, lineBreak: false })
    x += c.w
  }
  w.y += 12
  doc.save().moveTo(MARGIN.left, w.y - 2).lineTo(PAGE.width - MARGIN.right, w.y - 2).lineWidth(0.5).strokeColor(RULE).stroke().restore()
  for (const e of d.equipment) {
    const cert = e.certificateNumber ? `${e.certificateNumber}${e.provider ? `, ${e.provider}` : ''}${e.calibrationDate ? `, ${longDate(e.calibrationDate)}` : ''}` : 'No external calibration recorded'
    const cells = [e.role, e.assetTag, e.description, cert]
    w.font('regular', 8.2, INK)
    const h = Math.max(...cells.map((c, i) => doc.heightOfString(c, { width: cols[i]!.w - 6 }))) + 4
    w.ensure(h)
    x = MARGIN.left
    cells.forEach((c, i) => {
      doc.text(c, x, w.y, { width: cols[i]!.w - 6 })
      x += cols[i]!.w
    })
    w.y += h
  }
  w.y += 6
}

/**
 * The points a statement of conformity speaks for (as left when the instrument was adjusted, else
 * all) and the least favourable verdict among them (fail, then conditional fail, then conditional
 * pass, then pass: ILAC-G8:09/2019 non-binary statements). The PDF and the DCC state the same.
 */
export function overallConformity(d: Pick<CertificateData, 'adjusted' | 'points'>): { basis: CertificatePoint[], worst: Verdict } {
  const stagePoints = d.adjusted ? d.points.filter(p => p.stage === 'as-left') : d.points
  const basis = stagePoints.length ? stagePoints : d.points
  const worst: Verdict = basis.some(p => p.verdict === 'fail') ? 'fail' : basis.some(p => p.verdict === 'conditional-fail') ? 'conditional-fail' : basis.some(p => p.verdict === 'conditional-pass') ? 'conditional-pass' : 'pass'
  return { basis, worst }
}

/** A probability of conformity as the certificate prints it: one decimal of a percent, never 0 % or 100 %. */
export function probabilityText(p: number): string {
  if (p >= 0.9995) return 'above 99.9 %'
  if (p <= 0.0005) return 'below 0.1 %'
  return `${formatFixed(p * 100, 1)} %`
}

function conformityBlock(w: Writer, d: CertificateData): void {
  w.heading('Statement of conformity', 70)
  const a = d.agreement
  if (!a) {
    w.paragraph('No statement of conformity is made: no specification and decision rule were agreed with the customer for this calibration (ISO/IEC 17025:2017 7.1.3, 7.8.6). The results above state the error and its uncertainty at each point.')
    return
  }
  const rule = [a.ruleLabel, a.guardBandText].filter(Boolean).join(', ')
  w.paragraph(`Specification and decision rule agreed with the customer on ${longDate(a.agreedOn)} (${a.how}): ${a.specificationText}; ${rule} (${a.ruleReference}). ${d.statements.decisionRule}`)
  const { basis, worst } = overallConformity(d)
  const summary = {
    'pass': 'meets the specification at every point',
    'conditional-pass': 'meets the specification at every point, at some points only conditionally (the error lies within the limits but the uncertainty interval crosses a limit)',
    'conditional-fail': 'does not meet the specification at some points: the error lies outside the acceptance limit but within the uncertainty of a limit',
    'fail': 'does not meet the specification at one or more points',
  }[worst]
  const per = basis.map((p) => {
    const dec = Math.max(1, decimalsOf(p.uncertaintyText))
    const pc = p.probabilityOfConformity == null ? '' : ` (probability of conformity ${probabilityText(p.probabilityOfConformity)})`
    return `${celsius(p.referenceK, dec)} °C: ${VERDICT_TEXT[p.verdict].toLowerCase()}${pc}`
  }).join('; ')
  const withProbability = basis.some(p => p.probabilityOfConformity != null)
  w.paragraph(`The instrument ${d.adjusted ? 'as left ' : ''}${summary}. Verdict per point — ${per}.${withProbability ? ' The probability of conformity is that of the error lying within the tolerance for a normal distribution with the standard uncertainty U/k (JCGM 106:2012).' : ''}`)
}

/** The height the closing (remarks, statements, signature) needs, so it is never left alone on a page. */
function closingHeight(w: Writer, d: CertificateData): number {
  w.font('regular', 8.6, INK)
  const remarks = d.remarks ? w.doc.heightOfString(d.remarks, { width: CONTENT_W, lineGap: 1.5 }) + 30 : 0
  const statements = w.doc.heightOfString([d.statements.items, d.statements.reproduction].filter(Boolean).join(' '), { width: CONTENT_W, lineGap: 1.5 }) + 10
  return remarks + statements + 112 + 40
}

function closingBlock(w: Writer, d: CertificateData): Promise<void> {
  return (async () => {
    if (d.remarks) {
      w.heading('Remarks', 30)
      w.paragraph(d.remarks)
    }
    w.paragraph([d.statements.items, d.statements.reproduction].filter(Boolean).join(' '), 8, MUTED, 10)
    const { doc } = w
    const blockH = 112
    w.ensure(blockH + 30)
    const top = w.y
    doc.save().roundedRect(MARGIN.left, top, CONTENT_W, blockH, 3).lineWidth(0.7).strokeColor(RULE).stroke().restore()
    w.font('semibold', 8, MUTED)
    doc.text(d.draft ? 'DRAFT FOR REVIEW — NOT SIGNED' : 'AUTHORIZED FOR ISSUE', MARGIN.left + 14, top + 12, { characterSpacing: 0.6, lineBreak: false })
    w.font('semibold', 12, INK)
    doc.text(d.signatory.name, MARGIN.left + 14, top + 28, { lineBreak: false })
    w.font('regular', 9, INK)
    doc.text(d.signatory.function, MARGIN.left + 14, top + 45, { lineBreak: false })
    w.font('regular', 7.8, MUTED)
    const signed = new Date(d.signatory.signedAt)
    doc.text(d.draft
      ? `Preview made on ${longDate(d.signatory.signedAt)} for review before signing. It is not a valid certificate: it has no number, no signature and no verification code.`
      : `Signed electronically on ${longDate(d.signatory.signedAt)} at ${signed.toISOString().slice(11, 16)} UTC; the signature means “${d.signatory.meaning}” and was made by the signatory re-entering their password.`, MARGIN.left + 14, top + 62, { width: 300, lineGap: 1 })
    // QR code to the verification page (a draft has nothing to verify).
    if (!d.draft) {
      const qx = PAGE.width - MARGIN.right - 14 - 80
      drawQr(doc, d.verification.url, qx, top + 14, 80)
      w.font('regular', 7, MUTED)
      doc.text('Verify this certificate', qx - 100, top + 16, { width: 92, align: 'right', lineBreak: false })
      w.font('semibold', 9, INK)
      doc.text(d.verification.code.replace(/(.{5})(.{5})/, '$1 $2'), qx - 100, top + 27, { width: 92, align: 'right', lineBreak: false })
      w.font('regular', 6.6, MUTED)
      doc.text('Scan the code or enter the number and this code on the laboratory’s verification page.', qx - 100, top + 41, { width: 92, align: 'right', lineGap: 0.5 })
    }
    w.y = top + blockH + 14
    // The end mark.
    const cy = w.y + 6
    doc.save().moveTo(MARGIN.left, cy).lineTo(MARGIN.left + CONTENT_W / 2 - 70, cy).moveTo(MARGIN.left + CONTENT_W / 2 + 70, cy).lineTo(PAGE.width - MARGIN.right, cy)
      .lineWidth(0.8).strokeColor(INK).stroke().restore()
    w.font('semibold', 8.5, INK)
    doc.text('End of certificate', MARGIN.left + CONTENT_W / 2 - 70, cy - 5, { width: 140, align: 'center', characterSpacing: 0.4, lineBreak: false })
    w.y = cy + 14
  })()
}

/** Header and footer on every page, once the page count is known. */
function frame(doc: Doc, d: CertificateData): void {
  const range = doc.bufferedPageRange()
  for (let i = range.start; i < range.start + range.count; i++) {
    doc.switchToPage(i)
    // Header and footer sit in the margins: keep pdfkit from breaking the page for them.
    doc.page.margins.bottom = 0
    // Header: a kiln band with the laboratory's name; number and page on the right.
    doc.save().rect(0, 0, PAGE.width, 6).fill(INK).restore()
    doc.save().rect(0, 6, PAGE.width, 1.5).fill(ACCENT).restore()
    doc.font('PlexSemi').fontSize(8.5).fillColor(INK)
    doc.text(d.lab.name, MARGIN.left, 26, { width: 300, lineBreak: false })
    doc.font('Plex').fontSize(8).fillColor(MUTED)
    doc.text(`Accreditation No. ${d.lab.accreditationNumber}`, MARGIN.left, 38, { width: 300, lineBreak: false })
    doc.font('PlexSemi').fontSize(8.5).fillColor(INK)
    doc.text(`Certificate ${d.number}`, PAGE.width - MARGIN.right - 220, 26, { width: 220, align: 'right', lineBreak: false })
    doc.font('Plex').fontSize(8).fillColor(MUTED)
    doc.text(`Page ${i - range.start + 1} of ${range.count}`, PAGE.width - MARGIN.right - 220, 38, { width: 220, align: 'right', lineBreak: false })
    doc.save().moveTo(MARGIN.left, 54).lineTo(PAGE.width - MARGIN.right, 54).lineWidth(0.5).strokeColor(RULE).stroke().restore()
    // Footer.
    const fy = PAGE.height - 42
    doc.save().moveTo(MARGIN.left, fy).lineTo(PAGE.width - MARGIN.right, fy).lineWidth(0.5).strokeColor(RULE).stroke().restore()
    doc.font('Plex').fontSize(6.8).fillColor(MUTED)
    doc.text(`${d.lab.name} · accredited calibration laboratory No. ${d.lab.accreditationNumber}`, MARGIN.left, fy + 6, { width: CONTENT_W - 130, lineBreak: false })
    doc.text(d.draft
      ? 'Draft for review before signing — not a valid certificate'
      : `Verify: ${d.verification.url.replace(/^https?:\/\//, '').replace(/\?.*$/, '')} · code ${d.verification.code}`, MARGIN.left, fy + 16, { width: CONTENT_W - 130, lineBreak: false, ellipsis: true })
    doc.text(d.number, PAGE.width - MARGIN.right - 130, fy + 6, { width: 130, align: 'right', lineBreak: false })
    if (d.draft) {
      // A preview is marked on every page: it is not a certificate.
      doc.save().rotate(-35, { origin: [PAGE.width / 2, PAGE.height / 2] })
      doc.font('PlexSemi').fontSize(54).fillColor(AMBER).fillOpacity(0.16)
      doc.text('DRAFT — NOT VALID', 0, PAGE.height / 2 - 30, { width: PAGE.width, align: 'center', lineBreak: false })
      doc.restore()
    }
  }
}

/**
 * pdfkit parses a font file again for every document (most of a certificate's build time); it also
 * accepts the parsed font object itself. The first document parses the files, later ones reuse
 * the parsed fonts (each document still embeds its own subset).
 */
const parsedFonts = new WeakMap<CertificateFonts, { regular: unknown, semibold: unknown }>()

function registerFonts(doc: Doc, f: CertificateFonts): void {
  const parsed = parsedFonts.get(f)
  const asBuffer = (b: Uint8Array) => Buffer.from(b.buffer, b.byteOffset, b.byteLength)
  const current = () => (doc as unknown as { _font: { font: unknown } })._font.font
  doc.registerFont('Plex', (parsed?.regular ?? asBuffer(f.regular)) as Buffer)
  doc.registerFont('PlexSemi', (parsed?.semibold ?? asBuffer(f.semibold)) as Buffer)
  if (!parsed) {
    doc.font('PlexSemi')
    const semibold = current()
    doc.font('Plex')
    const regular = current()
    if (isLayoutFont(regular) && isLayoutFont(semibold)) parsedFonts.set(f, { regular: memoizedLayout(regular), semibold: memoizedLayout(semibold) })
  }
  doc.font('Plex')
}

interface LayoutFont {
  layout: (text: string, features?: unknown) => { glyphs: unknown[], positions: Record<string, number>[] }
}
const isLayoutFont = (f: unknown): f is LayoutFont => typeof (f as { layout?: unknown } | null)?.layout === 'function'

/**
 * The parsed font with its text shaping remembered across documents (the shaping of the same
 * words is most of the rest of the time). pdfkit scales the positions it gets in place, so each
 * call returns fresh copies of them; the glyphs are shared.
 */
function memoizedLayout(font: LayoutFont): unknown {
  const memo = new Map<string, { glyphs: unknown[], positions: Record<string, number>[] }>()
  const layout = (text: string, features?: unknown) => {
    const key = features === undefined ? text : `${JSON.stringify(features)}\u0000${text}`
    let run = memo.get(key)
    if (!run) {
      const r = font.layout(text, features)
      run = { glyphs: r.glyphs, positions: r.positions.map(p => ({ xAdvance: p.xAdvance!, yAdvance: p.yAdvance!, xOffset: p.xOffset!, yOffset: p.yOffset! })) }
      if (memo.size > 20_000) memo.clear()
      memo.set(key, run)
    }
    const positions = run.positions.map(p => ({ ...p }))
    // Like fontkit's GlyphRun: the advance is summed from the positions as they are when read.
    return { glyphs: [...run.glyphs], positions, get advanceWidth() { return positions.reduce((sum, p) => sum + p.xAdvance!, 0) } }
  }
  return new Proxy(font, {
    get(target, prop) {
      if (prop === 'layout') return layout
      const v: unknown = Reflect.get(target, prop, target)
      return typeof v === 'function' ? v.bind(target) : v
    },
  })
}

/** A QR code drawn as vector squares (crisp at any zoom, no image to decode). */
function drawQr(doc: Doc, text: string, x: number, y: number, size: number): void {
  const qr = QRCode.create(text, { errorCorrectionLevel: 'M' })
  const n = qr.modules.size
  const cell = size / n
  doc.save()
  for (let r = 0; r < n; r++) {
    for (let c = 0; c < n; c++) {
      if (qr.modules.get(r, c)) doc.rect(x + c * cell, y + r * cell, cell + 0.02, cell + 0.02)
    }
  }
  doc.fill(INK).restore()
}

/**
 * An A4 document of the laboratory's (certificates, quotes and invoices, the management review): the
 * embedded IBM Plex fonts registered as `Plex` and `PlexSemi` (parsed once and reused, see
 * registerFonts), pages buffered, and the bytes when the document ends.
 * @param fonts - the embedded fonts ({@link certificateFonts})
 * @param o - the page margins (the bottom one is the running footer's, below the content) and the PDF's info
 * @returns the document and a promise of its bytes once `doc.end()` is called
 */
export function openLabPdf(fonts: CertificateFonts, o: { margins: { top: number, left: number, right: number }, info: { Title: string, Author: string, Subject?: string } }): { doc: Doc, done: Promise<Buffer> } {
  const doc = new PDFDocument({
    size: 'A4',
    margins: { top: o.margins.top, bottom: 20, left: o.margins.left, right: o.margins.right },
    bufferPages: true,
    autoFirstPage: true,
    font: null as unknown as string,
    info: { ...o.info, Creator: 'Bandlight' },
    lang: 'en-GB',
  })
  const chunks: Buffer[] = []
  const done = new Promise<Buffer>((resolve, reject) => {
    doc.on('data', (c: Buffer) => chunks.push(c))
    doc.on('end', () => resolve(Buffer.concat(chunks)))
    doc.on('error', reject)
  })
  registerFonts(doc, fonts)
  return { doc, done }
}

/**
 * Build the certificate PDF from plain data.
 * @param data - what the certificate states (see CertificateData)
 * @param fonts - the embedded fonts; by default read once from the server assets
 * @returns the PDF bytes
 * @example const pdf = await certificatePdf(data) // Buffer starting with "%PDF-"
 */
export async function certificatePdf(data: CertificateData, fonts?: CertificateFonts): Promise<Buffer> {
  if (!data.points.length) throw new Error('a certificate needs at least one calibration point')
  const { doc, done } = openLabPdf(fonts ?? await certificateFonts(), {
    margins: MARGIN,
    info: { Title: `Calibration certificate ${data.number}`, Author: data.lab.name, Subject: `${data.instrument.maker} ${data.instrument.model}, serial ${data.instrument.serial}` },
  })
  const w = new Writer(doc)
  titleBlock(w, data)
  amendmentNotice(w, data)
  partiesBlock(w, data)
  itemBlock(w, data)
  methodBlock(w, data)
  resultsBlock(w, data)
  chart(w, data)
  if (data.equation) equationBlock(w, data, data.equation)
  uncertaintyBlock(w, data)
  traceabilityBlock(w, data)
  // The statement of conformity, the remarks and the signature stay together on one page.
  w.ensure(closingHeight(w, data) + 110)
  conformityBlock(w, data)
  await closingBlock(w, data)
  frame(doc, data)
  doc.end()
  return done
}
