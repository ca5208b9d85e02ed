/**
 * Reading a supplier's digital calibration certificate (DCC, PTB schema 3.x with D-SI) with
 * fast-xml-parser: what a calibration record of the laboratory's own equipment keeps — the
 * certificate number (`coreData/uniqueIdentifier`), the calibration date (`endPerformanceDate`,
 * else `beginPerformanceDate`), the calibration laboratory's name, the item(s) it covers, a
 * recalibration date when a statement gives one, and the results as text, each value written
 * exactly as the file states it (no rounding, no unit conversion). Pure: bytes in, data out;
 * every refusal is a `DccReadError` whose message says what is wrong in the user's words.
 *
 * The file is not validated against the schema here (the schema files are not part of the
 * product); it must be well-formed UTF-8 XML without a document type declaration, whose root is
 * `digitalCalibrationCertificate` in the namespace https://ptb.de/dcc.
 */
import { XMLParser, XMLValidator } from 'fast-xml-parser'
import { DCC_NS, REF } from './format'

/** A DCC the reader refused; `message` is for the person who chose the file. */
export class DccReadError extends Error {}

/** What a DCC states that a calibration record of reference equipment keeps. */
export interface DccReading {
  schemaVersion: string | null
  certificateNumber: string
  /** YYYY-MM-DD. */
  calibrationDate: string
  /** The calibration laboratory's name. */
  provider: string
  /** The report this DCC replaces, when it names one. */
  previousReport: string | null
  items: { name: string, manufacturer: string | null, model: string | null, serials: string[] }[]
  /** A recalibration date a statement gives (DCC good practice `basic_recalibration`), YYYY-MM-DD. */
  recalibrationDate: string | null
  /** Number of `result` elements. */
  resultCount: number
  /** The results as lines of text: per measurement result its name, then one line per result. */
  resultLines: string[]
}

type XNode = { [key: string]: XNode[] | string | undefined }

const TEXT = '#text'

const parser = new XMLParser({
  ignoreAttributes: false,
  attributeNamePrefix: '@_',
  removeNSPrefix: true,
  parseTagValue: false,
  parseAttributeValue: false,
  trimValues: true,
  alwaysCreateTextNode: true,
  htmlEntities: false,
  isArray: (_name, _path, _leaf, isAttribute) => !isAttribute,
})

const kids = (n: XNode | undefined, name: string): XNode[] => (n && Array.isArray(n[name]) ? n[name] as XNode[] : [])
const kid = (n: XNode | undefined, name: string): XNode | undefined => kids(n, name)[0]
const at = (n: XNode | undefined, ...names: string[]): XNode | undefined => names.reduce<XNode | undefined>((node, name) => kid(node, name), n)
const text = (n: XNode | undefined): string => (n && typeof n[TEXT] === 'string' ? (n[TEXT] as string).trim() : '')
const attr = (n: XNode | undefined, name: string): string => (n && typeof n[`@_${name}`] === 'string' ? n[`@_${name}`] as string : '')

/** The text of a DCC `textType` (its `content` elements): the English one, else the first. */
function langText(n: XNode | undefined): string {
  const contents = kids(n, 'content')
  const en = contents.find(c => attr(c, 'lang') === 'en' && text(c))
  return text(en ?? contents.find(c => text(c)))
}

/** `YYYY-MM-DD` of an xs:date (which may carry a time zone), or null. */
function dateOf(s: string): string | null {
  const m = /^(\d{4}-\d{2}-\d{2})(Z|[+-]\d{2}:\d{2})?$/.exec(s.trim())
  if (!m) return null
  const d = new Date(`${m[1]}T00:00:00Z`)
  return Number.isNaN(d.getTime()) || d.toISOString().slice(0, 10) !== m[1] ? null : m[1]!
}

const PREFIXES: Record<string, string> = { milli: 'm', micro: 'µ', nano: 'n', kilo: 'k', mega: 'M', centi: 'c', deci: 'd' }
const UNITS: Record<string, string> = { kelvin: 'K', degreecelsius: '°C', percent: '%', metre: 'm', one: '', second: 's', volt: 'V', ohm: 'Ω', ampere: 'A', watt: 'W', pascal: 'Pa' }

/** A D-SI unit string in print: `\milli\metre` → "mm", `\kelvin` → "K"; anything else as written. */
export function unitText(unit: string): string {
  const u = unit.trim()
  const m = /^((?:\\[a-z]+)*?)\\([a-z]+)$/.exec(u)
  if (!m) return u
  const prefixes = (m[1] ?? '').split('\\').filter(Boolean)
  if (!(m[2]! in UNITS) || prefixes.some(p => !(p in PREFIXES))) return u
  return prefixes.map(p => PREFIXES[p]).join('') + UNITS[m[2]!]
}

