// Certificates: laboratory settings, signing with the password, gap-free numbering under concurrent
// issues, the stored PDF and its hash, the lock on certified runs, amendment, withdrawal, public
// verification and customer isolation. One file, run in order, so the numbering checks see every
// certificate issued meanwhile.
import crypto from 'node:crypto'
import fs from 'node:fs'
import path from 'node:path'
import { beforeAll, describe, expect, it } from 'vitest'
import { addMonths } from '../../shared/certificates/numbers'
import { GOOD_RECEIPT, makeCustomer, makeInstrument, makeSource, organizationOf } from '../support/factories'
import { BASE_URL, Client, DEMO_PASSWORD, signedIn, unique } from '../support/http'
import { hasPdftotext, pdfText } from '../support/pdf'

let tech: Client
let quality: Client
let admin: Client
let customer: Client
/** An instrument of the demo customer user's organization, and that organization's name. */
let ownInstrument: number
let ownAssetTag: string
let ownOrganizationName: string
/** An instrument of another organization. */
let otherInstrument: number
let plate: { id: number, assetTag: string, calibration: { certificateNumber: string } | null }
let versionId: number

const HEADER = {
  procedureVersionId: 0, calibrationDate: '2026-11-25',
  ambientTemperatureK: 296.15, relativeHumidityPct: 40, distanceMm: 300, emissivitySetting: 0.95, reflectedTemperatureK: 296.15, instrumentTemperatureK: 296.15,
}

