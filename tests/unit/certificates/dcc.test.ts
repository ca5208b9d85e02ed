// The digital calibration certificate (DCC) writer and reader, from plain data, without a server.
// The reference is PTB's published schema: DCC 3.1.2 (dcc.xsd) with D-SI 2.1.0 (SI_Format.xsd),
// validated with xmllint (Debian's libxml2-utils; without it those tests are reported as skipped).
// Element names and value types below are those of the schema; unit strings those of D-SI 2.1.0
// (BIPM SI brochure, 9th edition, as `\prefix\unit`); ITS-90 gives T/K = t/°C + 273.15.
import { XMLParser } from 'fast-xml-parser'
import { describe, expect, it } from 'vitest'
import { celsiusFixed } from '../../../shared/format'
import { buildDcc, dsiDecimal, dsiProbability, type DccInput } from '../../../server/services/dcc/build'
import { countryCode } from '../../../server/services/dcc/format'
import { DccReadError, dccResultsText, readDcc, unitText } from '../../../server/services/dcc/read'
import type { CertificateData } from '../../../server/services/certificates/pdf'
import { sampleCertificateData } from '../../../server/services/certificates/sample'
import { hasXmllint, validateDcc } from '../../support/dccSchema'

const PDF = Buffer.from('%PDF-1.7\n% an invented stand-in for the signed PDF\n%%EOF\n')

function inputOf(content: CertificateData, over: Partial<DccInput> = {}): DccInput {
  return {
    content,
    certificate: { number: content.number, calibrationDate: content.dates.calibrated, issueDate: content.dates.issued },
    pdf: { bytes: PDF, fileName: `${content.number}.pdf` },
    previousReport: content.amends ? { number: content.amends.number, pdfSha256: 'ab'.repeat(32) } : null,
    engineVersions: ['1.1.0', '1.1.0'],
    ...over,
  }
}

// Prefixes kept, so the tests also check that each element is in the namespace the schema puts it in.
const parser = new XMLParser({ ignoreAttributes: false, attributeNamePrefix: '@_', parseTagValue: false, isArray: (_n, _p, _l, attr) => !attr })
type X = Record<string, any> // eslint-disable-line @typescript-eslint/no-explicit-any
const parse = (xml: Buffer): X => parser.parse(xml.toString('utf8'))['dcc:digitalCalibrationCertificate'][0]
const t = (n: X | undefined): string => (typeof n === 'string' ? n : n?.['#text'] ?? '')
/** Every element of a name anywhere below a node. */
function all(node: unknown, name: string, out: X[] = []): X[] {
  if (Array.isArray(node)) node.forEach(n => all(n, name, out))
  else if (node && typeof node === 'object') {
    for (const [k, v] of Object.entries(node)) {
      if (k === name) out.push(...(v as X[]))
      all(v, name, out)
    }
  }
  return out
}
const text = (n: X, name: string): string => t(n[name]?.[0])
const contentOf = (n: X | undefined): string => t(n?.['dcc:content']?.[0])

const VARIANTS: [string, CertificateData][] = [
  ['a first issue with a statement of conformity', sampleCertificateData(12)],
  ['an amendment of an adjusted instrument (as found and as left)', sampleCertificateData(9, { adjusted: true, revision: 1 })],
  ['no agreed specification (no statement of conformity)', sampleCertificateData(3, { agreed: false })],
  ['on site, with text that XML must escape, an unknown country and a customer without an address', {
    ...sampleCertificateData(2),
    lab: { ...sampleCertificateData(1).lab, name: 'Kiln & Cavity <Labs> "Ltd"\u0007', addressLines: ['1 Test Yard', 'Atlantis'] },
    customer: { name: 'R&D ]]> Works', addressLines: [] },
    place: { kind: 'on-site', addressLines: ['Furnace Row 12'] },
    remarks: 'Ratio > 1 & reading < limit',
  }],
]

