// A record that tells the truth (ISO/IEC 17025 7.4, 7.5, 7.8): review that cannot be bypassed — a
// submitted run is frozen for every role, every change moves the version an approval must name,
// nobody approves data they changed — setup checks that name their reason, voiding with a reason,
// internal notes never printed, the draft preview, no certificate without a receipt record, and
// issued data read back as issued. Records are made here (factories).
import { beforeAll, describe, expect, it } from 'vitest'
import { makeInstrument, makeProcedure, makeRun, makeSource, organizationOf, GOOD_RECEIPT } from '../support/factories'
import { BASE_URL, type Client, DEMO_PASSWORD, signedIn } from '../support/http'
import { hasPdftotext, pdfText } from '../support/pdf'

let tech: Client
let quality: Client
let admin: Client
let customer: Client
let instrumentId: number
let plate: { id: number }
let cavity: { id: number }
let versionId: number

const point = (over: Record<string, unknown> = {}) => ({ sourceId: plate.id, setPointK: 323.15, sourceIndicatedK: 323.15, readingsK: [323.3, 323.2, 323.4], ...over })

async function versionOf(runId: number): Promise<number> {
  return (await tech.get(`/api/runs/${runId}`)).body.version
}

/** A run with two points, submitted by the technician. */
async function submittedRun(): Promise<{ id: number, version: number, points: { id: number, version: number }[] }> {
  const run = await makeRun(tech, instrumentId, versionId)
  for (const setPointK of [323.15, 373.15]) expect((await tech.post(`/api/runs/${run.id}/points`, point({ setPointK, sourceIndicatedK: setPointK, readingsK: [setPointK + 0.1] }))).status).toBe(201)
  const s = await tech.post(`/api/runs/${run.id}/submit`, { version: await versionOf(run.id) })
  expect(s.status, JSON.stringify(s.body)).toBe(200)
  return s.body
}

async function pdfBytes(c: Client, url: string): Promise<{ status: number, bytes: Buffer, type: string | null }> {
  const res = await fetch(`${BASE_URL}${url}`, { headers: { cookie: c.cookieHeader() } })
  return { status: res.status, type: res.headers.get('content-type'), bytes: Buffer.from(await res.arrayBuffer()) }
}

beforeAll(async () => {
  ;[tech, quality, admin, customer] = await Promise.all([signedIn('technician'), signedIn('quality'), signedIn('admin'), signedIn('customer')])
  instrumentId = (await makeInstrument(tech, await organizationOf(customer))).id
  plate = await makeSource(quality)
  cavity = await makeSource(quality, { kind: 'cavity', emissivity: 0.999 })
  versionId = (await makeProcedure(quality, {
    decisionRule: 'simple-acceptance',
    applicability: { sourceKinds: ['flat-plate'], bandMinUm: 7, bandMaxUm: 15, minK: 253.15, maxK: 423.15 },
  })).currentVersion.id
})

