// Digital calibration certificates (DCC, PTB schema 3.1.2 with D-SI 2.1.0) through the API: every
// certificate's DCC stored at issue validates against the published dcc.xsd (xmllint from Debian's
// libxml2-utils — without it that test is reported as skipped); the download is the stored bytes and
// embeds the signed PDF, which no longer matches its recorded hash once one value in it changes; an
// amendment names the certificate it replaces; customers get only their organization's; and a DCC
// exported here and imported as a reference instrument's calibration fills the same numbers.
import crypto from 'node:crypto'
import { beforeAll, describe, expect, it } from 'vitest'
import { hasXmllint, validateDcc } from '../support/dccSchema'
import { GOOD_RECEIPT, makeCustomer, makeInstrument, makeReference, makeSource, organizationOf } from '../support/factories'
import { BASE_URL, type Client, DEMO_PASSWORD, signedIn, unique } from '../support/http'

let tech: Client
let quality: Client
let admin: Client
let customer: Client
let ownInstrument: number
let otherInstrument: number
let plate: { id: number }
let versionId: number

const sha256 = (b: Uint8Array) => crypto.createHash('sha256').update(b).digest('hex')

interface Download { status: number, type: string | null, disposition: string | null, bytes: Buffer }

/** A GET of a file with the client's session. */
async function download(c: Client, path: string): Promise<Download> {
  const res = await fetch(`${BASE_URL}${path}`, { headers: { cookie: c.cookieHeader() } })
  return { status: res.status, type: res.headers.get('content-type'), disposition: res.headers.get('content-disposition'), bytes: Buffer.from(await res.arrayBuffer()) }
}

/** A multipart POST (text fields and at most one file in `file`), as a browser form sends it. */
async function postForm(c: Client, path: string, fields: Record<string, string>, file?: { name: string, bytes: Uint8Array, type?: string }) {
  const form = new FormData()
  for (const [k, v] of Object.entries(fields)) form.append(k, v)
  if (file) form.append('file', new Blob([new Uint8Array(file.bytes)], { type: file.type ?? 'application/xml' }), file.name)
  const res = await fetch(`${BASE_URL}${path}`, { method: 'POST', headers: { cookie: c.cookieHeader(), accept: 'application/json' }, body: form })
  const text = await res.text()
  let body: any // eslint-disable-line @typescript-eslint/no-explicit-any
  try {
    body = JSON.parse(text)
  }
  catch {
    body = text
  }
  return { status: res.status, body }
}

/** The text of the first element of a (prefixed) name, or undefined. */
const element = (xml: string, name: string) => new RegExp(`<${name}>([^<]*)</${name}>`).exec(xml)?.[1]

/** The values each `dcc:result` states for its quantities (not the limits in its conformity metadata), in order. */
function resultValues(xml: string): string[][] {
  return [...xml.matchAll(/<dcc:result>[\s\S]*?<\/dcc:result>/g)]
    .map(m => [...m[0].replace(/<dcc:measurementMetaData>[\s\S]*?<\/dcc:measurementMetaData>/g, '').matchAll(/<si:(?:value|uncertainty|coverageFactor)>([^<]+)</g)].map(v => v[1]!))
}

/** A run of an instrument with its receipt and three points, submitted and approved. */
async function approvedRun(instrumentId: number): Promise<number> {
  const r = await tech.post('/api/runs', {
    instrumentId, procedureVersionId: versionId, calibrationDate: '2026-11-25',
    ambientTemperatureK: 296.15, relativeHumidityPct: 40, distanceMm: 300, emissivitySetting: 0.95, reflectedTemperatureK: 296.15, instrumentTemperatureK: 296.15,
  })
  expect(r.status, JSON.stringify(r.body)).toBe(201)
  expect((await tech.post(`/api/runs/${r.body.id}/receipt`, GOOD_RECEIPT)).status).toBe(200)
  for (const setPointK of [273.15, 323.15, 373.15]) {
    const pt = await tech.post(`/api/runs/${r.body.id}/points`, { sourceId: plate.id, setPointK, sourceIndicatedK: setPointK, readingsK: [setPointK - 0.2, setPointK - 0.1, setPointK - 0.3] })
    expect(pt.status, JSON.stringify(pt.body)).toBe(201)
  }
  const s = await tech.post(`/api/runs/${r.body.id}/submit`, { version: (await tech.get(`/api/runs/${r.body.id}`)).body.version })
  expect(s.status, JSON.stringify(s.body)).toBe(200)
  const a = await quality.post(`/api/runs/${r.body.id}/approve`, { version: s.body.version })
  expect(a.status, JSON.stringify(a.body)).toBe(200)
  return r.body.id
}