describe('buildDcc: valid against the published schema', () => {
  for (const [name, content] of VARIANTS) {
    it.skipIf(!hasXmllint)(`${name}: xmllint --schema dcc.xsd says it validates`, () => {
      const r = validateDcc(buildDcc(inputOf(content)))
      expect(r.output).toMatch(/ validates$/)
      expect(r.valid, r.output).toBe(true)
    })
  }
  it.skipIf(!hasXmllint)('the validation can fail: a conformity value outside the schema’s list is refused', () => {
    const xml = buildDcc(inputOf(sampleCertificateData(2))).toString('utf8').replace('<dcc:conformity>pass</dcc:conformity>', '<dcc:conformity>passed</dcc:conformity>')
    expect(xml).toContain('passed')
    const r = validateDcc(xml)
    expect(r.valid).toBe(false)
    expect(r.output).toMatch(/conformity/)
  })
})

describe('buildDcc: what it states', () => {
  it('is deterministic, also from content read back from the database as JSON', () => {
    const content = sampleCertificateData(6, { adjusted: true, revision: 2 })
    const a = buildDcc(inputOf(content))
    expect(buildDcc(inputOf(content)).equals(a)).toBe(true)
    expect(buildDcc(inputOf(JSON.parse(JSON.stringify(content)) as CertificateData)).equals(a)).toBe(true)
  })

  it('core data: the certificate number as unique identifier, receipt and calibration dates, the place, the country of the laboratory', () => {
    const content = sampleCertificateData(3)
    const core = parse(buildDcc(inputOf(content)))['dcc:administrativeData'][0]['dcc:coreData'][0]
    expect(text(core, 'dcc:uniqueIdentifier')).toBe('BL-2026-00042')
    expect(text(core, 'dcc:receiptDate')).toBe('2026-11-02')
    expect(text(core, 'dcc:beginPerformanceDate')).toBe('2026-11-09')
    expect(text(core, 'dcc:endPerformanceDate')).toBe('2026-11-09')
    expect(text(core, 'dcc:performanceLocation')).toBe('laboratory')
    expect(text(core, 'dcc:countryCodeISO3166_1')).toBe('GB') // ISO 3166-1: United Kingdom
    expect(core['dcc:previousReport']).toBeUndefined()
  })

  it('an amendment names the certificate it replaces as previous report, with the SHA-256 of its PDF', () => {
    const content = sampleCertificateData(3, { revision: 1 })
    const prev = parse(buildDcc(inputOf(content)))['dcc:administrativeData'][0]['dcc:coreData'][0]['dcc:previousReport'][0]
    expect(text(prev, 'dcc:referralID')).toBe('BL-2026-00042')
    expect(text(prev, 'dcc:procedure')).toBe('SHA-256')
    expect(text(prev, 'dcc:value')).toBe('ab'.repeat(32))
  })

  it('item, laboratory, signatory and customer as the certificate states them', () => {
    const admin = parse(buildDcc(inputOf(sampleCertificateData(2))))['dcc:administrativeData'][0]
    const item = admin['dcc:items'][0]['dcc:item'][0]
    expect(contentOf(item['dcc:name'][0])).toBe('Handheld radiation thermometer')
    expect(contentOf(item['dcc:manufacturer'][0]['dcc:name'][0])).toBe('Orrin Thermal')
    expect(text(item, 'dcc:model')).toBe('HT-814 handheld')
    expect(all(item['dcc:description'], 'dcc:content').map(t)).toContain('Spectral band: 8–14 µm')
    const ids = item['dcc:identifications'][0]['dcc:identification'].map((i: X) => [text(i, 'dcc:issuer'), text(i, 'dcc:value')])
    expect(ids).toEqual([['manufacturer', 'OT-HT-KF01221'], ['customer', 'KF-IR-015']])
    expect(contentOf(admin['dcc:calibrationLaboratory'][0]['dcc:contact'][0]['dcc:name'][0])).toBe('Harrowfield Radiometric Calibration Laboratory')
    expect(text(admin['dcc:calibrationLaboratory'][0], 'dcc:calibrationLaboratoryCode')).toBe('CL-0917')
    const person = admin['dcc:respPersons'][0]['dcc:respPerson'][0]
    expect(contentOf(person['dcc:person'][0]['dcc:name'][0])).toBe('Quinn Halvorsen')
    expect(text(person, 'dcc:role')).toBe('Quality manager')
    expect(text(person, 'dcc:mainSigner')).toBe('true')
    expect(contentOf(admin['dcc:customer'][0]['dcc:name'][0])).toBe('Kestrelmoor Foundry Ltd')
  })

  it('methods, software (engine version), equipment with their own certificate numbers, influence conditions in D-SI units', () => {
    const mr = parse(buildDcc(inputOf(sampleCertificateData(2))))['dcc:measurementResults'][0]['dcc:measurementResult'][0]
    const method = mr['dcc:usedMethods'][0]['dcc:usedMethod'][0]
    expect(contentOf(method['dcc:name'][0])).toBe('Wideband 8–14 µm thermometers on the flat plate')
    expect(text(method, 'dcc:reference')).toBe('BL-CP-07 issue 3, procedure version 1')
    const software = mr['dcc:usedSoftware'][0]['dcc:software'][0]
    expect(contentOf(software['dcc:name'][0])).toBe('Bandlight')
    expect(text(software, 'dcc:release')).toBe('1.1.0')
    const equipment = mr['dcc:measuringEquipments'][0]['dcc:measuringEquipment']
    expect(equipment.map((e: X) => all(e, 'dcc:identification').map(i => text(i, 'dcc:value')))).toEqual([['BB-FP-01', 'HTS-26-0311'], ['REF-AMB-01', 'HTS-26-0116']])
    const conditions = Object.fromEntries(mr['dcc:influenceConditions'][0]['dcc:influenceCondition'].map((c: X) => {
      const real = all(c, 'si:real')[0]!
      return [contentOf(c['dcc:name'][0]), `${text(real, 'si:value')} ${text(real, 'si:unit')}`]
    }))
    // The sample states 23.0 °C ambient, 42 %RH, 300 mm, ε = 0.95, 23.0 °C reflected, 23.5 °C instrument.
    expect(conditions).toEqual({
      'Ambient temperature': '296.15 \\kelvin',
      'Relative humidity': '42 \\percent',
      'Measuring distance': '300 \\milli\\metre',
      'Reflected temperature': '296.15 \\kelvin',
      'Emissivity setting': '0.950 \\one',
      'Instrument temperature': '296.65 \\kelvin',
    })
  })

  it('per point: reference, indication and error in kelvin as the PDF prints them, U with k and p', () => {
    const content = sampleCertificateData(4)
    const results = all(parse(buildDcc(inputOf(content)))['dcc:measurementResults'], 'dcc:result')
    expect(results).toHaveLength(4)
    results.forEach((r, i) => {
      const p = content.points[i]!
      const q = Object.fromEntries(r['dcc:data'][0]['dcc:quantity'].map((x: X) => [x['@_refType'] ?? contentOf(x['dcc:name'][0]), x['si:real'][0]]))
      const celsius = (k: number) => Number(celsiusFixed(k, 2).replace('\u2212', '-'))
      // The kelvin value is the printed Celsius value + 273.15 (ITS-90), to the same decimal place.
      expect(Number(text(q.basic_referenceValue, 'si:value'))).toBeCloseTo(celsius(p.referenceK) + 273.15, 9)
      expect(Number(text(q.basic_measuredValue, 'si:value'))).toBeCloseTo(celsius(p.meanK) + 273.15, 9)
      expect(Number(text(q['Expected reading'], 'si:value'))).toBeCloseTo(celsius(p.expectedK) + 273.15, 9)
      expect(text(q.basic_referenceValue, 'si:unit')).toBe('\\kelvin')
      const err = q.basic_measurementError
      expect(text(err, 'si:value')).toBe(p.errorText)
      const unc = err['si:expandedUnc'][0]
      expect([text(unc, 'si:uncertainty'), text(unc, 'si:coverageFactor'), text(unc, 'si:coverageProbability')]).toEqual([p.uncertaintyText, '2.00', '0.9545'])
    })
  })

  it('conformity (DCC values pass, conditionalPass, conditionalFail, fail) with the decision rule, only when the certificate states conformity', () => {
    const agreed = sampleCertificateData(12)
    const xml = parse(buildDcc(inputOf(agreed)))
    const perPoint = all(xml['dcc:measurementResults'], 'dcc:metaData')
    const expected = agreed.points.map(p => ({ 'pass': 'pass', 'conditional-pass': 'conditionalPass', 'conditional-fail': 'conditionalFail', 'fail': 'fail' })[p.verdict])
    expect(perPoint.map(m => text(m, 'dcc:conformity'))).toEqual(expected)
    expect(new Set(expected).size).toBeGreaterThan(1) // the sample has more than one kind of verdict
    expect(perPoint.every(m => m['@_refType'] === 'basic_conformity' && text(m, 'dcc:norm') === 'ILAC-G8:09/2019')).toBe(true)
    expect(contentOf(perPoint[0]!['dcc:declaration'][0])).toMatch(/^Decision rule: Simple acceptance, w = 0 \(ILAC-G8:09\/2019\)/)
    const overall = xml['dcc:administrativeData'][0]['dcc:statements'][0]['dcc:statement'].find((s: X) => s['@_refType'] === 'basic_conformity')
    const order = ['pass', 'conditionalPass', 'conditionalFail', 'fail']
    expect(text(overall, 'dcc:conformity')).toBe(order[Math.max(...expected.map(v => order.indexOf(v!)))])

    // The probability of conformity, where the certificate states one, as the PDF prints it (percent, one decimal).
    const withProbability = { ...agreed, points: agreed.points.map((p, i) => ({ ...p, probabilityOfConformity: [0.97349, 0.99999, 0.00001][i % 3] })) }
    const probabilities = all(parse(buildDcc(inputOf(withProbability)))['dcc:measurementResults'], 'dcc:metaData')
      .map(m => m['dcc:data'][0]['dcc:quantity'].find((q: X) => contentOf(q['dcc:name'][0]) === 'Probability of conformity')['si:real'][0])
      .map((r: X) => `${text(r, 'si:value')} ${text(r, 'si:unit')}`)
    expect(probabilities.slice(0, 3)).toEqual(['97.3 \\percent', '99.9 \\percent', '0.1 \\percent'])
    if (hasXmllint) expect(validateDcc(buildDcc(inputOf(withProbability))).valid).toBe(true)

    const none = buildDcc(inputOf(sampleCertificateData(12, { agreed: false }))).toString('utf8')
    expect(none).not.toContain('dcc:conformity')
    expect(none).toContain('No statement of conformity is made')
  })

  it('embeds the signed PDF as the document: file name, type and the exact bytes', () => {
    const doc = parse(buildDcc(inputOf(sampleCertificateData(2))))['dcc:document'][0]
    expect(text(doc, 'dcc:fileName')).toBe('BL-2026-00042.pdf')
    expect(text(doc, 'dcc:mimeType')).toBe('application/pdf')
    expect(Buffer.from(text(doc, 'dcc:dataBase64'), 'base64').equals(PDF)).toBe(true)
  })

  it('escapes what XML must escape and drops characters XML 1.0 cannot carry', () => {
    const xml = buildDcc(inputOf(VARIANTS[3]![1])).toString('utf8')
    expect(xml).toContain('Kiln &amp; Cavity &lt;Labs&gt; "Ltd"</dcc:content>')
    expect(xml).not.toContain('\u0007')
    expect(xml).toContain('<dcc:countryCodeISO3166_1>ZZ</dcc:countryCodeISO3166_1>') // ISO 3166: ZZ, user-assigned ("unknown")
    expect(xml).toContain('<dcc:performanceLocation>customer</dcc:performanceLocation>')
  })

  it('refuses a certificate without points', () => {
    expect(() => buildDcc(inputOf({ ...sampleCertificateData(1), points: [] }))).toThrow(/at least one point/)
  })
})