const withUnit = (value: string, unit: string) => (unitText(unit) ? `${value} ${unitText(unit)}` : value)

/** One D-SI value (si:real, si:realListXMLList, si:hybrid, si:constant) as text, or null when there is none. */
function dsiText(q: XNode): string | null {
  const real = kid(q, 'real') ?? kid(kid(q, 'hybrid'), 'real') ?? kid(q, 'constant') ?? kid(kid(q, 'hybrid'), 'constant')
  if (real) {
    const unit = text(kid(real, 'unit'))
    let s = withUnit(text(kid(real, 'value')), unit)
    const unc = kid(real, 'expandedUnc')
    if (unc) s += ` (U = ${withUnit(text(kid(unc, 'uncertainty')), unit)}, k = ${text(kid(unc, 'coverageFactor'))}, p = ${text(kid(unc, 'coverageProbability'))})`
    const interval = kid(real, 'coverageInterval')
    if (interval) s += ` (interval ${text(kid(interval, 'intervalMin'))} to ${withUnit(text(kid(interval, 'intervalMax')), unit)}, p = ${text(kid(interval, 'coverageProbability'))})`
    return s
  }
  const list = kid(q, 'realListXMLList') ?? kid(kid(q, 'hybrid'), 'realListXMLList')
  if (list) {
    const unit = text(kid(list, 'unitXMLList'))
    let s = `${text(kid(list, 'valueXMLList')).split(/\s+/).join(', ')}${unitText(unit) ? ` ${unitText(unit)}` : ''}`
    const unc = kid(list, 'expandedUncXMLList')
    if (unc) s += ` (U = ${text(kid(unc, 'uncertaintyXMLList')).split(/\s+/).join(', ')}${unitText(unit) ? ` ${unitText(unit)}` : ''}, k = ${text(kid(unc, 'coverageFactorXMLList'))}, p = ${text(kid(unc, 'coverageProbabilityXMLList'))})`
    return s
  }
  const none = kid(q, 'noQuantity')
  if (none) return langText(none) || null
  return null
}

/** The conformity a quantity's metadata states (`conformity` or `conformityXMLList`), or null. */
function conformityOf(q: XNode): string | null {
  for (const md of kids(kid(q, 'measurementMetaData'), 'metaData')) {
    const c = text(kid(md, 'conformity')) || text(kid(md, 'conformityXMLList'))
    if (c) return c
  }
  return null
}

/** The quantities of a `data` element, also inside `list` elements (DCC `listType`), in document order per kind. */
function quantitiesOf(data: XNode | undefined): XNode[] {
  if (!data) return []
  return [...kids(data, 'quantity'), ...kids(data, 'list').flatMap(l => quantitiesOf(l))]
}

const QUANTITY_NAMES: Record<string, string> = {
  [REF.referenceValue]: 'Reference value',
  [REF.measuredValue]: 'Indication',
  [REF.measurementError]: 'Error',
}

function quantityLine(q: XNode): string | null {
  const value = dsiText(q)
  if (value === null) return null
  const name = langText(kid(q, 'name')) || QUANTITY_NAMES[attr(q, 'refType').split(/\s+/).find(r => r in QUANTITY_NAMES) ?? ''] || 'Value'
  const conformity = conformityOf(q)
  return `${name} ${value}${conformity ? `, conformity ${conformity}` : ''}`
}

/** The root element's start tag must bind it to the DCC namespace (prefixed or default). */
function assertDccRoot(xml: string): void {
  const body = xml.replace(/<\?[\s\S]*?\?>/g, '').replace(/<!--[\s\S]*?-->/g, '')
  const m = /<([A-Za-z_][\w.-]*:)?([A-Za-z_][\w.-]*)([^>]*)>/.exec(body)
  if (!m) throw new DccReadError('The file holds no XML element')
  const prefix = (m[1] ?? '').slice(0, -1)
  const ns = new RegExp(`\\sxmlns${prefix ? `:${prefix}` : ''}\\s*=\\s*["']([^"']*)["']`).exec(m[3] ?? '')?.[1]
  if (m[2] !== 'digitalCalibrationCertificate' || ns !== DCC_NS) {
    throw new DccReadError(`The file is XML but not a digital calibration certificate: its root element is ${m[1] ?? ''}${m[2]}${ns ? ` in ${ns}` : ''}, expected digitalCalibrationCertificate in ${DCC_NS}`)
  }
}