async function issue(runId: number) {
  const r = await quality.post('/api/certificates', { runId, password: DEMO_PASSWORD, signatoryFunction: 'Quality manager' })
  expect(r.status, JSON.stringify(r.body)).toBe(201)
  return r.body as { id: number, number: string, calibrationDate: string, pdfSha256: string, pdfSize: number, dccSha256: string | null, dccSize: number | null, organizationId: number }
}

beforeAll(async () => {
  ;[tech, quality, admin, customer] = await Promise.all([signedIn('technician'), signedIn('quality'), signedIn('admin'), signedIn('customer')])
  ownInstrument = (await makeInstrument(tech, await organizationOf(customer))).id
  otherInstrument = (await makeInstrument(tech, (await makeCustomer(tech)).id)).id
  plate = await makeSource(quality)
  const p = await quality.post('/api/procedures', {
    name: unique('DCC procedure '), documentReference: 'CP-DCC-1', decisionRule: 'simple-acceptance',
    template: [{ name: 'Reference', type: 'B', distribution: 'normal', value: 0.05, coverageFactor: 2, unit: 'K', input: 'sourceTemperature' }],
    cmc: [{ minK: 250, maxK: 450, expandedUncertaintyK: 0.4 }],
    applicability: { sourceKinds: ['flat-plate'], bandMinUm: 7, bandMaxUm: 15, minK: 250, maxK: 450 },
  })
  expect(p.status, JSON.stringify(p.body)).toBe(201)
  versionId = p.body.currentVersion.id
})

describe('the DCC of every certificate', () => {
  it.skipIf(!hasXmllint)('every certificate so far — the demo’s included — has a stored DCC that validates against dcc.xsd (xmllint)', async () => {
    const list = await quality.get('/api/certificates?pageSize=500')
    expect(list.status).toBe(200)
    const certificates = list.body.rows as { id: number, number: string, status: string, dccSha256: string | null, dccSize: number | null }[]
    // The demo issues three: one amended (original and -R1) and one withdrawn.
    expect(new Set(certificates.map(c => c.status))).toEqual(new Set(['valid', 'superseded', 'withdrawn']))
    for (const c of certificates) {
      const file = await download(quality, `/api/certificates/${c.id}/dcc`)
      expect(file.status, c.number).toBe(200)
      const stored = (await quality.get(`/api/certificates/${c.id}`)).body
      expect(sha256(file.bytes), c.number).toBe(stored.dccSha256)
      const r = validateDcc(file.bytes, `${c.number}.xml`)
      expect(r.output, c.number).toMatch(/ validates$/)
      expect(r.valid, `${c.number}: ${r.output}`).toBe(true)
    }
  })

  it('the demo’s amendment names the certificate it replaces as previous report, and states conformity with the agreed decision rule', async () => {
    const list = (await quality.get('/api/certificates?pageSize=500')).body.rows as { id: number, number: string, amendsId: number | null }[]
    // The demo's amendment is the first one issued (the seed runs before any test).
    const amendment = list.filter(c => c.amendsId).sort((a, b) => a.id - b.id)[0]!
    const replaced = list.find(o => o.id === amendment.amendsId)!
    const xml = (await download(quality, `/api/certificates/${amendment.id}/dcc`)).bytes.toString('utf8')
    const prev = /<dcc:previousReport>[\s\S]*?<\/dcc:previousReport>/.exec(xml)![0]
    expect(element(prev, 'dcc:referralID')).toBe(replaced.number)
    expect(element(prev, 'dcc:value')).toBe((await quality.get(`/api/certificates/${replaced.id}`)).body.pdfSha256)
    expect(element(xml, 'dcc:uniqueIdentifier')).toBe(amendment.number)
    expect(xml).toMatch(/<dcc:conformity>(pass|conditionalPass|conditionalFail|fail)<\/dcc:conformity>/)
    expect(xml).toContain('Simple acceptance, w = 0 (ILAC-G8:09/2019)')
  })
})