describe('D-SI number forms and country codes', () => {
  it('writes decimals D-SI accepts: ASCII minus, no sign on zero, no exponent', () => {
    expect(dsiDecimal('\u22120.35')).toBe('-0.35')
    expect(dsiDecimal('+1.2')).toBe('1.2')
    expect(dsiDecimal('-0.0')).toBe('0.0')
    expect(() => dsiDecimal('1e5')).toThrow()
    expect(() => dsiDecimal('NaN')).toThrow()
  })
  it('writes a coverage probability within [0, 1] without an exponent', () => {
    expect(dsiProbability(0.9545)).toBe('0.9545')
    expect(dsiProbability(0.95)).toBe('0.95')
    expect(dsiProbability(1)).toBe('1.0')
    expect(() => dsiProbability(95.45)).toThrow()
  })
  it('finds ISO 3166-1 alpha-2 codes from country names (CLDR English names, common aliases)', () => {
    expect(countryCode('United Kingdom')).toBe('GB')
    expect(countryCode('UK')).toBe('GB')
    expect(countryCode('Germany')).toBe('DE')
    expect(countryCode(' de ')).toBe('DE')
    expect(countryCode('United States')).toBe('US')
    expect(countryCode('Atlantis')).toBeNull()
    expect(countryCode('')).toBeNull()
  })
})