/**
 * Read a DCC file.
 * @throws DccReadError when the file is not a DCC this reader can take, naming why
 */
export function readDcc(bytes: Uint8Array): DccReading {
  if (Buffer.from(bytes.subarray(0, 5)).toString('latin1') === '%PDF-') throw new DccReadError('The file is a PDF document, not XML: a DCC is an XML file (record a PDF certificate with the calibration form instead)')
  let xml: string
  try {
    xml = new TextDecoder('utf-8', { fatal: true }).decode(bytes).replace(/^\uFEFF/, '')
  }
  catch {
    throw new DccReadError('The file is not UTF-8 text, so it is not a DCC (XML in UTF-8)')
  }
  if (!xml.trim().startsWith('<')) throw new DccReadError('The file is not XML: a DCC is an XML document')
  if (/<!DOCTYPE/i.test(xml)) throw new DccReadError('The file declares a document type (DOCTYPE): a DCC has none, so it is refused')
  const valid = XMLValidator.validate(xml)
  if (valid !== true) throw new DccReadError(`The file is not well-formed XML (line ${valid.err.line}: ${valid.err.msg})`)
  assertDccRoot(xml)
  const doc = parser.parse(xml) as XNode
  const root = kid(doc, 'digitalCalibrationCertificate')
  const admin = kid(root, 'administrativeData')
  const core = kid(admin, 'coreData')

  const certificateNumber = text(kid(core, 'uniqueIdentifier'))
  if (!certificateNumber) throw new DccReadError('The DCC states no certificate number (coreData/uniqueIdentifier)')
  const dateText = text(kid(core, 'endPerformanceDate')) || text(kid(core, 'beginPerformanceDate'))
  const calibrationDate = dateOf(dateText)
  if (!calibrationDate) throw new DccReadError(dateText ? `The DCC’s calibration date “${dateText}” is not a date (coreData/endPerformanceDate)` : 'The DCC states no calibration date (coreData/endPerformanceDate)')
  const provider = langText(at(admin, 'calibrationLaboratory', 'contact', 'name'))
  if (!provider) throw new DccReadError('The DCC names no calibration laboratory (calibrationLaboratory/contact/name)')

  const items = kids(kid(admin, 'items'), 'item').map(item => ({
    name: langText(kid(item, 'name')),
    manufacturer: langText(at(item, 'manufacturer', 'name')) || null,
    model: text(kid(item, 'model')) || null,
    serials: kids(kid(item, 'identifications'), 'identification').map(i => text(kid(i, 'value'))).filter(Boolean),
  }))
  const recal = kids(kid(admin, 'statements'), 'statement').find(s => attr(s, 'refType').split(/\s+/).includes(REF.recalibration) && dateOf(text(kid(s, 'date'))))
  const lines: string[] = []
  let resultCount = 0
  for (const mr of kids(kid(root, 'measurementResults'), 'measurementResult')) {
    lines.push(langText(kid(mr, 'name')) || 'Measurement results')
    kids(kid(mr, 'results'), 'result').forEach((r, i) => {
      resultCount++
      const parts = quantitiesOf(kid(r, 'data')).map(quantityLine).filter((l): l is string => !!l)
      lines.push(`${langText(kid(r, 'name')) || `Result ${i + 1}`}: ${parts.length ? parts.join('; ') : 'no values this reader can show'}`)
    })
  }
  return {
    schemaVersion: attr(root, 'schemaVersion') || null,
    certificateNumber,
    calibrationDate,
    provider,
    previousReport: text(at(core, 'previousReport', 'referralID')) || null,
    items,
    recalibrationDate: recal ? dateOf(text(kid(recal, 'date'))) : null,
    resultCount,
    resultLines: lines,
  }
}

/**
 * The results text a calibration record keeps: a line naming the DCC, then the results, cut at a
 * whole line to at most `max` characters (the rest stays in the kept DCC file).
 */
export function dccResultsText(r: DccReading, max = 8000): string {
  const head = `From the DCC ${r.certificateNumber}${r.schemaVersion ? ` (schema ${r.schemaVersion})` : ''} of ${r.provider}.`
  const tail = '… more results in the DCC file kept with this record.'
  const out = [head]
  let length = head.length
  for (const line of r.resultLines) {
    if (length + 1 + line.length > max - tail.length - 1) {
      out.push(tail)
      break
    }
    out.push(line)
    length += 1 + line.length
  }
  return out.join('\n')
}
