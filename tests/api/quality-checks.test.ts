// Intermediate checks (ISO/IEC 17025:2017 6.4.10): control-chart limits from a known series, and what a
// failed check sets off — the item out of service (the run form refuses it, naming item and reason), a
// nonconformity listing the affected certificates with the effect at each point, issuing withheld
// (409), decisions per certificate (keep, amend through reopening, withdraw), customers told through
// the outbox, work resumed, the record closed. Records are made here with the factories.
import { beforeAll, describe, expect, it } from 'vitest'
import { issueCertificate, makeApprovedRun, makeCustomer, makeInstrument, makeProcedure, makeRun, makeSource, pointOn } from '../support/factories'
import { DEMO_PASSWORD, signedIn, unique, type Client } from '../support/http'

let tech: Client
let quality: Client
let admin: Client

beforeAll(async () => {
  ;[tech, quality, admin] = await Promise.all([signedIn('technician'), signedIn('quality'), signedIn('admin')])
})

const plan = (equipmentId: number, over: Record<string, unknown> = {}) => ({
  equipmentType: 'source', equipmentId, title: unique('Radiance temperature at 50 °C '), method: 'Check thermometer at 300 mm, five readings.',
  intervalDays: 30, acceptance: 'limit', acceptanceLimitK: 0.5, nominalsK: [323.15], startOn: '2025-01-01', ...over,
})