describe('stored with the certificate', () => {
  let cert: Awaited<ReturnType<typeof issue>>
  let dcc: Download

  beforeAll(async () => {
    cert = await issue(await approvedRun(ownInstrument))
    dcc = await download(quality, `/api/certificates/${cert.id}/dcc`)
  })

  it('is built and stored at issue: the download is those bytes (SHA-256 and size on the certificate), XML as an attachment', async () => {
    expect(cert.dccSha256).toMatch(/^[0-9a-f]{64}$/)
    expect(dcc.status).toBe(200)
    expect(dcc.type).toBe('application/xml')
    expect(dcc.disposition).toBe(`attachment; filename="${cert.number}.xml"; filename*=UTF-8''${cert.number}.xml`)
    expect(sha256(dcc.bytes)).toBe(cert.dccSha256)
    expect(dcc.bytes.length).toBe(cert.dccSize)
    const again = await download(quality, `/api/certificates/${cert.id}/dcc`)
    expect(again.bytes.equals(dcc.bytes)).toBe(true)
    const xml = dcc.bytes.toString('utf8')
    expect(element(xml, 'dcc:uniqueIdentifier')).toBe(cert.number)
    expect(element(xml, 'dcc:endPerformanceDate')).toBe('2026-11-25')
    expect(element(xml, 'dcc:receiptDate')).toBe(GOOD_RECEIPT.receivedOn)
    expect(resultValues(xml)).toHaveLength(3)
  })

  it('embeds the signed PDF; with one value in it changed, the stored hash no longer matches (nor does the public verification)', async () => {
    const xml = dcc.bytes.toString('utf8')
    const embedded = Buffer.from(element(xml, 'dcc:dataBase64')!, 'base64')
    expect(element(xml, 'dcc:fileName')).toBe(`${cert.number}.pdf`)
    expect(element(xml, 'dcc:mimeType')).toBe('application/pdf')
    const pdf = await download(quality, `/api/certificates/${cert.id}/pdf`)
    expect(embedded.equals(pdf.bytes)).toBe(true)
    expect(sha256(embedded)).toBe(cert.pdfSha256)
    const verify = (bytes: Uint8Array) => fetch(`${BASE_URL}/api/verify/file`, { method: 'POST', headers: { 'content-type': 'application/pdf' }, body: new Uint8Array(bytes) })
    expect((await verify(embedded)).status).toBe(200)

    // One value changed in the embedded PDF: the last digit of the certificate number in its title
    // (an uncompressed string of the document information; the length stays the same).
    const title = `(Calibration certificate ${cert.number})`
    const at = embedded.toString('latin1').indexOf(title) + title.length - 2
    expect(at).toBeGreaterThan(20)
    const changed = Buffer.from(embedded)
    changed[at] = changed[at] === 0x39 ? 0x30 : changed[at]! + 1
    expect(changed.length).toBe(embedded.length)
    expect(changed.equals(embedded)).toBe(false)
    const tamperedXml = Buffer.from(xml.replace(element(xml, 'dcc:dataBase64')!, changed.toString('base64')), 'utf8')
    const reembedded = Buffer.from(element(tamperedXml.toString('utf8'), 'dcc:dataBase64')!, 'base64')
    expect(sha256(reembedded)).not.toBe(cert.pdfSha256)
    expect(sha256(tamperedXml)).not.toBe(cert.dccSha256)
    expect((await verify(reembedded)).status).toBe(404)
  })

  it('has the PDF’s access: customers only their organization’s (404 otherwise), every lab role, nobody signed out', async () => {
    expect((await download(customer, `/api/certificates/${cert.id}/dcc`)).status).toBe(200)
    const other = await issue(await approvedRun(otherInstrument))
    expect((await download(customer, `/api/certificates/${other.id}/dcc`)).status).toBe(404)
    expect((await download(customer, `/api/certificates/${other.id}/pdf`)).status).toBe(404)
    for (const c of [tech, admin]) expect((await download(c, `/api/certificates/${other.id}/dcc`)).status).toBe(200)
    expect((await fetch(`${BASE_URL}/api/certificates/${cert.id}/dcc`)).status).toBe(401)
    expect((await download(quality, '/api/certificates/999999/dcc')).status).toBe(404)
  })

  it('an amendment’s DCC names the certificate it replaces as previous report, with that PDF’s hash', async () => {
    const reopened = await quality.post(`/api/certificates/${cert.id}/reopen`, { reason: 'A reading was transcribed from the wrong line' })
    expect(reopened.status, JSON.stringify(reopened.body)).toBe(201)
    const rev = reopened.body
    const p = rev.points[1]
    expect((await tech.patch(`/api/runs/${rev.id}/points/${p.id}`, { version: p.version, readingsK: [323.0, 323.0, 322.9], reason: 'Re-entered from the worksheet' })).status).toBe(200)
    const sent = await tech.post(`/api/runs/${rev.id}/submit`, { version: (await tech.get(`/api/runs/${rev.id}`)).body.version })
    expect(sent.status, JSON.stringify(sent.body)).toBe(200)
    expect((await quality.post(`/api/runs/${rev.id}/approve`, { version: sent.body.version })).status).toBe(200)
    const amended = await quality.post(`/api/certificates/${cert.id}/amend`, { password: DEMO_PASSWORD, signatoryFunction: 'Quality manager' })
    expect(amended.status, JSON.stringify(amended.body)).toBe(201)
    const file = await download(quality, `/api/certificates/${amended.body.id}/dcc`)
    expect(sha256(file.bytes)).toBe(amended.body.dccSha256)
    const xml = file.bytes.toString('utf8')
    expect(element(xml, 'dcc:uniqueIdentifier')).toBe(`${cert.number}-R1`)
    const prev = /<dcc:previousReport>[\s\S]*?<\/dcc:previousReport>/.exec(xml)![0]
    expect(element(prev, 'dcc:referralID')).toBe(cert.number)
    expect(element(prev, 'dcc:procedure')).toBe('SHA-256')
    expect(element(prev, 'dcc:value')).toBe(cert.pdfSha256)
    // The superseded revision keeps its DCC as issued.
    const old = await download(quality, `/api/certificates/${cert.id}/dcc`)
    expect(old.bytes.equals(dcc.bytes)).toBe(true)
  })
})

