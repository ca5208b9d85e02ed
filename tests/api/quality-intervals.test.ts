// Interval review (ILAC-G24:2007 / OIML D 10:2007) from a hand-made as-found history recorded on a
// reference thermometer's calibrations, and a reference found out of tolerance at its calibration.
//
// History at 373.15 K (correction found = true − value used, u = 0.1 K, tolerance 1 K):
//   2016-01-01 −0.6 K, 2020-01-01 −0.2 K, 2024-01-01 +0.2 K (due 2026-01-01: the interval that has
//   just ended is 24 months).
// Staircase (lengthen ×1.25 within 80 % of the tolerance, the defaults): the latest as-found used
//   0.2/1 = 20 % of the tolerance, in tolerance → 24 × 1.25 = 30 months (hand-computed); ×1.5 → 36.
// Drift: the three points lie on d = −0.6 + 0.1·(years since 2016), a slope of 0.1 K per year (the
//   years between them are 1461 days each, 4 × 365.25). The unit tests of shared/quality/intervals.ts
//   solve this same case in closed form: Δ* = (408 − √52224)/42 = 4.27319738777688 years (also
//   scipy.optimize.brentq in tests/reference/drift_interval.py, case "exact"), so with the longest
//   interval 120 months the interval is 51 months, due 2028-04-01 (52 months, 2028-05-01, is past Δ*).
import { beforeAll, describe, expect, it } from 'vitest'
import { GOOD_RECEIPT, issueCertificate, makeApprovedRun, makeInstrument, makeProcedure, makeReference, makeSource, organizationOf } from '../support/factories'
import { signedIn, unique, type Client } from '../support/http'

let tech: Client
let quality: Client
let admin: Client
let ref: { id: number, assetTag: string }

const cal = (calibrationDate: string, dueDate: string, correctionK: number, toleranceK = 1) => ({
  provider: 'Testwick Thermal Standards', certificateNumber: unique('TC-'), calibrationDate, dueDate,
  asFound: { corrections: [[373.15, correctionK]], standardUncertaintyK: 0.1, toleranceK },
})

beforeAll(async () => {
  ;[tech, quality, admin] = await Promise.all([signedIn('technician'), signedIn('quality'), signedIn('admin')])
  ref = await makeReference(quality, { calibration: null })
  for (const c of [cal('2016-01-01', '2020-01-01', -0.6), cal('2020-01-01', '2024-01-01', -0.2), cal('2024-01-01', '2026-01-01', 0.2)]) {
    const r = await quality.post(`/api/reference-instruments/${ref.id}/calibrations`, c)
    expect(r.status, JSON.stringify(r.body)).toBe(201)
    expect(r.body).toMatchObject({ asFoundInTolerance: true, nonconformityId: null })
  }
})

describe('interval review of the laboratory’s own equipment', () => {
  it('shows the history and proposes 30 months by the staircase and 51 months by the drift method', async () => {
    const r = await tech.get(`/api/reference-instruments/${ref.id}/interval-review?maxMonths=120`)
    expect(r.status, JSON.stringify(r.body)).toBe(200)
    const v = r.body
    expect(v.item).toMatchObject({ type: 'reference', id: ref.id, label: ref.assetTag })
    expect(v.temperatureK).toBe(373.15)
    expect(v.history.map((h: { date: string, deviationK: number }) => [h.date, h.deviationK])).toEqual([['2016-01-01', -0.6], ['2020-01-01', -0.2], ['2024-01-01', 0.2]])
    expect(v.currentMonths).toBe(24)
    expect(v.staircase.input).toMatchObject({ currentMonths: 24, foundInTolerance: true, fractionOfTolerance: 0.2, lengthenFactor: 1.25 })
    expect(v.staircase.result).toMatchObject({ action: 'lengthen', exactMonths: 30, proposedMonths: 30 })
    expect(v.drift.result.slopePerYear).toBeCloseTo(0.1, 12)
    expect(v.drift.result.intercept).toBeCloseTo(0.2, 12)
    expect(v.drift.result.limitYears).toBeCloseTo(4.27319738777688, 10)
    expect(v.drift.result).toMatchObject({ months: 51, dueDate: '2028-04-01', originDate: '2024-01-01', limitedBy: null })
    expect(v.customerInstrument).toBe(false)
  })

  it('follows the factors and limits the laboratory sets', async () => {
    const a = (await tech.get(`/api/reference-instruments/${ref.id}/interval-review?lengthenFactor=1.5&maxMonths=120`)).body
    expect(a.staircase.result.proposedMonths).toBe(36)
    const capped = (await tech.get(`/api/reference-instruments/${ref.id}/interval-review?maxMonths=36`)).body
    expect(capped.drift.result).toMatchObject({ months: 36, limitedBy: 'maxMonths' })
    expect(capped.staircase.result.proposedMonths).toBe(30)
    const none = (await tech.get(`/api/reference-instruments/${ref.id}/interval-review?temperatureK=500`)).body
    expect(none.history).toEqual([])
    expect(none.drift).toBeNull()
    expect(none.notes.join(' ')).toMatch(/Drift: 0 as-found result/)
    const bad = await tech.get(`/api/reference-instruments/${ref.id}/interval-review?shortenFactor=1.2`)
    expect(bad.status).toBe(400)
    expect(bad.body.data.fields).toHaveProperty('shortenFactor')
  })

  it('records the decision with its analysis (audited); only quality and admin decide', async () => {
    expect((await tech.post(`/api/reference-instruments/${ref.id}/interval-decisions`, { method: 'drift', decidedMonths: 48, reason: 'x' })).status).toBe(403)
    const bad = await quality.post(`/api/reference-instruments/${ref.id}/interval-decisions`, { method: 'drift', decidedMonths: 48, reason: 'x', settings: { maxMonths: 0 } })
    expect(bad.status).toBe(400)
    expect(bad.body.data.fields).toHaveProperty('settings.maxMonths')
    const r = await quality.post(`/api/reference-instruments/${ref.id}/interval-decisions`, { method: 'drift', decidedMonths: 48, reason: 'Drift method, rounded down to four years.', settings: { maxMonths: 120 } })
    expect(r.status, JSON.stringify(r.body)).toBe(201)
    expect(r.body.decisions[0]).toMatchObject({ method: 'drift', proposedMonths: 51, decidedMonths: 48, decidedByName: 'Quinn Halvorsen' })
    expect(r.body.decisions[0].analysis.drift.result.months).toBe(51)
    const audit = (await admin.get(`/api/admin/audit?entity=IntervalDecision&entityId=${r.body.decisions[0].id}`)).body.rows
    expect(audit).toHaveLength(1)
    expect(audit[0]).toMatchObject({ action: 'create' })
  })
})