describe('a submitted run is frozen for every role', () => {
  it('PATCH and POST on its header and points answer 409 to technician, quality manager and admin — with or without a reason, whatever the body; customers 403', async () => {
    const run = await submittedRun()
    const before = (await tech.get(`/api/runs/${run.id}`)).body
    const pt = before.points[0]
    const csv = 'stage,sourceAssetTag,setPointK,sourceIndicatedK,reading1\nas-found,X,323.15,323.15,323.2'
    const writes: [string, string, unknown][] = [
      ['PATCH', `/api/runs/${run.id}/points/${pt.id}`, { version: pt.version, readingsK: [330.15], reason: 'Correct the reading' }],
      ['PATCH', `/api/runs/${run.id}/points/${pt.id}`, { readingsK: [330.15] }],
      ['POST', `/api/runs/${run.id}/points`, { ...point(), reason: 'One more point' }],
      ['POST', `/api/runs/${run.id}/points`, {}],
      ['POST', `/api/runs/${run.id}/points/import`, { csv, commit: true, reason: 'x' }],
      ['POST', `/api/runs/${run.id}/points/${pt.id}/void`, { version: pt.version, reason: 'Mistaken point' }],
      ['PATCH', `/api/runs/${run.id}`, { version: before.version, distanceMm: 250, reason: 'Measured again' }],
      ['POST', `/api/runs/${run.id}/void`, { version: before.version, reason: 'Wrong instrument' }],
      ['POST', `/api/runs/${run.id}/receipt`, { ...GOOD_RECEIPT, condition: 'Changed', version: before.receipt.version, reason: 'x' }],
    ]
    for (const who of [tech, quality, admin]) {
      for (const [m, p, body] of writes) {
        const r = await who.request(m, p, body)
        expect(r.status, `${m} ${p} ${JSON.stringify(body)}: ${JSON.stringify(r.body)}`).toBe(409)
      }
    }
    for (const [m, p, body] of writes) expect((await customer.request(m, p, body)).status, `${m} ${p}`).toBe(403)
    const after = (await tech.get(`/api/runs/${run.id}`)).body
    expect(after.version).toBe(before.version)
    expect(after.points).toEqual(before.points)
    expect(after.receipt).toEqual(before.receipt)
  })

  it('the reviewer returns it or approves it, nothing else; an approval must name the version the reviewer saw (stale: 409)', async () => {
    const run = await submittedRun()
    const back = await quality.post(`/api/runs/${run.id}/return`, { version: run.version, comments: 'Repeat the 100 °C point' })
    expect(back.status).toBe(200)
    // While returned, each change moves the run's version on: a point edit, a point voided, a header change, the receipt.
    const p = back.body.points[1]
    let v = back.body.version
    const edited = await tech.patch(`/api/runs/${run.id}/points/${p.id}`, { version: p.version, readingsK: [373.3], reason: 'Point repeated after the plate settled' })
    expect(edited.status, JSON.stringify(edited.body)).toBe(200)
    expect(await versionOf(run.id)).toBeGreaterThan(v)
    v = await versionOf(run.id)
    const again = await tech.post(`/api/runs/${run.id}/submit`, { version: v })
    expect(again.status).toBe(200)
    // The reviewer's page showed the version before the edit: approving it is refused.
    const stale = await quality.post(`/api/runs/${run.id}/approve`, { version: back.body.version })
    expect(stale.status).toBe(409)
    const detail = (await quality.get(`/api/runs/${run.id}`)).body
    // The review page lists what changed since the last review.
    expect(detail.changesSinceReview).toHaveLength(1)
    expect(detail.changesSinceReview[0]).toMatchObject({ pointId: p.id, reason: 'Point repeated after the plate settled' })
    const ok = await quality.post(`/api/runs/${run.id}/approve`, { version: detail.version })
    expect(ok.status, JSON.stringify(ok.body)).toBe(200)
    expect(ok.body.lastReviewedVersion).toBe(detail.version)
  })

  it('an approver who changed the data is refused (403), whoever performed the run', async () => {
    const run = await submittedRun()
    const back = (await quality.post(`/api/runs/${run.id}/return`, { version: run.version, comments: 'Check the reading' })).body
    const p = back.points[0]
    // The quality manager corrects a reading themselves …
    const byReviewer = await quality.patch(`/api/runs/${run.id}/points/${p.id}`, { version: p.version, readingsK: [323.25], reason: 'Read from the worksheet' })
    expect(byReviewer.status, JSON.stringify(byReviewer.body)).toBe(200)
    const sent = (await tech.post(`/api/runs/${run.id}/submit`, { version: await versionOf(run.id) })).body
    expect(sent.contributorIds).toContain((await quality.get('/api/auth/me')).body.id)
    // … and may then not approve it.
    const refused = await quality.post(`/api/runs/${run.id}/approve`, { version: sent.version })
    expect(refused.status).toBe(403)
    expect(refused.body.message).toMatch(/changed its data/)
    expect((await tech.get(`/api/runs/${run.id}`)).body.status).toBe('submitted')
  })
})

