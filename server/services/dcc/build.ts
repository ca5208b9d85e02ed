/**
 * The digital calibration certificate (DCC, PTB schema 3.1.2 with D-SI 2.1.0) of an issued
 * certificate revision, built with xmlbuilder2 from what the certificate states (its stored
 * `content`), the issued record (number and dates) and the signed PDF, which it embeds as its
 * `document`. Pure: no database, no files, no clock — the same input gives the same bytes, so the
 * DCC stored at issue can be built again from the record and compared.
 *
 * What goes where (DCC 3.1.2 element names):
 * - `administrativeData`: `dccSoftware` (this writer), `coreData` (country of the laboratory,
 *   language, unique identifier = certificate number, verification code, receipt date,
 *   performance dates = calibration date, place, `previousReport` for an amendment), the `item`
 *   (kind, band, range, maker, model, serial, asset tag, condition on receipt), the
 *   `calibrationLaboratory` (accreditation number as its code), the signatory (`respPerson`), the
 *   `customer`, and `statements` (traceability, accreditation, amendment, remarks, deviations,
 *   the statement of conformity with the agreed decision rule, or that none is made);
 * - `measurementResults`: one `measurementResult` per results table of the PDF (as found / as
 *   left), each with `usedMethods` (the procedure and its version; GUM for the uncertainty),
 *   `usedSoftware` (Bandlight and the engine version that computed the points),
 *   `measuringEquipments` (sources and reference instruments with their own certificate numbers),
 *   `influenceConditions` (ambient temperature, relative humidity, distance, reflected
 *   temperature, emissivity setting, instrument temperature) and one `result` per point:
 *   reference temperature, expected reading, indication (mean reading) and error of indication
 *   with `si:expandedUnc` (U, k, p) and — only when the certificate states conformity — its
 *   conformity (pass, conditionalPass, conditionalFail, fail) with the decision rule, the limits
 *   and the probability of conformity where the certificate states one;
 * - `document`: the PDF, base64, with its file name and type.
 *
 * Numbers are written as the PDF prints them: temperatures in kelvin to the decimal place of the
 * printed Celsius value (`kelvinFixed`), the error and U as the engine rounded them (GUM 7.2.6).
 */
import { create } from 'xmlbuilder2'
import { formatFixed, kelvinFixed, longDate } from '#shared/format'
import type { CertificateData, CertificatePoint } from '#server/services/certificates/pdf'
import { overallConformity, probabilityText } from '#server/services/certificates/pdf'
import { DCC_CONFORMITY, DCC_NS, DCC_SCHEMA_LOCATION, DCC_SCHEMA_VERSION, DCC_WRITER_RELEASE, REF, SI_NS, UNIT, XMLNS_NS, XSI_NS, countryCode } from './format'

type Node = ReturnType<typeof create>

/** Everything a DCC is built from. */
export interface DccInput {
  /** What the certificate states, as stored with it when it was signed. */
  content: CertificateData
  /** The issued record: the number (with its revision suffix) and its dates, YYYY-MM-DD. */
  certificate: { number: string, calibrationDate: string, issueDate: string }
  /** The signed PDF as stored (its SHA-256 is on the certificate) and the name it is downloaded under. */
  pdf: { bytes: Uint8Array, fileName: string }
  /** The revision this one replaces: its number and the SHA-256 of its PDF; null for a first issue. */
  previousReport: { number: string, pdfSha256: string } | null
  /** Versions of the calculation engine that computed the certified points (RunPoint.engineVersion). */
  engineVersions: readonly string[]
}

const LANG = 'en'