/** An invented supplier's DCC: other prefixes, lists of values (D-SI realListXMLList in si:hybrid), a recalibration date. */
const SUPPLIER_DCC = `<?xml version="1.0" encoding="UTF-8"?>
<!-- an invented certificate for the tests -->
<d:digitalCalibrationCertificate xmlns:d="https://ptb.de/dcc" xmlns:s="https://ptb.de/si" schemaVersion="3.1.2">
  <d:administrativeData>
    <d:dccSoftware><d:software><d:name><d:content>Invented writer</d:content></d:name><d:release>0.1</d:release></d:software></d:dccSoftware>
    <d:coreData>
      <d:countryCodeISO3166_1>DE</d:countryCodeISO3166_1>
      <d:usedLangCodeISO639_1>de</d:usedLangCodeISO639_1><d:usedLangCodeISO639_1>en</d:usedLangCodeISO639_1>
      <d:mandatoryLangCodeISO639_1>de</d:mandatoryLangCodeISO639_1>
      <d:uniqueIdentifier>OKD-2026-0815</d:uniqueIdentifier>
      <d:beginPerformanceDate>2026-03-09</d:beginPerformanceDate>
      <d:endPerformanceDate>2026-03-10+01:00</d:endPerformanceDate>
      <d:performanceLocation>laboratory</d:performanceLocation>
    </d:coreData>
    <d:items><d:item>
      <d:name><d:content lang="de">Widerstandsthermometer</d:content><d:content lang="en">Resistance thermometer</d:content></d:name>
      <d:manufacturer><d:name><d:content>Vellmar Sensorik</d:content></d:name></d:manufacturer>
      <d:model>Probe 7</d:model>
      <d:identifications><d:identification><d:issuer>manufacturer</d:issuer><d:value>P-4711</d:value></d:identification></d:identifications>
    </d:item></d:items>
    <d:calibrationLaboratory><d:contact>
      <d:name><d:content>Ostwald Kalibrierdienst (invented)</d:content></d:name><d:eMail>lab@ostwald.example</d:eMail>
      <d:location><d:city>Ostwald</d:city><d:countryCode>DE</d:countryCode></d:location>
    </d:contact></d:calibrationLaboratory>
    <d:respPersons><d:respPerson><d:person><d:name><d:content>E. Invented</d:content></d:name></d:person></d:respPerson></d:respPersons>
    <d:customer><d:name><d:content>Harrowfield</d:content></d:name><d:eMail/><d:location><d:city>Harrowfield</d:city></d:location></d:customer>
    <d:statements><d:statement refType="basic_recalibration"><d:date>2027-03-10</d:date></d:statement></d:statements>
  </d:administrativeData>
  <d:measurementResults><d:measurementResult>
    <d:name><d:content lang="en">Measurement results</d:content></d:name>
    <d:results><d:result>
      <d:name><d:content lang="en">Comparison in a stirred bath</d:content></d:name>
      <d:data><d:list>
        <d:quantity refType="basic_referenceValue">
          <s:hybrid>
            <s:realListXMLList><s:valueXMLList>273.152 373.148</s:valueXMLList><s:unitXMLList>\\kelvin</s:unitXMLList></s:realListXMLList>
            <s:realListXMLList><s:valueXMLList>0.002 99.998</s:valueXMLList><s:unitXMLList>\\degreecelsius</s:unitXMLList></s:realListXMLList>
          </s:hybrid>
        </d:quantity>
        <d:quantity refType="basic_measurementError">
          <d:name><d:content lang="en">Deviation</d:content></d:name>
          <s:realListXMLList>
            <s:valueXMLList>0.011 -0.007</s:valueXMLList><s:unitXMLList>\\milli\\kelvin</s:unitXMLList>
            <s:expandedUncXMLList><s:uncertaintyXMLList>0.02</s:uncertaintyXMLList><s:coverageFactorXMLList>2</s:coverageFactorXMLList><s:coverageProbabilityXMLList>0.95</s:coverageProbabilityXMLList></s:expandedUncXMLList>
          </s:realListXMLList>
        </d:quantity>
      </d:list></d:data>
    </d:result></d:results>
  </d:measurementResult></d:measurementResults>
</d:digitalCalibrationCertificate>
`