describe('setup checks name their reason; mistakes are voided, not deleted', () => {
  it('a flat-plate procedure refuses a cavity point; a point outside the procedure range is refused; the procedure of a draft run can be changed', async () => {
    const run = await makeRun(tech, instrumentId, versionId)
    const onCavity = await tech.post(`/api/runs/${run.id}/points`, point({ sourceId: cavity.id }))
    expect(onCavity.status).toBe(400)
    expect(onCavity.body.data.fields.sourceId).toMatch(/cavity.*procedure .* is for flat plate sources/i)
    const tooHot = await tech.post(`/api/runs/${run.id}/points`, point({ setPointK: 473.15, sourceIndicatedK: 473.15, readingsK: [473.2] }))
    expect(tooHot.status).toBe(400)
    expect(tooHot.body.data.fields.setPointK).toMatch(/outside procedure .* range/)
    // A short-wave procedure does not fit an 8–14 µm instrument: refused with the band named.
    const shortWave = await makeProcedure(quality, { applicability: { sourceKinds: ['cavity'], bandMinUm: 0.6, bandMaxUm: 5, minK: 323.15, maxK: 1773.15 } })
    const swap = await tech.patch(`/api/runs/${run.id}`, { version: run.version, procedureVersionId: shortWave.currentVersion.id })
    expect(swap.status, JSON.stringify(swap.body)).toBe(200)
    const refused = await tech.post(`/api/runs/${run.id}/points`, point({ sourceId: cavity.id }))
    expect(refused.status).toBe(400)
    expect(refused.body.data.fields.procedureVersionId).toMatch(/band \(8–14 µm\) is outside the 0\.6–5 µm/)
    // Without a statement of what it applies to, a procedure is refused for points.
    const back = await tech.patch(`/api/runs/${run.id}`, { version: swap.body.version, procedureVersionId: versionId })
    expect(back.status).toBe(200)
    expect((await tech.post(`/api/runs/${run.id}/points`, point())).status).toBe(201)
  })

  it('no measured condition is assumed: points wait for the conditions they depend on, submission for all of them', async () => {
    const bare = await tech.post('/api/runs', { instrumentId, procedureVersionId: versionId, calibrationDate: '2026-11-25' })
    expect(bare.status, JSON.stringify(bare.body)).toBe(201)
    for (const f of ['ambientTemperatureK', 'relativeHumidityPct', 'distanceMm', 'emissivitySetting', 'reflectedTemperatureK', 'instrumentTemperatureK']) expect(bare.body[f], f).toBeNull()
    expect(bare.body.missingConditions.map((m: { field: string }) => m.field)).toEqual(expect.arrayContaining(['ambientTemperatureK', 'relativeHumidityPct', 'distanceMm']))
    const early = await tech.post(`/api/runs/${bare.body.id}/points`, point())
    expect(early.status).toBe(400)
    expect(Object.keys(early.body.data.fields)).toEqual(expect.arrayContaining(['reflectedTemperatureK', 'instrumentTemperatureK', 'emissivitySetting']))
    const partly = await tech.patch(`/api/runs/${bare.body.id}`, { version: bare.body.version, reflectedTemperatureK: 296.15, instrumentTemperatureK: 296.65, emissivitySetting: 0.95 })
    expect(partly.status).toBe(200)
    expect((await tech.post(`/api/runs/${bare.body.id}/points`, point())).status).toBe(201)
    const submit = await tech.post(`/api/runs/${bare.body.id}/submit`, { version: await versionOf(bare.body.id) })
    expect(submit.status).toBe(400)
    expect(Object.keys(submit.body.data.fields).sort()).toEqual(['ambientTemperatureK', 'distanceMm', 'relativeHumidityPct'])
  })

  it('a voided point is kept with its reason, greyed, left out of the results; a voided draft run stays on record', async () => {
    const run = await makeRun(tech, instrumentId, versionId)
    const a = (await tech.post(`/api/runs/${run.id}/points`, point())).body
    const b = (await tech.post(`/api/runs/${run.id}/points`, point({ setPointK: 373.15, sourceIndicatedK: 373.15, readingsK: [373.2] }))).body
    expect((await tech.post(`/api/runs/${run.id}/points/${a.id}/void`, { version: a.version, reason: '' })).body.data.fields.reason).toBeTruthy()
    const voided = await tech.post(`/api/runs/${run.id}/points/${a.id}/void`, { version: a.version, reason: 'Entered against the wrong source' })
    expect(voided.status, JSON.stringify(voided.body)).toBe(200)
    expect(voided.body).toMatchObject({ id: a.id, voidReason: 'Entered against the wrong source', voidedByName: 'Tomas Reyne' })
    const detail = (await tech.get(`/api/runs/${run.id}`)).body
    expect(detail.points.map((p: { id: number }) => p.id)).toEqual([a.id, b.id])
    expect(detail.pointCount).toBe(1)
    expect(detail.audit.some((e: { action: string, entity: string, entityId: number }) => e.action === 'void' && e.entity === 'RunPoint' && e.entityId === a.id)).toBe(true)
    expect((await tech.patch(`/api/runs/${run.id}/points/${a.id}`, { version: voided.body.version, readingsK: [323.2] })).status).toBe(409)

    const other = await makeRun(tech, instrumentId, versionId)
    const gone = await tech.post(`/api/runs/${other.id}/void`, { version: other.version, reason: 'Opened for the wrong instrument' })
    expect(gone.status, JSON.stringify(gone.body)).toBe(200)
    expect(gone.body).toMatchObject({ status: 'void', voidReason: 'Opened for the wrong instrument' })
    expect((await tech.get(`/api/runs?status=void&pageSize=500`)).body.rows.some((r: { id: number }) => r.id === other.id)).toBe(true)
    expect((await tech.post(`/api/runs/${other.id}/points`, point())).status).toBe(409)
  })
})

