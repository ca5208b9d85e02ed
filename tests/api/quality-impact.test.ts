// The impact of a source or reference instrument over a period (ISO/IEC 17025:2017 6.4.9, 7.10.1 c):
// GET /api/sources/{id}/impact and /api/reference-instruments/{id}/impact, checked by hand against the
// demo scenario (scripts/demo-data), then on records made here for voided points, void runs, amended
// and withdrawn certificates.
import { beforeAll, describe, expect, it } from 'vitest'
import { GOOD_RECEIPT, makeApprovedRun, makeInstrument, makeProcedure, makeReference, makeRun, makeSource, issueCertificate, makeCustomer, pointOn } from '../support/factories'
import { DEMO_PASSWORD, signedIn, type Client } from '../support/http'

let tech: Client
let quality: Client
let admin: Client

/** The receipt of items calibrated before the factories' default receipt date (2026-11-20). */
const EARLY = { ...GOOD_RECEIPT, receivedOn: '2026-09-28' }

const ids = (rows: { id: number }[]) => rows.map(r => r.id).sort((a, b) => a - b)

async function idOf(c: Client, path: string, field: string, value: string): Promise<number> {
  const r = await c.get(`${path}?q=${encodeURIComponent(value)}&pageSize=50`)
  expect(r.status).toBe(200)
  const row = r.body.rows.find((x: Record<string, unknown>) => x[field] === value)
  expect(row, `${value} in ${path}`).toBeTruthy()
  return row.id
}

/** The demo runs of an instrument (by asset tag), oldest first, and its certificates (every revision). */
async function demoWork(assetTag: string) {
  const instrumentId = await idOf(tech, '/api/instruments', 'assetTag', assetTag)
  const runs = (await tech.get(`/api/runs?instrumentId=${instrumentId}&pageSize=50`)).body.rows as { id: number, status: string, revisionOf: number | null, calibrationDate: string }[]
  const certificates = (await quality.get(`/api/certificates?instrumentId=${instrumentId}&pageSize=50`)).body.rows as { id: number, number: string, status: string, runId: number, issueDate: string, organizationId: number }[]
  return { runs: runs.sort((a, b) => a.id - b.id), certificates }
}

beforeAll(async () => {
  ;[tech, quality, admin] = await Promise.all([signedIn('technician'), signedIn('quality'), signedIn('admin')])
})