/** Text without the characters XML 1.0 cannot carry (C0 controls other than tab and line ends, U+FFFE/FFFF, lone surrogates). */
export function xmlText(s: string): string {
  // eslint-disable-next-line no-control-regex
  return s.replace(/[\u0000-\u0008\u000B\u000C\u000E-\u001F\uFFFE\uFFFF]/g, '').replace(/[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/g, '')
}

/** A decimal for D-SI from a rounded text: ASCII minus, no typographic signs, no sign on zero. */
export function dsiDecimal(text: string): string {
  const t = text.trim().replace(/^[\u2212\u2013]/, '-').replace(/^\+/, '')
  if (!/^-?(\d+\.?\d*|\.\d+)$/.test(t)) throw new Error(`not a decimal: ${text}`)
  return /[1-9]/.test(t) ? t : t.replace(/^-/, '')
}

/** A probability in [0, 1] as D-SI `probabilityValueType` wants it (no exponent): 0.9545 → "0.9545". */
export function dsiProbability(p: number): string {
  if (!(p >= 0 && p <= 1)) throw new Error(`not a probability: ${p}`)
  const t = formatFixed(p, 6).replace(/0+$/, '').replace(/\.$/, '')
  return t === '1' ? '1.0' : t.includes('.') ? t : `${t}.0`
}

/** The decimal places a point's temperatures are stated to: those of its U, at least two (as the PDF table). */
function pointDecimals(p: CertificatePoint): number {
  return Math.max(2, p.uncertaintyText.includes('.') ? p.uncertaintyText.split('.')[1]!.length : 0)
}

const dcc = (parent: Node, name: string, attributes?: Record<string, string>): Node => parent.ele(DCC_NS, `dcc:${name}`, attributes)
const si = (parent: Node, name: string): Node => parent.ele(SI_NS, `si:${name}`)
const leaf = (parent: Node, name: string, value: string): Node => dcc(parent, name).txt(xmlText(value))

/** A `textType` / `richContentType` body: one `content` per paragraph. */
function contents(parent: Node, texts: readonly string[]): Node {
  for (const t of texts.filter(Boolean)) dcc(parent, 'content', { lang: LANG }).txt(xmlText(t))
  return parent
}
const named = (parent: Node, element: string, ...texts: string[]): Node => contents(dcc(parent, element), texts)

/** `si:real` with value and unit, and an expanded uncertainty when given. */
function real(parent: Node, value: string, unit: string, unc?: { uncertainty: string, coverageFactor: string, coverageProbability: string }): Node {
  const r = si(parent, 'real')
  si(r, 'value').txt(dsiDecimal(value))
  si(r, 'unit').txt(unit)
  if (unc) {
    const e = si(r, 'expandedUnc')
    si(e, 'uncertainty').txt(dsiDecimal(unc.uncertainty))
    si(e, 'coverageFactor').txt(unc.coverageFactor)
    si(e, 'coverageProbability').txt(unc.coverageProbability)
  }
  return r
}

/** A `dcc:quantity` with a name, an optional description and a `si:real`. */
function quantity(parent: Node, o: { refType?: string, name: string, description?: string[], value: string, unit: string, unc?: Parameters<typeof real>[3] }): Node {
  const q = dcc(parent, 'quantity', o.refType ? { refType: o.refType } : undefined)
  named(q, 'name', o.name)
  if (o.description?.length) named(q, 'description', ...o.description)
  real(q, o.value, o.unit, o.unc)
  return q
}

/**
 * A contact's `location` from the address lines the certificate prints: each line as `further`,
 * and the country code when the last line names a country. At least one entry (the schema wants one).
 */
function location(parent: Node, addressLines: readonly string[]): void {
  const loc = dcc(parent, 'location')
  const code = countryCode(addressLines[addressLines.length - 1])
  if (code) leaf(loc, 'countryCode', code)
  const lines = addressLines.filter(Boolean)
  for (const line of lines) named(loc, 'further', line)
  if (!code && !lines.length) named(loc, 'further', 'Address not stated')
}

/** One statement: optional norm and refType, the declaration's paragraphs, an overall conformity. */
function statement(parent: Node, o: { refType?: string, traceable?: boolean, norm?: string, declaration: string[], conformity?: string }): void {
  const s = dcc(parent, 'statement', o.refType ? { refType: o.refType } : undefined)
  if (o.traceable !== undefined) leaf(s, 'traceable', String(o.traceable))
  if (o.norm) leaf(s, 'norm', o.norm)
  named(s, 'declaration', ...o.declaration)
  if (o.conformity) leaf(s, 'conformity', o.conformity)
}

function administrativeData(root: Node, input: DccInput): void {
  const { content: d, certificate: c } = input
  const a = dcc(root, 'administrativeData')

  const sw = dcc(dcc(a, 'dccSoftware'), 'software')
  named(sw, 'name', 'Bandlight')
  leaf(sw, 'release', DCC_WRITER_RELEASE)
  leaf(sw, 'type', 'application')
  named(sw, 'description', 'The DCC writer of Bandlight, which also issued the PDF certificate embedded in this DCC.')

  const core = dcc(a, 'coreData')
  // ISO 3166 "ZZ" (user-assigned, "unknown") when the laboratory's country is not recognized.
  leaf(core, 'countryCodeISO3166_1', countryCode(d.lab.addressLines[d.lab.addressLines.length - 1]) ?? 'ZZ')
  leaf(core, 'usedLangCodeISO639_1', LANG)
  leaf(core, 'mandatoryLangCodeISO639_1', LANG)
  leaf(core, 'uniqueIdentifier', c.number)
  const ids = dcc(core, 'identifications')
  const code = dcc(ids, 'identification')
  leaf(code, 'issuer', 'calibrationLaboratory')
  leaf(code, 'value', d.verification.code)
  named(code, 'name', `Verification code (${d.verification.url})`)
  leaf(core, 'receiptDate', d.dates.received)
  leaf(core, 'beginPerformanceDate', c.calibrationDate)
  leaf(core, 'endPerformanceDate', c.calibrationDate)
  leaf(core, 'performanceLocation', d.place.kind === 'on-site' ? 'customer' : 'laboratory')
  if (input.previousReport) {
    const prev = dcc(core, 'previousReport')
    named(prev, 'referral', `Calibration certificate ${input.previousReport.number}, replaced by this revision; the value is the SHA-256 of its PDF`)
    leaf(prev, 'referralID', input.previousReport.number)
    leaf(prev, 'procedure', 'SHA-256')
    leaf(prev, 'value', input.previousReport.pdfSha256)
  }

  const item = dcc(dcc(a, 'items'), 'item')
  named(item, 'name', d.instrument.kind)
  const r = d.receipt
  named(item, 'description',
    `Spectral band: ${d.instrument.band}`,
    `Measuring range: ${d.instrument.rangeText}`,
    `Resolution: ${d.instrument.resolutionText}`,
    `Maker’s accuracy specification: ${d.instrument.accuracyText}`,
    `Received on ${longDate(r.receivedOn)}; packaging: ${r.packaging}; condition on receipt: ${r.condition}`,
    r.accessories ? `Accessories: ${r.accessories}` : '',
    r.deviations ? `Deviations found on receipt: ${r.deviations}` : '',
    r.customerConsulted ? `Customer consulted: ${r.customerDecision ?? 'yes'}` : '',
    d.adjusted ? 'The instrument was adjusted during the calibration: results are given as found and as left.' : '')
  named(dcc(item, 'manufacturer'), 'name', d.instrument.maker)
  leaf(item, 'model', d.instrument.model)
  const itemIds = dcc(item, 'identifications')
  const serial = dcc(itemIds, 'identification')
  leaf(serial, 'issuer', 'manufacturer')
  leaf(serial, 'value', d.instrument.serial)
  named(serial, 'name', 'Serial number')
  if (d.instrument.assetTag) {
    const tag = dcc(itemIds, 'identification')
    leaf(tag, 'issuer', 'customer')
    leaf(tag, 'value', d.instrument.assetTag)
    named(tag, 'name', 'Asset tag')
  }

  const lab = dcc(a, 'calibrationLaboratory')
  leaf(lab, 'calibrationLaboratoryCode', d.lab.accreditationNumber)
  const labContact = dcc(lab, 'contact')
  named(labContact, 'name', d.lab.name)
  leaf(labContact, 'eMail', d.lab.email ?? '')
  if (d.lab.phone) leaf(labContact, 'phone', d.lab.phone)
  location(labContact, d.lab.addressLines)

  const person = dcc(dcc(a, 'respPersons'), 'respPerson')
  named(dcc(person, 'person'), 'name', d.signatory.name)
  named(person, 'description', `Electronic signature: ${d.signatory.meaning}, ${d.signatory.signedAt}`)
  leaf(person, 'role', d.signatory.function)
  leaf(person, 'mainSigner', 'true')

  const customer = dcc(a, 'customer')
  named(customer, 'name', d.customer.name)
  leaf(customer, 'eMail', '')
  location(customer, d.customer.addressLines)

  const st = dcc(a, 'statements')
  statement(st, { traceable: true, declaration: [d.statements.traceability] })
  statement(st, { declaration: [`Calibration laboratory accredited by ${d.lab.accreditationBody}, accreditation number ${d.lab.accreditationNumber}.`] })
  if (d.amends) {
    statement(st, {
      declaration: [
        `This certificate replaces certificate ${d.amends.number} issued on ${longDate(d.amends.issueDate)}. Reason: ${d.amends.reason}`,
        ...(d.amends.changes.length ? [`Changes: ${d.amends.changes.join('; ')}`] : []),
      ],
    })
  }
  statement(st, { declaration: [`Deviations from the method: ${d.methodDeviations ?? 'none recorded.'}`] })
  if (d.remarks) statement(st, { declaration: [`Remarks: ${d.remarks}`] })
  if (d.agreement) {
    const ag = d.agreement
    const { worst } = overallConformity(d)
    statement(st, {
      refType: REF.conformity,
      norm: ag.ruleReference,
      declaration: [
        `Specification and decision rule agreed with the customer on ${longDate(ag.agreedOn)} (${ag.how}): ${ag.specificationText}; ${[ag.ruleLabel, ag.guardBandText].filter(Boolean).join(', ')} (${ag.ruleReference}).`,
        d.statements.decisionRule,
        `The conformity stated here is the least favourable of the points ${d.adjusted ? 'as left' : 'measured'}; each result states its own.`,
      ],
      conformity: DCC_CONFORMITY[worst],
    })
  }
  else {
    statement(st, { declaration: ['No statement of conformity is made: no specification and decision rule were agreed with the customer for this calibration (ISO/IEC 17025:2017 7.1.3, 7.8.6).'] })
  }
  statement(st, { declaration: [[d.statements.items, d.statements.reproduction].filter(Boolean).join(' ')] })
}

/** The sections every results table shares: methods, software, equipment, conditions. */
function resultContext(mr: Node, input: DccInput): void {
  const d = input.content
  const methods = dcc(mr, 'usedMethods')
  const proc = dcc(methods, 'usedMethod')
  named(proc, 'name', d.method.procedureName)
  named(proc, 'description', `Procedure version ${d.method.versionNumber}`, `Deviations from the method: ${d.methodDeviations ?? 'none recorded.'}`)
  leaf(proc, 'reference', `${d.method.documentReference}, procedure version ${d.method.versionNumber}`)
  const gum = dcc(methods, 'usedMethod', { refType: REF.uncertainty })
  named(gum, 'name', 'Expanded uncertainty')
  named(gum, 'description', 'The expanded uncertainty U is the combined standard uncertainty multiplied by the coverage factor k stated with each result, for the coverage probability stated there.')
  leaf(gum, 'norm', 'JCGM 100:2008')

  const software = dcc(dcc(mr, 'usedSoftware'), 'software')
  named(software, 'name', 'Bandlight')
  leaf(software, 'release', input.engineVersions.length ? [...new Set(input.engineVersions)].sort().join(', ') : 'not recorded')
  leaf(software, 'type', 'application')
  named(software, 'description', 'Calculation engine (radiometry and uncertainty) of Bandlight that computed the expected readings, errors and uncertainties; the release is the engine version.')

  if (d.equipment.length) {
    const list = dcc(mr, 'measuringEquipments')
    for (const e of d.equipment) {
      const me = dcc(list, 'measuringEquipment')
      named(me, 'name', e.role)
      named(me, 'description', e.description, e.certificateNumber ? '' : 'No external calibration recorded')
      const ids = dcc(me, 'identifications')
      const tag = dcc(ids, 'identification')
      leaf(tag, 'issuer', 'calibrationLaboratory')
      leaf(tag, 'value', e.assetTag)
      named(tag, 'name', 'Asset tag')
      if (e.certificateNumber) {
        const cert = dcc(ids, 'identification')
        leaf(cert, 'issuer', 'other')
        leaf(cert, 'value', e.certificateNumber)
        named(cert, 'name', `Calibration certificate${[e.provider, e.calibrationDate ? longDate(e.calibrationDate) : null].some(Boolean) ? ` (${[e.provider, e.calibrationDate ? longDate(e.calibrationDate) : null].filter(Boolean).join(', ')})` : ''}`)
      }
    }
  }

  const env = d.environment
  const conditions = dcc(mr, 'influenceConditions')
  const condition = (o: { refType?: string, name: string, description?: string, value: string, unit: string }) => {
    const c = dcc(conditions, 'influenceCondition', o.refType ? { refType: o.refType } : undefined)
    named(c, 'name', o.name)
    if (o.description) named(c, 'description', o.description)
    quantity(dcc(c, 'data'), { name: o.name, value: o.value, unit: o.unit })
  }
  const measured = env.measuredWith ? `Measured with ${env.measuredWith.replace(/^measured with /, '')}.` : undefined
  condition({ refType: REF.temperature, name: 'Ambient temperature', description: measured, value: kelvinFixed(env.ambientK, 1), unit: UNIT.kelvin })
  condition({ refType: REF.humidityRelative, name: 'Relative humidity', description: measured, value: formatFixed(env.relativeHumidityPct, 0), unit: UNIT.percent })
  condition({ name: 'Measuring distance', description: 'Distance from the instrument to the source.', value: formatFixed(env.distanceMm, 0), unit: UNIT.millimetre })
  condition({ name: 'Reflected temperature', description: 'Temperature of the surroundings reflected by the source.', value: kelvinFixed(env.reflectedK, 1), unit: UNIT.kelvin })
  if (d.ratio) condition({ name: 'Emissivity-ratio setting', description: 'Emissivity-ratio (slope) setting k of the ratio pyrometer during the calibration.', value: formatFixed(d.ratio.emissivityRatioSetting, 3), unit: UNIT.one })
  if (env.emissivitySetting != null) condition({ name: 'Emissivity setting', description: 'Emissivity setting of the instrument during the calibration.', value: formatFixed(env.emissivitySetting, 3), unit: UNIT.one })
  if (env.instrumentK != null) condition({ name: 'Instrument temperature', description: 'Temperature of the instrument (its detector housing) during the calibration.', value: kelvinFixed(env.instrumentK, 1), unit: UNIT.kelvin })
}

function pointResult(results: Node, input: DccInput, p: CertificatePoint, index: number): void {
  const d = input.content
  const dec = pointDecimals(p)
  const r = dcc(results, 'result')
  named(r, 'name', `Point ${index}`)
  const data = dcc(r, 'data')
  quantity(data, { refType: REF.referenceValue, name: 'Reference temperature', value: kelvinFixed(p.referenceK, dec), unit: UNIT.kelvin })
  quantity(data, { name: 'Expected reading', value: kelvinFixed(p.expectedK, dec), unit: UNIT.kelvin })
  quantity(data, { refType: REF.measuredValue, name: 'Indication (mean reading)', description: [`Mean of n = ${p.n} readings.`], value: kelvinFixed(p.meanK, dec), unit: UNIT.kelvin })
  const err = quantity(data, {
    refType: REF.measurementError,
    name: 'Error of indication',
    description: ['Error = indication − expected reading; the correction is the error with its sign reversed.'],
    value: p.errorText,
    unit: UNIT.kelvin,
    unc: { uncertainty: p.uncertaintyText, coverageFactor: formatFixed(p.coverageFactor, 2), coverageProbability: dsiProbability(d.coverageProbability) },
  })
  if (p.imager?.rangeText != null && p.imager.sdText != null) {
    // a thermal imager: the non-uniformity over its regions of interest, as the PDF states it
    quantity(data, { name: 'Non-uniformity over the regions of interest (max − min of the ROI means)', value: p.imager.rangeText, unit: UNIT.kelvin })
    quantity(data, { name: 'Standard deviation of the ROI means', value: p.imager.sdText, unit: UNIT.kelvin })
  }
  if (d.agreement) {
    const ag = d.agreement
    const md = dcc(dcc(err, 'measurementMetaData'), 'metaData', { refType: REF.conformity })
    leaf(md, 'norm', ag.ruleReference)
    named(md, 'declaration', `Decision rule: ${[ag.ruleLabel, ag.guardBandText].filter(Boolean).join(', ')} (${ag.ruleReference}); ${ag.specificationText}.`)
    leaf(md, 'conformity', DCC_CONFORMITY[p.verdict])
    const limits = dcc(md, 'data')
    const neg = (t: string) => (/[1-9]/.test(t) ? `-${t}` : t)
    quantity(limits, { name: 'Lower tolerance limit', value: neg(formatFixed(p.toleranceK, dec)), unit: UNIT.kelvin })
    quantity(limits, { name: 'Upper tolerance limit', value: formatFixed(p.toleranceK, dec), unit: UNIT.kelvin })
    quantity(limits, { refType: REF.acceptanceLimitLower, name: 'Lower acceptance limit', value: neg(formatFixed(p.acceptanceLimitK, dec)), unit: UNIT.kelvin })
    quantity(limits, { refType: REF.acceptanceLimitUpper, name: 'Upper acceptance limit', value: formatFixed(p.acceptanceLimitK, dec), unit: UNIT.kelvin })
    const pc = p.probabilityOfConformity
    if (pc != null) {
      // As the PDF prints it: one decimal of a percent, never 0 % or 100 % (then 0.1 % or 99.9 %, "below"/"above").
      const value = pc >= 0.9995 ? '99.9' : pc <= 0.0005 ? '0.1' : formatFixed(pc * 100, 1)
      quantity(limits, {
        name: 'Probability of conformity',
        description: [`${probabilityText(pc)}: the probability that the error lies within the tolerance limits, for a normal distribution with the standard uncertainty U/k (JCGM 106:2012).`],
        value,
        unit: UNIT.percent,
      })
    }
  }
}

function measurementResults(root: Node, input: DccInput): void {
  const d = input.content
  const found = d.points.filter(p => p.stage === 'as-found')
  const left = d.points.filter(p => p.stage === 'as-left')
  // The tables of the PDF: as found (and as left when there was no adjustment), then as left after one.
  const tables: { title: string, points: CertificatePoint[] }[] = d.adjusted
    ? [{ title: 'As found (before adjustment)', points: found }, ...(left.length ? [{ title: 'As left (after adjustment)', points: left }] : [])]
    : [{ title: 'As found and as left (no adjustment made)', points: found.length ? found : d.points }]
  const list = dcc(root, 'measurementResults')
  for (const table of tables.filter(t => t.points.length)) {
    const mr = dcc(list, 'measurementResult')
    named(mr, 'name', table.title)
    named(mr, 'description',
      'Temperatures on the International Temperature Scale of 1990 (ITS-90), in kelvin. Values are rounded to the decimal place of their expanded uncertainty.',
      d.referenceBasis,
      d.ratio
        ? `Ratio (two-colour) pyrometer, band 1 ${d.ratio.band1}, band 2 ${d.ratio.band2}: the expected reading is the temperature whose blackbody band radiances have the ratio of the source’s signals divided by the emissivity-ratio setting k = ${formatFixed(d.ratio.emissivityRatioSetting, 3)}; source emissivity ${d.ratio.sources.map(x => `${x.assetTag} ${x.emissivity1} in band 1, ${x.emissivity2} in band 2`).join('; ')}.`
        : d.imager
          ? `Thermal imager (lens ${d.imager.lens}, field of view ${d.imager.fieldOfView}, range ${d.imager.rangeSetting}, non-uniformity correction ${d.imager.nonUniformityCorrection ? 'done' : 'not done'}): the error is stated at the centre region of interest; the expected reading accounts for the source emissivity, the reflected radiation and the instrument temperature in the instrument’s spectral band, at the emissivity setting and distance stated.`
          : 'The expected reading accounts for the source emissivity, the reflected radiation and the instrument temperature in the instrument’s spectral band, at the emissivity setting and distance stated.')
    resultContext(mr, input)
    const results = dcc(mr, 'results')
    table.points.forEach((p, i) => pointResult(results, input, p, i + 1))
  }
}

/**
 * The DCC of a certificate revision as UTF-8 XML bytes (pretty-printed, deterministic).
 * @throws Error when the content has no points (a certificate always has at least one)
 */
export function buildDcc(input: DccInput): Buffer {
  if (!input.content.points.length) throw new Error('a certificate states at least one point')
  const doc = create({ version: '1.0', encoding: 'UTF-8' })
  const root = doc.ele(DCC_NS, 'dcc:digitalCalibrationCertificate')
  root.att(XMLNS_NS, 'xmlns:si', SI_NS)
  root.att(XMLNS_NS, 'xmlns:xsi', XSI_NS)
  root.att(XSI_NS, 'xsi:schemaLocation', DCC_SCHEMA_LOCATION)
  root.att('schemaVersion', DCC_SCHEMA_VERSION)
  administrativeData(root, input)
  measurementResults(root, input)
  const document = dcc(root, 'document')
  named(document, 'name', `Calibration certificate ${input.certificate.number} (PDF, as issued)`)
  leaf(document, 'fileName', input.pdf.fileName)
  leaf(document, 'mimeType', 'application/pdf')
  leaf(document, 'dataBase64', Buffer.from(input.pdf.bytes).toString('base64'))
  return Buffer.from(doc.end({ prettyPrint: true }), 'utf8')
}