describe('what the certificate states', () => {
  it('issuing without a receipt record answers 409; the draft preview shows remarks, never internal notes; with the receipt it issues', async () => {
    const run = await makeRun(tech, instrumentId, versionId, {
      receipt: false,
      internalNotes: 'Customer rang twice about the turnaround — lab only',
      certificateRemarks: 'Readings taken with the instrument’s own emissivity setting of 0.95.',
      methodDeviations: 'Two readings per point instead of the method’s five, agreed with the customer.',
    })
    for (const sp of [323.15, 373.15]) expect((await tech.post(`/api/runs/${run.id}/points`, point({ setPointK: sp, sourceIndicatedK: sp, readingsK: [sp + 0.1, sp + 0.2] }))).status).toBe(201)
    const sent = (await tech.post(`/api/runs/${run.id}/submit`, { version: await versionOf(run.id) })).body
    expect(sent.status).toBe('submitted')
    const approved = (await quality.post(`/api/runs/${run.id}/approve`, { version: sent.version })).body
    expect(approved.status).toBe('approved')

    const refused = await quality.post('/api/certificates', { runId: run.id, password: DEMO_PASSWORD, signatoryFunction: 'Quality manager' })
    expect(refused.status).toBe(409)
    expect(refused.body.message).toMatch(/No receipt of the item is recorded/)
    expect((await quality.get(`/api/certificates?pageSize=500`)).body.rows.some((c: { runId: number }) => c.runId === run.id)).toBe(false)
    expect((await pdfBytes(quality, `/api/runs/${run.id}/certificate-preview`)).status).toBe(409)

    // Goods-in records the receipt (with a defect referred to the customer) before the certificate is signed.
    const receipt = await tech.post(`/api/runs/${run.id}/receipt`, { receivedOn: '2026-11-20', packaging: 'Maker’s case, intact', condition: 'Lens scratched', deviations: 'Lens scratched', customerConsulted: true, customerDecision: 'Calibrate as received', reason: 'Receipt entered late from the goods-in book' })
    expect(receipt.status, JSON.stringify(receipt.body)).toBe(200)
    const preview = await pdfBytes(tech, `/api/runs/${run.id}/certificate-preview`)
    expect(preview.status).toBe(200)
    expect(preview.type).toBe('application/pdf')
    expect(preview.bytes.subarray(0, 5).toString('latin1')).toBe('%PDF-')
    if (hasPdftotext) {
      const text = pdfText(preview.bytes)
      expect(text).toMatch(/DRAFT/)
      expect(text).toContain('not a valid certificate')
      expect(text).not.toMatch(/Verify: |Verify this certificate/)
      expect(text).toContain('Readings taken with the instrument’s own emissivity setting of 0.95.')
      expect(text).toContain('Two readings per point instead of the method’s five')
      expect(text).toContain('Lens scratched')
      expect(text).not.toContain('rang twice')
    }
    expect((await customer.get(`/api/runs/${run.id}/certificate-preview`)).status).toBe(403)

    const issued = await quality.post('/api/certificates', { runId: run.id, password: DEMO_PASSWORD, signatoryFunction: 'Quality manager' })
    expect(issued.status, JSON.stringify(issued.body)).toBe(201)
    if (hasPdftotext) {
      const text = pdfText((await pdfBytes(quality, `/api/certificates/${issued.body.id}/pdf`)).bytes)
      expect(text).toContain('Lens scratched')
      expect(text).toContain('Calibrate as received')
      expect(text).not.toContain('rang twice')
      expect(text).not.toMatch(/DRAFT/)
    }
  })

  it('renaming the instrument after issue leaves GET /api/certificates/{id} as issued', async () => {
    const inst = await makeInstrument(tech, await organizationOf(customer))
    const run = await makeRun(tech, inst.id, versionId)
    expect((await tech.post(`/api/runs/${run.id}/points`, point())).status).toBe(201)
    const sent = (await tech.post(`/api/runs/${run.id}/submit`, { version: await versionOf(run.id) })).body
    expect((await quality.post(`/api/runs/${run.id}/approve`, { version: sent.version })).status).toBe(200)
    const cert = (await quality.post('/api/certificates', { runId: run.id, password: DEMO_PASSWORD, signatoryFunction: 'Quality manager' })).body
    const before = (await quality.get(`/api/certificates/${cert.id}`)).body
    const listed = (await quality.get(`/api/certificates?pageSize=500`)).body.rows.find((c: { id: number }) => c.id === cert.id)
    const current = (await tech.get(`/api/instruments/${inst.id}`)).body
    const renamed = await tech.patch(`/api/instruments/${inst.id}`, { version: current.version, serial: `${current.serial}-RENAMED`, model: 'Spot 9', maker: 'Another Maker' })
    expect(renamed.status, JSON.stringify(renamed.body)).toBe(200)
    expect((await quality.get(`/api/certificates/${cert.id}`)).body).toEqual(before)
    expect((await customer.get(`/api/certificates/${cert.id}`)).body.instrumentSerial).toBe(current.serial)
    expect((await quality.get(`/api/certificates?pageSize=500`)).body.rows.find((c: { id: number }) => c.id === cert.id)).toEqual(listed)
  })
})