describe('a customer’s instrument: the same analysis for the laboratory only', () => {
  it('reads the as-found points of its approved runs; customers get 403', async () => {
    const customer = await signedIn('customer')
    const instrument = (await makeInstrument(tech, await organizationOf(customer))).id
    const source = await makeSource(quality)
    const versionId = (await makeProcedure(quality)).currentVersion.id
    const first = await makeApprovedRun(tech, quality, instrument, versionId, [{ sourceId: source.id, setPointK: 323.15, sourceIndicatedK: 323.15, readingsK: [323.0, 323.1, 322.9] }], { calibrationDate: '2026-10-01', receipt: { ...GOOD_RECEIPT, receivedOn: '2026-09-28' } })
    const second = await makeApprovedRun(tech, quality, instrument, versionId, [{ sourceId: source.id, setPointK: 323.15, sourceIndicatedK: 323.15, readingsK: [322.8, 322.9, 322.7] }])
    const v = (await tech.get(`/api/instruments/${instrument}/interval-review`)).body
    expect(v).toMatchObject({ customerInstrument: true, temperatureK: 323.15, currentMonths: 12, decisions: [] })
    const errors = await Promise.all([first, second].map(async id => (await tech.get(`/api/runs/${id}`)).body.points[0].result.errorK))
    expect(v.history.map((h: { deviationK: number }) => h.deviationK)).toEqual(errors)
    expect(v.history.map((h: { sourceRecord: string }) => h.sourceRecord)).toEqual([`run:${first}`, `run:${second}`])
    expect((await customer.get(`/api/instruments/${instrument}/interval-review`)).status).toBe(403)
  })
})

describe('a reference found out of tolerance at its calibration', () => {
  it('raises a withholding nonconformity over its work since the last good evidence, with the corrections found', async () => {
    const thermometer = await makeReference(quality) // calibrated 2026-01-15, due 2028-01-15
    const source = await makeSource(quality)
    const versionId = (await makeProcedure(quality, {
      template: [{ name: 'Reference', type: 'B', distribution: 'normal', value: 0.05, coverageFactor: 2, unit: 'K', input: 'sourceTemperature' }],
    })).currentVersion.id
    const instrument = (await makeInstrument(tech, await organizationOf(await signedIn('customer')))).id
    const run = await makeApprovedRun(tech, quality, instrument, versionId, [{ sourceId: source.id, setPointK: 323.15, referenceInstrumentId: thermometer.id, referenceReadingK: 323.2, readingsK: [323.0, 323.1, 322.9] }])
    const cert = (await issueCertificate(quality, run)).body
    const r = await quality.post(`/api/reference-instruments/${thermometer.id}/calibrations`, {
      provider: 'Testwick Thermal Standards', certificateNumber: unique('TC-'), calibrationDate: '2026-11-28', dueDate: '2027-11-28',
      asFound: { corrections: [[273.15, -0.1], [373.15, -0.5]], standardUncertaintyK: 0.02, toleranceK: 0.2 },
    })
    expect(r.status, JSON.stringify(r.body)).toBe(201)
    expect(r.body.asFoundInTolerance).toBe(false)
    expect(r.body.nonconformityId).toEqual(expect.any(Number))
    const nc = (await quality.get(`/api/nonconformities/${r.body.nonconformityId}`)).body
    expect(nc).toMatchObject({ origin: 'calibration', withhold: true, equipmentType: 'reference', equipmentId: thermometer.id, affectedFrom: '2026-01-15', affectedTo: '2026-11-28' })
    expect(nc.affected.certificates.map((c: { id: number }) => c.id)).toEqual([cert.id])
    // δ at the point's reference temperature 323.2 K, interpolated between −0.1 K (273.15 K) and −0.5 K (373.15 K):
    // −0.1 + (−0.4)·(50.05/100) = −0.3002 K (hand-computed)
    expect(nc.affected.effects[0].correctionK).toBeCloseTo(-0.3002, 9)
    expect(nc.affected.effects[0].assessment).not.toBe('not-computable')
  })
})