describe('a supplier’s DCC on a calibration record', () => {
  let cert: Awaited<ReturnType<typeof issue>>
  let exported: Buffer

  beforeAll(async () => {
    cert = await issue(await approvedRun(ownInstrument))
    exported = (await download(quality, `/api/certificates/${cert.id}/dcc`)).bytes
  })

  it('round trip: a DCC exported here, imported as a reference instrument’s calibration, fills the same numbers (preview, then record; the file kept)', async () => {
    const ref = await makeReference(quality, { calibration: null })
    const path = `/api/reference-instruments/${ref.id}/calibrations/dcc`
    const xml = exported.toString('utf8')
    const labName = (await quality.get('/api/settings/lab')).body.name

    const preview = await postForm(quality, path, {}, { name: `${cert.number}.xml`, bytes: exported })
    expect(preview.status, JSON.stringify(preview.body)).toBe(200)
    expect(preview.body.committed).toBe(false)
    const p = preview.body.preview
    expect(p).toMatchObject({ fileName: `${cert.number}.xml`, schemaVersion: '3.1.2', certificateNumber: cert.number, calibrationDate: cert.calibrationDate, provider: labName, resultCount: 3, suggestedDueDate: null })
    const values = resultValues(xml)
    expect(values).toHaveLength(3)
    const lines = (p.results as string).split('\n')
    values.forEach((v, i) => {
      const line = lines.find(l => l.startsWith(`Point ${i + 1}:`))!
      for (const number of v) expect(line, `point ${i + 1}`).toContain(number)
    })
    expect(p.warnings.join(' ')).toMatch(/this reference instrument has serial P-/)
    // Nothing recorded by a preview.
    expect((await quality.get(`/api/reference-instruments/${ref.id}`)).body.calibrations).toEqual([])

    const noDue = await postForm(quality, path, { commit: 'true' }, { name: 'c.xml', bytes: exported })
    expect(noDue.status).toBe(400)
    expect(noDue.body.data.fields.dueDate).toMatch(/due date/)
    const early = await postForm(quality, path, { commit: 'true', dueDate: '2026-01-01' }, { name: 'c.xml', bytes: exported })
    expect(early.status).toBe(400)
    expect(early.body.data.fields.dueDate).toBeTruthy()

    const recorded = await postForm(quality, path, { commit: 'true', dueDate: '2027-11-25' }, { name: `${cert.number}.xml`, bytes: exported })
    expect(recorded.status, JSON.stringify(recorded.body)).toBe(201)
    expect(recorded.body.committed).toBe(true)
    const cal = recorded.body.calibration
    expect(cal).toMatchObject({ equipmentType: 'reference', equipmentId: ref.id, certificateNumber: cert.number, calibrationDate: cert.calibrationDate, dueDate: '2027-11-25', provider: labName, results: p.results })
    const detail = (await quality.get(`/api/reference-instruments/${ref.id}`)).body
    expect(detail.calibrations.map((c: { id: number }) => c.id)).toEqual([cal.id])
    expect(detail.dueDate).toBe('2027-11-25')
    const kept = await download(quality, `/api/uploads/${cal.uploadId}`)
    expect(kept.status).toBe(200)
    expect(kept.type).toBe('application/xml')
    expect(kept.bytes.equals(exported)).toBe(true)

    const again = await postForm(quality, path, { commit: 'true', dueDate: '2027-11-25' }, { name: 'c.xml', bytes: exported })
    expect(again.status).toBe(409)
    const warned = await postForm(quality, path, {}, { name: 'c.xml', bytes: exported })
    expect(warned.body.preview.warnings.join(' ')).toMatch(/already recorded/)
  })

  it('a file that is not a DCC: 400 naming file, saying why; nothing recorded', async () => {
    const source = await makeSource(quality, { calibration: null })
    const path = `/api/sources/${source.id}/calibrations/dcc`
    const pdf = (await download(quality, `/api/certificates/${cert.id}/pdf`)).bytes
    const cases: [Record<string, string>, { name: string, bytes: Uint8Array } | undefined, RegExp][] = [
      [{}, { name: 'c.pdf', bytes: pdf }, /not XML/],
      [{}, { name: 'c.xml', bytes: Buffer.from('<invoice><total>12</total></invoice>') }, /not a digital calibration certificate/],
      [{}, { name: 'c.xml', bytes: Buffer.from('<dcc:digitalCalibrationCertificate xmlns:dcc="https://ptb.de/dcc"><dcc:administrativeData>') }, /not well-formed XML/],
      [{}, { name: 'c.xml', bytes: Buffer.from(exported.toString('utf8').replace(/<dcc:uniqueIdentifier>[^<]*<\/dcc:uniqueIdentifier>/, '')) }, /no certificate number/],
      [{ commit: 'true', dueDate: '2027-11-25' }, { name: 'c.xml', bytes: Buffer.alloc(0) }, /empty/],
      [{ commit: 'true', dueDate: '2027-11-25' }, undefined, /Choose one DCC file/],
    ]
    for (const [fields, file, message] of cases) {
      const r = await postForm(quality, path, fields, file)
      expect(r.status, `${message}: ${JSON.stringify(r.body)}`).toBe(400)
      expect(r.body.data.fields.file).toMatch(message)
    }
    const json = await quality.post(path, { file: 'x' })
    expect(json.status).toBe(400)
    expect(json.body.data.fields.file).toBeTruthy()
    expect((await quality.get(`/api/sources/${source.id}`)).body.calibrations).toEqual([])
  })

  it('sources take DCCs too; no such equipment is 404; technicians and customers may not (403)', async () => {
    const source = await makeSource(quality, { calibration: null })
    const r = await postForm(admin, `/api/sources/${source.id}/calibrations/dcc`, { commit: 'true', dueDate: '2027-11-25' }, { name: 'c.xml', bytes: exported })
    expect(r.status, JSON.stringify(r.body)).toBe(201)
    expect(r.body.calibration).toMatchObject({ equipmentType: 'source', equipmentId: source.id, certificateNumber: cert.number })
    expect((await postForm(quality, '/api/sources/999999/calibrations/dcc', {}, { name: 'c.xml', bytes: exported })).status).toBe(404)
    for (const c of [tech, customer]) expect((await postForm(c, `/api/sources/${source.id}/calibrations/dcc`, {}, { name: 'c.xml', bytes: exported })).status).toBe(403)
  })
})