describe('control chart of a check series', () => {
  // The series is the NIST/SEMATECH e-Handbook of Statistical Methods 6.3.2.2 individuals-chart example
  // (flow rate x = 49.6, 47.6, 49.9, 51.3, 47.8, 51.2, 52.6, 52.4, 53.6, 52.1), recorded as deviations
  // d = (x − 50)/10 K. Limits are affine in the data, so the published answer maps the same way:
  // x̄ = 50.81 → 0.081; MR̄ = 1.8778 → 0.18778; UCL = 55.8041 → 0.58041; LCL = 45.8159 → −0.41841 (moving-range
  // method, d₂ = 1.128). For σ = s (NIST SOP 9, the chart's default) the numpy values of
  // tests/reference/control_chart.py ("nist", standard-deviation: s = 2.03385239276491, x̄ ± 2s = 46.7422952144702 /
  // 54.8777047855298, x̄ ± 3s = 44.7084428217053 / 56.9115571782947) map to s = 0.203385239276491 and the limits below.
  const FLOW = [49.6, 47.6, 49.9, 51.3, 47.8, 51.2, 52.6, 52.4, 53.6, 52.1]
  let planId: number
  beforeAll(async () => {
    const source = await makeSource(quality)
    const p = await quality.post('/api/check-plans', plan(source.id))
    expect(p.status, JSON.stringify(p.body)).toBe(201)
    planId = p.body.id
    for (const [i, x] of FLOW.entries()) {
      const r = await tech.post(`/api/check-plans/${planId}/results`, { checkedOn: `2025-${String(i + 1).padStart(2, '0')}-06`, nominalK: 323.15, measuredK: 323.15 + (x - 50) / 10 })
      expect(r.status, JSON.stringify(r.body)).toBe(201)
      expect(r.body.result.verdict).toBe('pass')
      expect(r.body.nonconformity).toBeNull()
    }
  })

  it('moving-range limits match the published answer (4 decimals, as published)', async () => {
    const c = await quality.get(`/api/check-plans/${planId}/chart?method=moving-range`)
    expect(c.status, JSON.stringify(c.body)).toBe(200)
    expect(c.body.points).toHaveLength(10)
    expect(c.body.limits.centre).toBeCloseTo(0.081, 5)
    expect(c.body.limits.movingRangeMean).toBeCloseTo(0.18778, 5)
    expect(c.body.limits.actionUpper).toBeCloseTo(0.58041, 5)
    expect(c.body.limits.actionLower).toBeCloseTo(-0.41841, 5)
  })

  it('standard-deviation limits (the default) match numpy to 1e-9, and the run rules are stated on the chart', async () => {
    const c = (await tech.get(`/api/check-plans/${planId}/chart`)).body
    expect(c.limits.method).toBe('standard-deviation')
    expect(c.limits.sigma).toBeCloseTo(0.203385239276491, 9)
    expect(c.limits.warningLower).toBeCloseTo((46.7422952144702 - 50) / 10, 9)
    expect(c.limits.warningUpper).toBeCloseTo((54.8777047855298 - 50) / 10, 9)
    expect(c.limits.actionLower).toBeCloseTo((44.7084428217053 - 50) / 10, 9)
    expect(c.limits.actionUpper).toBeCloseTo((56.9115571782947 - 50) / 10, 9)
    expect(c.limits.reference).toMatch(/NIST SOP No\. 9/)
    expect(c.runRules).toHaveLength(5)
    expect(c.runRules[0]).toMatch(/beyond an action limit/)
    // within ±2s everywhere: no point beyond a limit, no signal of rule 1
    expect(c.points.every((p: { zone: string }) => p.zone === 'within-warning')).toBe(true)
    expect(c.signals.filter((s: { rule: string }) => s.rule === 'action-limit')).toEqual([])
  })

  it('baselineCount beyond the series is 400 naming it; a plan judged by E_n needs both uncertainties (400 naming the field)', async () => {
    const bad = await tech.get(`/api/check-plans/${planId}/chart?baselineCount=11`)
    expect(bad.status).toBe(400)
    expect(bad.body.data.fields).toHaveProperty('baselineCount')
    const source = await makeSource(quality)
    const en = await quality.post('/api/check-plans', plan(source.id, { acceptance: 'en', acceptanceLimitK: null }))
    expect(en.status, JSON.stringify(en.body)).toBe(201)
    const missing = await tech.post(`/api/check-plans/${en.body.id}/results`, { checkedOn: '2026-01-10', nominalK: 323.15, measuredK: 323.2, nominalUncertaintyK: 0.1 })
    expect(missing.status).toBe(400)
    expect(missing.body.data.fields).toHaveProperty('expandedUncertaintyK')
    expect((await tech.get(`/api/check-results?planId=${en.body.id}`)).body.total).toBe(0)
    const noLimit = await quality.post('/api/check-plans', plan(source.id, { acceptanceLimitK: null }))
    expect(noLimit.status).toBe(400)
    expect(noLimit.body.data.fields).toHaveProperty('acceptanceLimitK')
    expect((await tech.post('/api/check-plans', plan(source.id))).status).toBe(403)
  })
})