/** A run with its receipt and three points, submitted by the technician and approved by the quality manager. */
async function approvedRun(instrumentId = ownInstrument, receipt: Record<string, unknown> | false = GOOD_RECEIPT): Promise<number> {
  const r = await tech.post('/api/runs', { ...HEADER, instrumentId, procedureVersionId: versionId })
  expect(r.status, JSON.stringify(r.body)).toBe(201)
  if (receipt) expect((await tech.post(`/api/runs/${r.body.id}/receipt`, receipt)).status).toBe(200)
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

const issue = (runId: number, over: Record<string, unknown> = {}) =>
  quality.post('/api/certificates', { runId, password: DEMO_PASSWORD, signatoryFunction: 'Quality manager', ...over })

async function download(c: Client, id: number): Promise<{ status: number, type: string | null, disposition: string | null, bytes: Buffer }> {
  const cookie = (c as unknown as { cookies: Map<string, string> }).cookies
  const res = await fetch(`${BASE_URL}/api/certificates/${id}/pdf`, { headers: { cookie: [...cookie].map(([k, v]) => `${k}=${v}`).join('; ') } })
  return { status: res.status, type: res.headers.get('content-type'), disposition: res.headers.get('content-disposition'), bytes: Buffer.from(await res.arrayBuffer()) }
}

const sha256 = (b: Buffer) => crypto.createHash('sha256').update(b).digest('hex')
const sequenceOf = (number: string) => Number(/-(\d+)$/.exec(number.replace(/-R\d+$/, ''))![1])

beforeAll(async () => {
  ;[tech, quality, admin, customer] = await Promise.all([signedIn('technician'), signedIn('quality'), signedIn('admin'), signedIn('customer')])
  const myOrganization = await organizationOf(customer)
  ownOrganizationName = (await tech.get(`/api/customers/${myOrganization}`)).body.name
  ownAssetTag = unique('CI-')
  ownInstrument = (await makeInstrument(tech, myOrganization, { assetTag: ownAssetTag })).id
  otherInstrument = (await makeInstrument(tech, (await makeCustomer(tech)).id)).id
  // a source usable on the runs' date (2026-11-25) whose table holds 273.15 K to 373.15 K
  plate = await makeSource(quality)
  const p = await quality.post('/api/procedures', {
    name: unique('Certificate procedure '), documentReference: 'CP-CERT-1', decisionRule: 'simple-acceptance',
    template: [{ name: 'Reference', type: 'B', distribution: 'normal', value: 0.05, coverageFactor: 2, unit: 'K', input: 'sourceTemperature' }],
    cmc: [{ minK: 250, maxK: 450, expandedUncertaintyK: 0.4 }],
    applicability: { sourceKinds: ['flat-plate'], bandMinUm: 7, bandMaxUm: 15, minK: 250, maxK: 450 },
  })
  expect(p.status, JSON.stringify(p.body)).toBe(201)
  versionId = p.body.currentVersion.id
})

describe('laboratory settings', () => {
  it('lab roles read them; only an admin changes them, with the version; bad input names the field', async () => {
    const got = await tech.get('/api/settings/lab')
    expect(got.status).toBe(200)
    expect(got.body.name).toBe('Harrowfield Radiometric Calibration Laboratory')
    expect(got.body.signatoryFunctions).toContain('Quality manager')
    expect(got.body.numberExample).toMatch(/^BL-\d{4}-00042$/)
    expect((await customer.get('/api/settings/lab')).status).toBe(403)
    expect((await quality.patch('/api/settings/lab', { version: got.body.version, name: 'x' })).status).toBe(403)
    const bad = await admin.patch('/api/settings/lab', { version: got.body.version, numberDigits: 12, signatoryFunctions: [] })
    expect(bad.status).toBe(400)
    expect(bad.body.data.fields.numberDigits).toBeTruthy()
    expect(bad.body.data.fields.signatoryFunctions).toBeTruthy()
    const ok = await admin.patch('/api/settings/lab', { version: got.body.version, signatoryFunctions: [...got.body.signatoryFunctions, 'Calibration signatory'] })
    expect(ok.status, JSON.stringify(ok.body)).toBe(200)
    expect(ok.body.signatoryFunctions).toContain('Calibration signatory')
    expect(ok.body.version).toBe(got.body.version + 1)
    expect((await admin.patch('/api/settings/lab', { version: got.body.version, name: 'Stale' })).status).toBe(409)
    const audit = await admin.get('/api/admin/audit?entity=LabSettings&pageSize=5')
    expect(audit.status).toBe(200)
    expect(JSON.stringify(audit.body)).toContain('Calibration signatory')
  })
})

describe('issuing', () => {
  it('a wrong password is 400 naming password: nothing issued, no number consumed', async () => {
    const a = await approvedRun()
    const first = await issue(a)
    expect(first.status, JSON.stringify(first.body)).toBe(201)
    const b = await approvedRun()
    const wrong = await issue(b, { password: 'not-the-password' })
    expect(wrong.status).toBe(400)
    expect(wrong.body.data.fields.password).toBeTruthy()
    expect((await quality.get(`/api/certificates?runId=${b}`)).body.total).toBe(0)
    const second = await issue(b)
    expect(second.status, JSON.stringify(second.body)).toBe(201)
    expect(sequenceOf(second.body.number)).toBe(sequenceOf(first.body.number) + 1)
  })

  it('only approved runs, once each, as one of the laboratory’s functions; signature recorded', async () => {
    const draft = (await tech.post('/api/runs', { ...HEADER, instrumentId: ownInstrument, procedureVersionId: versionId })).body
    const notApproved = await issue(draft.id)
    expect(notApproved.status).toBe(400)
    expect(notApproved.body.data.fields.runId).toMatch(/approved/)
    const run = await approvedRun()
    const badFn = await issue(run, { signatoryFunction: 'Chief wizard' })
    expect(badFn.status).toBe(400)
    expect(badFn.body.data.fields.signatoryFunction).toBeTruthy()
    expect((await issue(run, { runId: 'x' })).body.data.fields.runId).toBeTruthy()
    const ok = await issue(run)
    expect(ok.status).toBe(201)
    expect(ok.body).toMatchObject({ status: 'valid', revision: 0, signatoryName: 'Quinn Halvorsen', signatoryFunction: 'Quality manager', signatureMeaning: 'authorized for issue', runId: run })
    expect(ok.body.number).toMatch(/^BL-\d{4}-\d{5}$/)
    expect(ok.body.verificationCode).toMatch(/^[0-9A-HJKMNP-TV-Z]{10}$/)
    expect(ok.body.verificationUrl).toContain(`/verify?number=${encodeURIComponent(ok.body.number)}&code=${ok.body.verificationCode}`)
    const again = await issue(run)
    expect(again.status).toBe(409)
    // The instrument is due again one calibration interval after the calibration date.
    const inst = (await tech.get(`/api/instruments/${ownInstrument}`)).body
    expect(inst.nextDueDate).toBe(addMonths('2026-11-25', inst.calibrationIntervalMonths))
  })

  it('eight issues at once get eight distinct, consecutive numbers', async () => {
    const runs: number[] = []
    for (let i = 0; i < 8; i++) runs.push(await approvedRun(i % 2 ? otherInstrument : ownInstrument))
    const before = (await quality.get('/api/certificates?pageSize=1')).body.rows[0]
    const replies = await Promise.all(runs.map(r => issue(r)))
    for (const r of replies) expect(r.status, JSON.stringify(r.body)).toBe(201)
    const numbers = replies.map(r => r.body.number as string)
    expect(new Set(numbers).size).toBe(8)
    const seqs = numbers.map(sequenceOf).sort((x, y) => x - y)
    for (let i = 1; i < seqs.length; i++) expect(seqs[i]! - seqs[i - 1]!).toBe(1)
    expect(seqs[0]).toBe(sequenceOf(before.baseNumber) + 1)
  })
})

describe('the stored PDF, immutability, amendment, withdrawal, verification', () => {
  let runId: number
  let cert: { id: number, number: string, pdfSha256: string, verificationCode: string, issueDate: string, instrumentSerial: string }
  /** The amendment issued by the amendment test (read back by the PDF text test after it). */
  let amendedId: number | undefined

  beforeAll(async () => {
    runId = await approvedRun()
    const r = await issue(runId)
    expect(r.status, JSON.stringify(r.body)).toBe(201)
    cert = r.body
  })

  it('downloads as an attachment whose SHA-256 is the one recorded, with the certificate’s content', async () => {
    const file = await download(quality, cert.id)
    expect(file.status).toBe(200)
    expect(file.type).toBe('application/pdf')
    expect(file.disposition).toMatch(/^attachment; filename="BL-/)
    expect(file.bytes.subarray(0, 5).toString('latin1')).toBe('%PDF-')
    expect(sha256(file.bytes)).toBe(cert.pdfSha256)
    // Kept for a look (git-ignored): pdftoppm -png -r 60 tests/.artifacts/certificates/<number>.pdf
    const artifacts = path.resolve(import.meta.dirname, '../.artifacts/certificates')
    fs.mkdirSync(artifacts, { recursive: true })
    fs.writeFileSync(path.join(artifacts, `${cert.number}.pdf`), file.bytes)
  })

  // The text is read back with pdftotext (poppler-utils); without it this test is reported as skipped.
  it.skipIf(!hasPdftotext)('the PDF holds the certificate’s content, the source and its certificate, page x of y on every page (read with pdftotext)', async () => {
    const file = await download(quality, cert.id)
    expect(file.status).toBe(200)
    const text = pdfText(file.bytes)
    // the laboratory's name is the demo scenario's lab settings; the demo quality manager signs
    for (const s of ['Calibration Certificate', cert.number, 'Harrowfield Radiometric Calibration Laboratory', ownOrganizationName, cert.instrumentSerial,
      ownAssetTag, 'CP-CERT-1', 'Page 1 of', 'End of certificate', 'authorized for issue', 'Quinn Halvorsen', 'Quality manager', plate.assetTag, plate.calibration!.certificateNumber,
      'coverage factor k', 'The results relate only to the items calibrated.', cert.verificationCode.slice(0, 5),
      // the receipt record, word for word, and the place (ISO/IEC 17025 7.8.2.1 and 7.4)
      GOOD_RECEIPT.condition, GOOD_RECEIPT.packaging, 'In the laboratory: Unit 4, Tenterbrook Science Park', 'n is the number of readings averaged']) {
      expect(text, s).toContain(s)
    }
    // No agreement with the customer is on record for this run: no decision rule, no verdict.
    expect(text).toContain('No statement of conformity is made: no specification and decision rule were agreed with the customer')
    expect(text).not.toMatch(/\bPass\b|\bFail\b|tolerance|acceptance limit/i)
    expect(text).toMatch(/coverage factor k (=|from) \d\.\d\d/)
    expect(text).toMatch(/coverage probability of approximately 95 %/)
    const pages = Number(/Page 1 of (\d+)/.exec(text)![1])
    for (let p = 1; p <= pages; p++) expect(text).toContain(`Page ${p} of ${pages}`)
    expect(text.split(`Certificate ${cert.number}`).length - 1).toBe(pages)
  })

  it('public verification tells number, issue date, serial and status, and nothing else; wrong codes are one generic 404', async () => {
    const anon = new Client()
    const ok = await anon.get(`/api/verify?number=${encodeURIComponent(cert.number)}&code=${cert.verificationCode}`)
    expect(ok.status).toBe(200)
    const valid = { number: cert.number, issueDate: cert.issueDate, instrumentSerial: cert.instrumentSerial, status: 'valid', withdrawnOn: null, withdrawalReason: null, supersededBy: null }
    expect(ok.body).toEqual(valid)
    const lower = await anon.get(`/api/verify?number=${encodeURIComponent(cert.number)}&code=${cert.verificationCode.toLowerCase()}`)
    expect(lower.status).toBe(200)
    const wrong = await anon.get(`/api/verify?number=${encodeURIComponent(cert.number)}&code=0000000000`)
    const unknown = await anon.get(`/api/verify?number=NO-SUCH-1&code=${cert.verificationCode}`)
    expect(wrong.status).toBe(404)
    expect(unknown.status).toBe(404)
    expect(wrong.body.message).toBe(unknown.body.message)
    expect((await anon.get('/api/verify?number=x')).body.data.fields.code).toBeTruthy()
    const file = await download(quality, cert.id)
    const byFile = await fetch(`${BASE_URL}/api/verify/file`, { method: 'POST', headers: { 'content-type': 'application/pdf' }, body: new Uint8Array(file.bytes) })
    expect(byFile.status).toBe(200)
    expect(await byFile.json()).toEqual(valid)
    const tampered = Buffer.concat([file.bytes, Buffer.from('\n% changed\n')])
    const refused = await fetch(`${BASE_URL}/api/verify/file`, { method: 'POST', headers: { 'content-type': 'application/pdf' }, body: new Uint8Array(tampered) })
    expect(refused.status).toBe(404)
    expect((await refused.json()).message).toMatch(/This file matches no certificate the laboratory issued/)
    const form = new FormData()
    form.append('file', new Blob([new Uint8Array(file.bytes)], { type: 'application/pdf' }), 'certificate.pdf')
    const multipart = await fetch(`${BASE_URL}/api/verify/file`, { method: 'POST', body: form })
    expect(multipart.status).toBe(200)
  })

  it('every write route of the runs refuses a certified run, and neither run nor certificate changes', async () => {
    const run = (await tech.get(`/api/runs/${runId}`)).body
    const certBefore = (await quality.get(`/api/certificates/${cert.id}`)).body
    const pt = run.points[0]
    const attempts: [string, string, unknown][] = [
      ['PATCH', `/api/runs/${runId}`, { version: run.version, internalNotes: 'changed', reason: 'try' }],
      ['POST', `/api/runs/${runId}/receipt`, { ...GOOD_RECEIPT, condition: 'changed', version: 1, reason: 'try' }],
      ['POST', `/api/runs/${runId}/void`, { version: run.version, reason: 'try it' }],
      ['POST', `/api/runs/${runId}/points/${pt.id}/void`, { version: pt.version, reason: 'try it' }],
      ['POST', `/api/runs/${runId}/points`, { sourceId: plate.id, setPointK: 323.15, sourceIndicatedK: 323.15, readingsK: [323.1], reason: 'try' }],
      ['PATCH', `/api/runs/${runId}/points/${pt.id}`, { version: pt.version, readingsK: [300], reason: 'try' }],
      ['POST', `/api/runs/${runId}/points/import`, { csv: `stage,sourceAssetTag,setPointK,sourceIndicatedK,reading1\nas-found,${plate.assetTag},323.15,323.15,323.1\n`, commit: true, reason: 'try' }],
      ['POST', `/api/runs/${runId}/submit`, { version: run.version }],
      ['POST', `/api/runs/${runId}/approve`, { version: run.version }],
      ['POST', `/api/runs/${runId}/return`, { version: run.version, comments: 'try' }],
      ['POST', `/api/runs/${runId}/points/${pt.id}/monte-carlo`, { trials: 10000 }],
    ]
    for (const [m, p, body] of attempts) {
      const by = p.endsWith('/approve') || p.endsWith('/return') ? quality : tech
      const res = await by.request(m, p, body)
      expect(res.status, `${m} ${p}: ${JSON.stringify(res.body)}`).toBe(409)
    }
    const after = (await tech.get(`/api/runs/${runId}`)).body
    expect(after.version).toBe(run.version)
    expect(after.updatedAt).toBe(run.updatedAt)
    expect(after.points).toEqual(run.points)
    expect((await quality.get(`/api/certificates/${cert.id}`)).body).toEqual(certBefore)
  })

  it('an amendment corrects: reopen makes a revision run that is corrected, reviewed and approved; -R1 states what changed and why and supersedes the original', async () => {
    // Nothing to amend until the certificate is reopened and its run corrected and approved.
    const early = await quality.post(`/api/certificates/${cert.id}/amend`, { password: DEMO_PASSWORD, signatoryFunction: 'Quality manager' })
    expect(early.status).toBe(409)
    expect(early.body.message).toMatch(/reopen certificate/)
    expect((await tech.post(`/api/certificates/${cert.id}/reopen`, { reason: 'A reading was mistyped' })).status).toBe(403)
    expect((await quality.post(`/api/certificates/${cert.id}/reopen`, {})).body.data.fields.reason).toBeTruthy()
    const reopened = await quality.post(`/api/certificates/${cert.id}/reopen`, { reason: 'The 50 °C readings were entered from the wrong line of the worksheet' })
    expect(reopened.status, JSON.stringify(reopened.body)).toBe(201)
    const rev = reopened.body
    expect(rev).toMatchObject({ status: 'draft', revisionOf: runId, revisionReason: 'The 50 °C readings were entered from the wrong line of the worksheet' })
    expect(rev.points.map((p: { seq: number }) => p.seq)).toEqual([1, 2, 3])
    expect((await quality.post(`/api/certificates/${cert.id}/reopen`, { reason: 'again' })).status).toBe(409)
    // A revision records its reasons from the start.
    const p2 = rev.points[1]
    expect((await tech.patch(`/api/runs/${rev.id}/points/${p2.id}`, { version: p2.version, readingsK: [323.0, 323.0, 322.9] })).body.data.fields.reason).toBeTruthy()
    const fixed = await tech.patch(`/api/runs/${rev.id}/points/${p2.id}`, { version: p2.version, readingsK: [323.0, 323.0, 322.9], reason: 'Readings re-entered from the worksheet' })
    expect(fixed.status, JSON.stringify(fixed.body)).toBe(200)
    const sent = await tech.post(`/api/runs/${rev.id}/submit`, { version: (await tech.get(`/api/runs/${rev.id}`)).body.version })
    expect(sent.status, JSON.stringify(sent.body)).toBe(200)
    const approved = await quality.post(`/api/runs/${rev.id}/approve`, { version: sent.body.version })
    expect(approved.status, JSON.stringify(approved.body)).toBe(200)

    const wrong = await quality.post(`/api/certificates/${cert.id}/amend`, { password: 'nope', signatoryFunction: 'Quality manager' })
    expect(wrong.status).toBe(400)
    expect(wrong.body.data.fields.password).toBeTruthy()
    const amended = await quality.post(`/api/certificates/${cert.id}/amend`, { password: DEMO_PASSWORD, signatoryFunction: 'Quality manager' })
    expect(amended.status, JSON.stringify(amended.body)).toBe(201)
    amendedId = amended.body.id
    expect(amended.body.number).toBe(`${cert.number}-R1`)
    expect(amended.body).toMatchObject({ revision: 1, status: 'valid', amendsId: cert.id, runId: rev.id, amendmentReason: 'The 50 °C readings were entered from the wrong line of the worksheet' })
    expect(amended.body.amendmentChanges.join(' ')).toMatch(/^point 2: reading 1 49\.80 °C → 49\.85 °C, reading 2 49\.90 °C → 49\.85 °C, reading 3 49\.70 °C → 49\.75 °C/)
    expect(amended.body.revisions.map((r: { number: string, status: string }) => [r.number, r.status])).toEqual([[cert.number, 'superseded'], [`${cert.number}-R1`, 'valid']])
    const old = (await quality.get(`/api/certificates/${cert.id}`)).body
    expect(old.status).toBe('superseded')
    expect(old.supersededById).toBe(amended.body.id)
    expect(old.pdfSha256).toBe(cert.pdfSha256)
    const oldFile = await download(quality, cert.id)
    expect(sha256(oldFile.bytes)).toBe(cert.pdfSha256)
    const newFile = await download(quality, amended.body.id)
    expect(sha256(newFile.bytes)).toBe(amended.body.pdfSha256)
    expect(newFile.bytes.equals(oldFile.bytes)).toBe(false)
    const anon = new Client()
    const superseded = (await anon.get(`/api/verify?number=${encodeURIComponent(cert.number)}&code=${cert.verificationCode}`)).body
    expect(superseded).toMatchObject({ status: 'superseded', supersededBy: `${cert.number}-R1`, withdrawnOn: null })
    expect((await anon.get(`/api/verify?number=${encodeURIComponent(amended.body.number)}&code=${amended.body.verificationCode}`)).body.status).toBe('valid')
    expect((await quality.post(`/api/certificates/${cert.id}/amend`, { password: DEMO_PASSWORD, signatoryFunction: 'Quality manager' })).status).toBe(409)
    expect((await quality.get('/api/certificates?status=superseded&pageSize=500')).body.rows.some((r: { id: number }) => r.id === cert.id)).toBe(true)

    const withdrawn = await quality.post(`/api/certificates/${amended.body.id}/withdraw`, { reason: 'Issued for the wrong instrument', password: DEMO_PASSWORD })
    expect(withdrawn.status, JSON.stringify(withdrawn.body)).toBe(200)
    expect(withdrawn.body).toMatchObject({ status: 'withdrawn', withdrawalReason: 'Issued for the wrong instrument', withdrawnByName: 'Quinn Halvorsen' })
    const shown = (await anon.get(`/api/verify?number=${encodeURIComponent(amended.body.number)}&code=${amended.body.verificationCode}`)).body
    expect(shown).toMatchObject({ status: 'withdrawn', withdrawalReason: 'Issued for the wrong instrument' })
    expect(shown.withdrawnOn).toMatch(/^\d{4}-\d{2}-\d{2}$/)
    expect((await quality.post(`/api/certificates/${amended.body.id}/withdraw`, { reason: 'again', password: DEMO_PASSWORD })).status).toBe(409)
    expect((await quality.post(`/api/certificates/${amended.body.id}/reopen`, { reason: 'again' })).status).toBe(409)
    expect(sha256((await download(quality, amended.body.id)).bytes)).toBe(amended.body.pdfSha256)
    // No valid certificate is left for the instrument: its due date no longer comes from one.
    const inst = (await tech.get(`/api/instruments/${ownInstrument}`)).body
    const valid = (await quality.get(`/api/certificates?pageSize=500&status=valid`)).body.rows.filter((r: { instrumentId: number }) => r.instrumentId === ownInstrument)
    if (!valid.length) expect(inst.nextDueDate).toBeNull()
    // The organization's contacts were told of the amendment and of the withdrawal, through the outbox.
    const outbox = (await admin.get('/api/admin/mail/outbox?pageSize=200')).body.rows as { kind: string, subject: string }[]
    expect(outbox.some(m => m.kind === 'certificate-amended' && m.subject.includes(`${cert.number}-R1`))).toBe(true)
    expect(outbox.some(m => m.kind === 'certificate-withdrawn' && m.subject.includes(`${cert.number}-R1`))).toBe(true)
  })

  it.skipIf(!hasPdftotext)('the amendment’s PDF says which certificate it replaces (read with pdftotext)', async () => {
    expect(amendedId, 'the amendment test above issued an amendment').toEqual(expect.any(Number))
    const file = await download(quality, amendedId!)
    expect(file.status).toBe(200)
    const text = pdfText(file.bytes)
    expect(text).toContain(`replaces certificate ${cert.number}`)
    expect(text).toContain('What changed: point 2:')
  })

  it('customers see only their organization’s certificates, every status marked; another’s is 404', async () => {
    const otherRun = await approvedRun(otherInstrument)
    const other = (await issue(otherRun)).body
    const list = await customer.get('/api/certificates?pageSize=500')
    expect(list.status).toBe(200)
    const me = (await customer.get('/api/auth/me')).body
    expect(list.body.rows.length).toBeGreaterThan(0)
    for (const r of list.body.rows) expect(r.organizationId).toBe(me.organizationId)
    const statuses = new Set(list.body.rows.map((r: { status: string }) => r.status))
    expect(statuses.has('superseded') && statuses.has('withdrawn')).toBe(true)
    expect((await customer.get(`/api/certificates/${other.id}`)).status).toBe(404)
    expect((await download(customer, other.id)).status).toBe(404)
    expect((await customer.get(`/api/certificates/${cert.id}`)).status).toBe(200)
    const own = await download(customer, cert.id)
    expect(own.status).toBe(200)
    expect(sha256(own.bytes)).toBe(cert.pdfSha256)
    for (const [m, p] of [['POST', '/api/certificates'], ['POST', `/api/certificates/${cert.id}/amend`], ['POST', `/api/certificates/${cert.id}/withdraw`]] as const) {
      expect((await customer.request(m, p, {})).status).toBe(403)
    }
    expect((await tech.post('/api/certificates', { runId: otherRun, password: DEMO_PASSWORD, signatoryFunction: 'Quality manager' })).status).toBe(403)
  })
})

describe('an instrument that changes hands', () => {
  it('keeps each organization’s certificates its own: the new owner’s history shows only what was issued to it', async () => {
    const me = (await customer.get('/api/auth/me')).body as { organizationId: number }
    const otherOrg = ((await tech.get(`/api/instruments/${otherInstrument}`)).body as { organizationId: number }).organizationId
    const made = await tech.post('/api/instruments', {
      organizationId: otherOrg, serial: unique('MOVED-'), maker: 'Ormsby Radiometrics', model: 'Spot 8', kind: 'spot-infrared',
      bandLambda1Um: 8, bandLambda2Um: 14, distanceToSpot: 12, rangeMinK: 243.15, rangeMaxK: 773.15,
      defaultEmissivity: 0.95, resolutionK: 0.1, accuracy: { kind: 'greaterOf', a: 1, b: 1 }, calibrationIntervalMonths: 12,
    })
    expect(made.status, JSON.stringify(made.body)).toBe(201)
    const first = (await issue(await approvedRun(made.body.id))).body
    const cur = (await tech.get(`/api/instruments/${made.body.id}`)).body as { version: number }
    const moved = await tech.patch(`/api/instruments/${made.body.id}`, { organizationId: me.organizationId, version: cur.version })
    expect(moved.status, JSON.stringify(moved.body)).toBe(200)
    const second = (await issue(await approvedRun(made.body.id))).body
    const history = await customer.get(`/api/instruments/${made.body.id}/history`)
    expect(history.status).toBe(200)
    expect(history.body.calibrations.map((c: { number: string }) => c.number)).toEqual([second.number])
    expect((await customer.get(`/api/certificates/${first.id}`)).status).toBe(404)
    const lab = await tech.get(`/api/instruments/${made.body.id}/history`)
    expect(lab.body.calibrations.map((c: { number: string }) => c.number)).toEqual([first.number, second.number])
  })
})