describe('readDcc: a DCC read back', () => {
  it('our own DCC gives back the number, the date, the laboratory and every point’s numbers as written', () => {
    const content = sampleCertificateData(5, { revision: 1 })
    const xml = buildDcc(inputOf(content))
    const r = readDcc(xml)
    expect(r).toMatchObject({ schemaVersion: '3.1.2', certificateNumber: 'BL-2026-00042-R1', calibrationDate: '2026-11-09', provider: 'Harrowfield Radiometric Calibration Laboratory', previousReport: 'BL-2026-00042', resultCount: 5 })
    expect(r.items[0]!.serials).toEqual(['OT-HT-KF01221', 'KF-IR-015'])
    // The values of each result's quantities (the conformity limits in its metadata are not imported).
    const values = [...xml.toString('utf8').matchAll(/<dcc:result>[\s\S]*?<\/dcc:result>/g)]
      .map(m => [...m[0].replace(/<dcc:measurementMetaData>[\s\S]*?<\/dcc:measurementMetaData>/g, '').matchAll(/<si:(?:value|uncertainty)>([^<]+)</g)].map(v => v[1]))
    expect(values).toHaveLength(5)
    values.forEach((v, i) => {
      const line = r.resultLines[i + 1]!
      for (const number of v) expect(line, `point ${i + 1}`).toContain(` ${number} K`)
    })
  })

  it.skipIf(!hasXmllint)('the invented supplier DCC of these tests is itself valid', () => {
    const r = validateDcc(SUPPLIER_DCC)
    expect(r.valid, r.output).toBe(true)
  })

  it('a supplier’s DCC with other prefixes, value lists, a date with a time zone and a recalibration date', () => {
    const r = readDcc(Buffer.from(SUPPLIER_DCC))
    expect(r).toMatchObject({ certificateNumber: 'OKD-2026-0815', calibrationDate: '2026-03-10', provider: 'Ostwald Kalibrierdienst (invented)', recalibrationDate: '2027-03-10', resultCount: 1, previousReport: null })
    expect(r.items).toEqual([{ name: 'Resistance thermometer', manufacturer: 'Vellmar Sensorik', model: 'Probe 7', serials: ['P-4711'] }])
    expect(r.resultLines).toEqual([
      'Measurement results',
      'Comparison in a stirred bath: Reference value 273.152, 373.148 K; Deviation 0.011, -0.007 mK (U = 0.02 mK, k = 2, p = 0.95)',
    ])
  })

  it('prints D-SI units the way people write them', () => {
    expect(unitText('\\kelvin')).toBe('K')
    expect(unitText('\\milli\\metre')).toBe('mm')
    expect(unitText('\\degreecelsius')).toBe('°C')
    expect(unitText('\\one')).toBe('')
    expect(unitText('\\metre\\tothe{2}')).toBe('\\metre\\tothe{2}') // not simplified: kept as written
  })

  it('refuses what is not a DCC, saying why', () => {
    const refused = (s: string | Uint8Array) => {
      try {
        readDcc(typeof s === 'string' ? Buffer.from(s) : s)
      }
      catch (e) {
        expect(e).toBeInstanceOf(DccReadError)
        return (e as Error).message
      }
      throw new Error('not refused')
    }
    expect(refused(new Uint8Array([0x3C, 0x61, 0xC3, 0x28, 0x3E]))).toMatch(/not UTF-8/)
    expect(refused(Buffer.concat([Buffer.from('%PDF-1.7\n'), Buffer.from([0xE2, 0xE3, 0xCF, 0xD3])]))).toMatch(/a PDF document, not XML/)
    expect(refused('Certificate number: 12')).toMatch(/not XML/)
    expect(refused('<a><b></a>')).toMatch(/not well-formed XML \(line 1/)
    expect(refused('<?xml version="1.0"?><!DOCTYPE x [<!ENTITY a "aaaa"><!ENTITY b "&a;&a;&a;">]><x>&b;</x>')).toMatch(/DOCTYPE/)
    expect(refused('<dcc:digitalCalibrationCertificate xmlns:dcc="https://example.org/other"/>')).toMatch(/not a digital calibration certificate/)
    expect(refused('<invoice xmlns="https://ptb.de/dcc"/>')).toMatch(/root element is invoice/)
    const without = (re: RegExp) => SUPPLIER_DCC.replace(re, '')
    expect(refused(without(/<d:uniqueIdentifier>.*?<\/d:uniqueIdentifier>/))).toMatch(/no certificate number/)
    expect(refused(without(/<d:(begin|end)PerformanceDate>.*?<\/d:\1PerformanceDate>/g))).toMatch(/no calibration date/)
    expect(refused(SUPPLIER_DCC.replace('2026-03-10+01:00', '2026-02-30'))).toMatch(/“2026-02-30” is not a date/)
    expect(refused(without(/<d:calibrationLaboratory>[\s\S]*?<\/d:calibrationLaboratory>/))).toMatch(/no calibration laboratory/)
  })

  it('keeps the results text within what a record holds, cut at a whole line', () => {
    const r = readDcc(buildDcc(inputOf(sampleCertificateData(120))))
    const full = dccResultsText(r, 1_000_000)
    expect(full.length).toBeGreaterThan(8000)
    const cut = dccResultsText(r)
    expect(cut.length).toBeLessThanOrEqual(8000)
    expect(cut.endsWith('… more results in the DCC file kept with this record.')).toBe(true)
    expect(full.startsWith(cut.split('\n').slice(0, -1).join('\n'))).toBe(true)
  })
})