describe('the impact list on the demo scenario (hand-checked)', () => {
  // The demo runs with the flat plate BB-FP-01 (scripts/demo-data/runs.ts and certificates.ts):
  //   KF-IR-013  2026-11-09 approved, 3 points; its certificate was issued, reopened and amended: the
  //              first revision is superseded, the amendment (-R1, valid) reports the revision run
  //              (also 2026-11-09, approved, 3 copied points)   → both runs in; the -R1 certificate in
  //   BF-IR-002  2026-11-10 approved, 6 points; its certificate was withdrawn  → run in, certificate out
  //   PG-IR-008  2026-11-18 returned, 2 points                                → run in
  //   BF-IR-009  2026-11-20 submitted, 3 points                               → run in
  //   BF-IR-001  2026-11-23 submitted, 3 points                               → run in
  //   KF-IR-016  2026-11-30 draft, 1 point                                    → after the period
  //   PG-IR-005  2026-11-27 draft, on the cavity BB-CV-02 with REF-PRT-02     → not BB-FP-01
  // The period ends on 2026-11-23 so runs other tests make with the demo plate (the browser test's on
  // 2026-11-24) stay outside it. No demo point is voided.
  it('BB-FP-01, 2026-11-01 to 2026-11-23: six runs; one certificate, the amendment of KF-IR-013 with its run and points', async () => {
    const plate = await idOf(tech, '/api/sources', 'assetTag', 'BB-FP-01')
    const kf013 = await demoWork('KF-IR-013')
    const bf002 = await demoWork('BF-IR-002')
    const others = await Promise.all(['PG-IR-008', 'BF-IR-009', 'BF-IR-001'].map(demoWork))
    expect(kf013.runs).toHaveLength(2)
    const [original, revision] = kf013.runs
    expect(revision!.revisionOf).toBe(original!.id)
    const amended = kf013.certificates.find(c => c.status === 'valid')!
    expect(amended.number).toMatch(/-R1$/)
    expect(amended.runId).toBe(revision!.id)
    expect(kf013.certificates.find(c => c.status === 'superseded')!.runId).toBe(original!.id)
    expect(bf002.certificates.map(c => c.status)).toEqual(['withdrawn'])

    const r = await quality.get(`/api/sources/${plate}/impact?from=2026-11-01&to=2026-11-23`)
    expect(r.status).toBe(200)
    expect(Object.keys(r.body).sort()).toEqual(['certificates', 'runs'])
    const expectedRuns = [original!, revision!, bf002.runs[0]!, ...others.map(o => o.runs[0]!)]
    expect(ids(r.body.runs)).toEqual(ids(expectedRuns))
    for (const run of r.body.runs) expect(run).toEqual({ id: run.id, status: expectedRuns.find(x => x.id === run.id)!.status })
    expect(r.body.runs.map((x: { status: string }) => x.status).sort()).toEqual(['approved', 'approved', 'approved', 'returned', 'submitted', 'submitted'])

    const revisionPoints = (await tech.get(`/api/runs/${revision!.id}`)).body.points as { id: number }[]
    expect(revisionPoints).toHaveLength(3)
    expect(r.body.certificates).toEqual([{
      id: amended.id,
      number: amended.number,
      issuedOn: amended.issueDate,
      organizationId: amended.organizationId,
      runId: revision!.id,
      points: ids(revisionPoints),
    }])
  })

  it('one day at a time: 2026-11-09 gives KF-IR-013’s two runs and its amendment; 2026-11-10 BF-IR-002’s run and no certificate (withdrawn)', async () => {
    const plate = await idOf(tech, '/api/sources', 'assetTag', 'BB-FP-01')
    const kf013 = await demoWork('KF-IR-013')
    const bf002 = await demoWork('BF-IR-002')
    const day9 = (await quality.get(`/api/sources/${plate}/impact?from=2026-11-09&to=2026-11-09`)).body
    expect(ids(day9.runs)).toEqual(ids(kf013.runs))
    expect(day9.certificates.map((c: { number: string }) => c.number)).toEqual([kf013.certificates.find(c => c.status === 'valid')!.number])
    const day10 = (await quality.get(`/api/sources/${plate}/impact?from=2026-11-10&to=2026-11-10`)).body
    expect(day10).toEqual({ certificates: [], runs: [{ id: bf002.runs[0]!.id, status: 'approved' }] })
  })

  it('the cavity BB-CV-02 and REF-PRT-02 were used only by PG-IR-005’s draft run (2 points); REF-PRT-01 by nothing', async () => {
    const cavity = await idOf(tech, '/api/sources', 'assetTag', 'BB-CV-02')
    const prt2 = await idOf(tech, '/api/reference-instruments', 'assetTag', 'REF-PRT-02')
    const prt1 = await idOf(tech, '/api/reference-instruments', 'assetTag', 'REF-PRT-01')
    const pg005 = await demoWork('PG-IR-005')
    const draft = { id: pg005.runs[0]!.id, status: 'draft' }
    expect((await quality.get(`/api/sources/${cavity}/impact?from=2026-11-01&to=2026-11-30`)).body).toEqual({ certificates: [], runs: [draft] })
    expect((await admin.get(`/api/reference-instruments/${prt2}/impact?from=2026-11-01&to=2026-11-30`)).body).toEqual({ certificates: [], runs: [draft] })
    expect((await quality.get(`/api/reference-instruments/${prt1}/impact?from=2026-01-01&to=2026-12-31`)).body).toEqual({ certificates: [], runs: [] })
    // the same day outside the period: nothing
    expect((await quality.get(`/api/sources/${cavity}/impact?from=2026-11-28&to=2026-12-31`)).body).toEqual({ certificates: [], runs: [] })
  })
})