describe('a failed check', () => {
  let source: { id: number, assetTag: string }
  let planId: number
  let versionId: number
  let orgId: number
  let contactEmail: string
  let instrument: number
  let r0: number, r1: number, r2: number
  let cert0: number, cert1: number
  let ncId: number
  let ncNumber: string

  beforeAll(async () => {
    source = await makeSource(quality)
    planId = (await quality.post('/api/check-plans', plan(source.id, { acceptanceLimitK: 0.3, intervalDays: 7, startOn: '2026-11-01' }))).body.id
    versionId = (await makeProcedure(quality, {
      template: [{ name: 'Reference', type: 'B', distribution: 'normal', value: 0.05, coverageFactor: 2, unit: 'K', input: 'sourceTemperature' }],
      cmc: [{ minK: 250, maxK: 450, expandedUncertaintyK: 0.4 }],
    })).currentVersion.id
    orgId = (await makeCustomer(admin)).id
    contactEmail = `${unique('qa')}@checks.example`
    expect((await tech.post(`/api/customers/${orgId}/contacts`, { name: 'Ines Calloway', email: contactEmail })).status).toBe(201)
    instrument = (await makeInstrument(tech, orgId)).id
    // good evidence on 2026-11-20; work on 2026-11-24 and -25; the check fails on 2026-11-26
    expect((await tech.post(`/api/check-plans/${planId}/results`, { checkedOn: '2026-11-20', nominalK: 323.15, measuredK: 323.2 })).body.result.verdict).toBe('pass')
    r0 = await makeApprovedRun(tech, quality, instrument, versionId, [pointOn(source.id, 323.15)], { calibrationDate: '2026-11-24' })
    r1 = await makeApprovedRun(tech, quality, instrument, versionId, [pointOn(source.id, 323.15), pointOn(source.id, 373.15)], { calibrationDate: '2026-11-25' })
    r2 = await makeApprovedRun(tech, quality, instrument, versionId, [pointOn(source.id, 323.15)], { calibrationDate: '2026-11-25' })
    cert0 = (await issueCertificate(quality, r0)).body.id
    cert1 = (await issueCertificate(quality, r1)).body.id
  })

  it('raises a withholding nonconformity over the work since the last good evidence and takes the item out of service', async () => {
    const r = await tech.post(`/api/check-plans/${planId}/results`, { checkedOn: '2026-11-26', nominalK: 323.15, measuredK: 323.65 })
    expect(r.status, JSON.stringify(r.body)).toBe(201)
    expect(r.body.result).toMatchObject({ verdict: 'fail', statement: 'Deviation +0.5 K exceeds the limit ±0.3 K' })
    expect(r.body.result.deviationK).toBeCloseTo(0.5, 9)
    const nc = r.body.nonconformity
    expect(nc).toMatchObject({ origin: 'check', originId: r.body.result.id, withhold: true, status: 'open', equipmentType: 'source', equipmentId: source.id, affectedFrom: '2026-11-20', affectedTo: '2026-11-26', raisedOn: '2026-11-26' })
    expect(nc.number).toMatch(/^NC-2026-\d{3}$/)
    ncId = nc.id
    ncNumber = nc.number
    expect(r.body.result.nonconformityNumber).toBe(ncNumber)

    const s = (await tech.get(`/api/sources/${source.id}`)).body
    expect(s.status).toBe('out-of-service')
    expect(s.statusReason).toContain(ncNumber)
    expect(s.statusReason).toContain('failed its intermediate check on 2026-11-26')
  })

  it('the run form then refuses the item, naming it and the reason', async () => {
    const run = await makeRun(tech, instrument, versionId, { calibrationDate: '2026-11-27' })
    const p = await tech.post(`/api/runs/${run.id}/points`, pointOn(source.id, 323.15))
    expect(p.status).toBe(400)
    expect(p.body.data.fields.sourceId).toContain(source.assetTag)
    expect(p.body.data.fields.sourceId).toMatch(/out of service: failed its intermediate check on 2026-11-26/)
    expect(p.body.data.fields.sourceId).toContain(ncNumber)
    expect((await tech.get(`/api/runs/${run.id}`)).body.points).toHaveLength(0)
  })

  it('lists the affected certificates and runs, with the effect of the correction at each point', async () => {
    const d = (await quality.get(`/api/nonconformities/${ncId}`)).body
    expect(d.affected.certificates.map((c: { id: number }) => c.id).sort()).toEqual([cert0, cert1].sort())
    expect(d.affected.runs.map((r: { id: number }) => r.id).sort()).toEqual([r0, r1, r2].sort())
    expect(d.affectedWhenRaised.runs).toHaveLength(3)
    expect(d.undecidedCertificateIds.sort()).toEqual([cert0, cert1].sort())
    // δ = +0.5 K at 323.15 K (measured − nominal); the 373.15 K point lies outside the data (± 1 K)
    const points = (await tech.get(`/api/runs/${r1}`)).body.points as { id: number, setPointK: number, result: { errorK: number, budget: { statedUncertaintyK: number, components: { input: string, sensitivity: number }[] } } }[]
    const at50 = points.find(p => p.setPointK === 323.15)!
    const at100 = points.find(p => p.setPointK === 373.15)!
    const e50 = d.affected.effects.find((e: { pointId: number }) => e.pointId === at50.id)
    const c = at50.result.budget.components.find(l => l.input === 'sourceTemperature')!.sensitivity
    expect(c).toBeGreaterThan(0.9) // ε_i = ε_s = 0.95: the reading follows the source almost 1:1
    expect(e50.correctionK).toBeCloseTo(0.5, 9)
    expect(e50.errorShiftK).toBeCloseTo(-0.5 * c, 9) // Δ = −c·δ
    expect(e50.correctedErrorK).toBeCloseTo(at50.result.errorK - 0.5 * c, 9)
    expect(at50.result.budget.statedUncertaintyK).toBe(0.4) // the CMC is stated
    expect(e50.withinUncertainty).toBe(false) // |Δ| ≈ 0.5 K > U = 0.4 K
    expect(e50.assessment).toBe('exceeds-uncertainty')
    expect(e50.correctedVerdict).toBe('pass') // |E′| < TL = 1 K (greater of 1 K and 1 %)
    expect(d.affected.effects.find((e: { pointId: number }) => e.pointId === at100.id)).toMatchObject({ assessment: 'not-computable', correctionK: null })
  })

  it('withholds issuing from an affected run (409 naming the nonconformity)', async () => {
    const r = await issueCertificate(quality, r2)
    expect(r.status).toBe(409)
    expect((r.body as unknown as { data: { fields: { runId: string } } }).data.fields.runId).toContain(ncNumber)
    expect((await quality.get(`/api/certificates?runId=${r2}`)).body.total).toBe(0)
  })

  it('decides per certificate: keep; amend (reopened; its amendment is issued despite the withhold); a certificate it does not affect is 400', async () => {
    const keep = await quality.post(`/api/nonconformities/${ncId}/decisions`, { certificateId: cert0, decision: 'keep', reason: 'The 50 °C point stays within the tolerance after the correction.' })
    expect(keep.status, JSON.stringify(keep.body)).toBe(201)
    expect((await quality.post(`/api/nonconformities/${ncId}/decisions`, { certificateId: cert0, decision: 'keep', reason: 'Again' })).status).toBe(409)
    const other = (await quality.get('/api/certificates?status=valid&pageSize=100')).body.rows.find((c: { id: number }) => c.id !== cert0 && c.id !== cert1)
    const stranger = await quality.post(`/api/nonconformities/${ncId}/decisions`, { certificateId: other.id, decision: 'keep', reason: 'Not ours' })
    expect(stranger.status).toBe(400)
    expect(stranger.body.data.fields).toHaveProperty('certificateId')
    expect((await tech.post(`/api/nonconformities/${ncId}/decisions`, { certificateId: cert1, decision: 'keep', reason: 'x' })).status).toBe(403)

    const amend = await quality.post(`/api/nonconformities/${ncId}/decisions`, { certificateId: cert1, decision: 'amend', reason: 'The 50 °C point is re-evaluated with the corrected plate temperature.' })
    expect(amend.status, JSON.stringify(amend.body)).toBe(201)
    const decision = amend.body.decisions.find((x: { certificateId: number }) => x.certificateId === cert1)
    expect(decision.revisionRunId).toBeGreaterThan(0)
    const rev = (await tech.get(`/api/runs/${decision.revisionRunId}`)).body
    expect(rev).toMatchObject({ revisionOf: r1, status: 'draft' })
    expect(rev.revisionReason).toContain(ncNumber)
    const sub = await tech.post(`/api/runs/${rev.id}/submit`, { version: rev.version })
    expect(sub.status, JSON.stringify(sub.body)).toBe(200)
    expect((await quality.post(`/api/runs/${rev.id}/approve`, { version: sub.body.version })).status).toBe(200)
    const amended = await quality.post(`/api/certificates/${cert1}/amend`, { password: DEMO_PASSWORD, signatoryFunction: 'Quality manager' })
    expect(amended.status, JSON.stringify(amended.body)).toBe(201)
    const d = (await quality.get(`/api/nonconformities/${ncId}`)).body
    expect(d.undecidedCertificateIds).toEqual([]) // the amendment carries the amend decision
  })

  it('with the withhold off the run is certified; its certificate is withdrawn by decision (password again)', async () => {
    const nc = (await quality.get(`/api/nonconformities/${ncId}`)).body
    const off = await quality.patch(`/api/nonconformities/${ncId}`, { withhold: false, version: nc.version })
    expect(off.status, JSON.stringify(off.body)).toBe(200)
    const issued = await issueCertificate(quality, r2)
    expect(issued.status, JSON.stringify(issued.body)).toBe(201)
    expect((await quality.get(`/api/nonconformities/${ncId}`)).body.undecidedCertificateIds).toEqual([issued.body.id])
    const noPassword = await quality.post(`/api/nonconformities/${ncId}/decisions`, { certificateId: issued.body.id, decision: 'withdraw', reason: 'Issued before the review' })
    expect(noPassword.status).toBe(400)
    expect(noPassword.body.data.fields).toHaveProperty('password')
    const w = await quality.post(`/api/nonconformities/${ncId}/decisions`, { certificateId: issued.body.id, decision: 'withdraw', reason: 'Issued before the review of the plate', password: DEMO_PASSWORD })
    expect(w.status, JSON.stringify(w.body)).toBe(201)
    expect((await quality.get(`/api/certificates/${issued.body.id}`)).body.status).toBe('withdrawn')
  })

  it('tells the customer through the outbox; closes only after work resumed, which puts the item back in service', async () => {
    const n = await quality.post(`/api/nonconformities/${ncId}/notify`, { message: 'Our plate ran 0.5 K warm between 20 and 26 November; the certificates below were reviewed.' })
    expect(n.status, JSON.stringify(n.body)).toBe(200)
    expect(n.body.notifications).toHaveLength(1)
    expect(n.body.notifications[0]).toMatchObject({ organizationId: orgId, outboxMessageId: expect.any(Number) })
    const outbox = (await admin.get('/api/admin/mail/outbox?kind=nonconformity-notice&pageSize=100')).body.rows as { recipients: string[], subject: string, text: string }[]
    const mine = outbox.filter(m => m.recipients.includes(contactEmail))
    expect(mine).toHaveLength(1)
    expect(mine[0]!.subject).toContain(ncNumber)
    expect(mine[0]!.text).toContain('ran 0.5 K warm')

    let nc = (await quality.get(`/api/nonconformities/${ncId}`)).body
    const early = await quality.post(`/api/nonconformities/${ncId}/close`, { note: 'Done', version: nc.version })
    expect(early.status).toBe(409)
    expect(early.body.data.fields).toHaveProperty('resumedAt')
    const resumed = await quality.post(`/api/nonconformities/${ncId}/resume`, { note: 'Plate re-levelled; repeat check within 0.05 K.', version: nc.version })
    expect(resumed.status, JSON.stringify(resumed.body)).toBe(200)
    expect(resumed.body.resumedByName).toBe('Quinn Halvorsen')
    const s = (await tech.get(`/api/sources/${source.id}`)).body
    expect(s).toMatchObject({ status: 'in-service', statusReason: null })
    nc = resumed.body
    const closed = await quality.post(`/api/nonconformities/${ncId}/close`, { note: 'Reviewed and closed', version: nc.version })
    expect(closed.status, JSON.stringify(closed.body)).toBe(200)
    expect(closed.body).toMatchObject({ status: 'closed', withhold: false })
    const audit = closed.body.audit.map((a: { action: string }) => a.action)
    expect(audit).toEqual(expect.arrayContaining(['raise-on-check', 'decide', 'release', 'notify-customers', 'resume-work', 'close']))
  })
})