describe('the impact list on records made here', () => {
  let source: { id: number, assetTag: string }
  let otherSource: { id: number }
  let thermometer: { id: number }
  let versionId: number
  let org: number
  let instrument: number
  beforeAll(async () => {
    source = await makeSource(quality)
    otherSource = await makeSource(quality)
    thermometer = await makeReference(quality)
    versionId = (await makeProcedure(quality)).currentVersion.id
    org = (await makeCustomer(admin)).id
    instrument = (await makeInstrument(tech, org)).id
  })

  it('voided points are not "used"; void runs are left out; the period is inclusive at both ends; withdrawn certificates are left out', async () => {
    // A: approved on 2026-10-01, two points on the source, certificate issued            → in, with its certificate
    const a = await makeApprovedRun(tech, quality, instrument, versionId, [pointOn(source.id, 300), pointOn(source.id, 320)], { calibrationDate: '2026-10-01', receipt: EARLY })
    const certA = await issueCertificate(quality, a)
    expect(certA.status, JSON.stringify(certA.body)).toBe(201)
    // B: draft on 2026-10-15, one point on the source (voided) and one on another source measured with the
    // reference thermometer → out for the source, in for the thermometer
    const b = await makeRun(tech, instrument, versionId, { calibrationDate: '2026-10-15', receipt: EARLY })
    const b1 = (await tech.post(`/api/runs/${b.id}/points`, pointOn(source.id, 300))).body
    const b2 = (await tech.post(`/api/runs/${b.id}/points`, { ...pointOn(otherSource.id, 310), sourceIndicatedK: null, referenceInstrumentId: thermometer.id, referenceReadingK: 310.05 })).body
    expect((await tech.post(`/api/runs/${b.id}/points/${b1.id}/void`, { reason: 'Wrong source chosen', version: b1.version })).status).toBe(200)
    // C: draft on 2026-10-31 with a point on the source, then the whole run voided          → out
    const c = await makeRun(tech, instrument, versionId, { calibrationDate: '2026-10-31', receipt: EARLY })
    expect((await tech.post(`/api/runs/${c.id}/points`, pointOn(source.id, 300))).status).toBe(201)
    const cNow = (await tech.get(`/api/runs/${c.id}`)).body
    expect((await tech.post(`/api/runs/${c.id}/void`, { reason: 'Instrument returned unused', version: cNow.version })).status).toBe(200)
    // D: draft on 2026-10-31 with one of two points voided                                  → in, with the other point
    const d = await makeRun(tech, instrument, versionId, { calibrationDate: '2026-10-31', receipt: EARLY })
    const d1 = (await tech.post(`/api/runs/${d.id}/points`, pointOn(source.id, 300))).body
    const d2 = (await tech.post(`/api/runs/${d.id}/points`, pointOn(source.id, 330))).body
    expect((await tech.post(`/api/runs/${d.id}/points/${d1.id}/void`, { reason: 'Readings typed twice', version: d1.version })).status).toBe(200)

    const all = (await quality.get(`/api/sources/${source.id}/impact?from=2026-10-01&to=2026-10-31`)).body
    expect(all.runs).toEqual([{ id: a, status: 'approved' }, { id: d.id, status: 'draft' }])
    const aPoints = ids((await tech.get(`/api/runs/${a}`)).body.points)
    expect(all.certificates).toEqual([{ id: certA.body.id, number: certA.body.number, issuedOn: expect.stringMatching(/^\d{4}-\d{2}-\d{2}$/), organizationId: org, runId: a, points: aPoints }])
    expect((await quality.get(`/api/reference-instruments/${thermometer.id}/impact?from=2026-10-15&to=2026-10-15`)).body).toEqual({ certificates: [], runs: [{ id: b.id, status: 'draft' }] })
    // the period's ends: 2026-10-02 to 2026-10-30 holds neither A nor D
    expect((await quality.get(`/api/sources/${source.id}/impact?from=2026-10-02&to=2026-10-30`)).body).toEqual({ certificates: [], runs: [] })
    expect(b2.id).toBeGreaterThan(0)
    expect(d2.id).toBeGreaterThan(0)

    // withdrawn: the run stays, the certificate goes
    expect((await quality.post(`/api/certificates/${certA.body.id}/withdraw`, { reason: 'Test of the impact list', password: DEMO_PASSWORD })).status).toBe(200)
    const after = (await quality.get(`/api/sources/${source.id}/impact?from=2026-10-01&to=2026-10-01`)).body
    expect(after).toEqual({ certificates: [], runs: [{ id: a, status: 'approved' }] })
  })

  it('bad input is 400 naming the field; no such item is 404; only quality and admin may ask', async () => {
    const bad = await quality.get(`/api/sources/${source.id}/impact?from=2026-13-01&to=2026-12-01`)
    expect(bad.status).toBe(400)
    expect(bad.body.data.fields).toHaveProperty('from')
    const reversed = await quality.get(`/api/sources/${source.id}/impact?from=2026-12-01&to=2026-11-01`)
    expect(reversed.status).toBe(400)
    expect(reversed.body.data.fields).toHaveProperty('to')
    const missing = await quality.get(`/api/reference-instruments/${thermometer.id}/impact?from=2026-01-01`)
    expect(missing.status).toBe(400)
    expect(missing.body.data.fields).toHaveProperty('to')
    expect((await quality.get('/api/sources/987654/impact?from=2026-01-01&to=2026-12-31')).status).toBe(404)
    expect((await tech.get(`/api/sources/${source.id}/impact?from=2026-01-01&to=2026-12-31`)).status).toBe(403)
    expect((await (await signedIn('customer')).get(`/api/sources/${source.id}/impact?from=2026-01-01&to=2026-12-31`)).status).toBe(403)
  })
})
