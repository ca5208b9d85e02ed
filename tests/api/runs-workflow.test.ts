// Runs: procedures and their versions, submission and review, separation of duties, amendments
// with reasons (ISO/IEC 17025 7.5), the lock on approved runs, customers kept out, the demo runs.
import { beforeAll, describe, expect, it } from 'vitest'
import { GOOD_RECEIPT, makeCustomer, makeInstrument, makeSource } from '../support/factories'
import { type Client, signedIn, unique } from '../support/http'

let tech: Client
let quality: Client
let admin: Client
let customer: Client
let instrumentId: number
let plate: { id: number, assetTag: string }
let versionId: number

const point = () => ({ sourceId: plate.id, setPointK: 323.15, sourceIndicatedK: 323.15, readingsK: [323.3, 323.2, 323.4] })

async function newRun(by: Client = tech, over: Record<string, unknown> = {}) {
  const r = await by.post('/api/runs', {
    instrumentId, procedureVersionId: versionId, calibrationDate: '2026-11-25',
    ambientTemperatureK: 296.15, relativeHumidityPct: 40, distanceMm: 300, emissivitySetting: 0.95, reflectedTemperatureK: 296.15, instrumentTemperatureK: 296.15,
    ...over,
  })
  expect(r.status, JSON.stringify(r.body)).toBe(201)
  const received = await by.post(`/api/runs/${r.body.id}/receipt`, GOOD_RECEIPT)
  expect(received.status, JSON.stringify(received.body)).toBe(200)
  return received.body
}

/** The run's version now (every change of its data moves it on). */
async function versionOf(runId: number, by: Client = tech): Promise<number> {
  return (await by.get(`/api/runs/${runId}`)).body.version
}

async function submitted(by: Client = tech) {
  const run = await newRun(by)
  const pt = await by.post(`/api/runs/${run.id}/points`, point())
  expect(pt.status, JSON.stringify(pt.body)).toBe(201)
  const s = await by.post(`/api/runs/${run.id}/submit`, { version: await versionOf(run.id, by) })
  expect(s.status, JSON.stringify(s.body)).toBe(200)
  return { run: s.body, point: pt.body }
}

beforeAll(async () => {
  ;[tech, quality, admin, customer] = await Promise.all([signedIn('technician'), signedIn('quality'), signedIn('admin'), signedIn('customer')])
  // any instrument and any source usable on the runs' date (2026-11-25) whose table holds 323.15 K
  instrumentId = (await makeInstrument(tech, (await makeCustomer(tech)).id)).id
  plate = await makeSource(quality)
  const p = await quality.post('/api/procedures', {
    name: unique('Workflow procedure '), documentReference: 'WF-1', decisionRule: 'guard-band', guardBandFactor: 1,
    template: [{ name: 'Reference', type: 'B', distribution: 'normal', value: 0.05, coverageFactor: 2, unit: 'K', input: 'sourceTemperature' }],
    cmc: [{ minK: 250, maxK: 450, expandedUncertaintyK: 0.4 }],
    applicability: { sourceKinds: ['flat-plate', 'cavity'], bandMinUm: 0.5, bandMaxUm: 20, minK: 200, maxK: 2000 },
  })
  expect(p.status, JSON.stringify(p.body)).toBe(201)
  versionId = p.body.currentVersion.id
})

describe('procedures are versioned', () => {
  it('an edit makes a new version; a run keeps the version it used; a stale version is 409', async () => {
    const created = (await quality.post('/api/procedures', {
      name: unique('Versioned '), documentReference: 'V-1', decisionRule: 'simple-acceptance',
      template: [{ name: 'Ambient', type: 'B', distribution: 'standard', value: 0.1, unit: 'K', input: 'reading' }], cmc: [],
      applicability: { sourceKinds: ['flat-plate', 'cavity'], bandMinUm: 0.5, bandMaxUm: 20, minK: 200, maxK: 2000 },
    })).body
    expect(created.currentVersion.versionNumber).toBe(1)
    const run = await newRun(tech, { procedureVersionId: created.currentVersion.id })
    const edited = await quality.patch(`/api/procedures/${created.id}`, { version: created.version, decisionRule: 'non-binary', guardBandFactor: 0.5, changeNote: 'Non-binary statements from now on' })
    expect(edited.status, JSON.stringify(edited.body)).toBe(200)
    expect(edited.body.versions.map((v: { versionNumber: number }) => v.versionNumber)).toEqual([2, 1])
    expect(edited.body.currentVersion.decisionRule).toBe('non-binary')
    expect(edited.body.currentVersion.template).toEqual(created.currentVersion.template)
    expect((await quality.patch(`/api/procedures/${created.id}`, { version: created.version, name: 'x' })).status).toBe(409)
    const detail = (await tech.get(`/api/runs/${run.id}`)).body
    expect(detail.procedureVersion.versionNumber).toBe(1)
    expect(detail.procedureVersion.decisionRule).toBe('simple-acceptance')
    const list = (await tech.get('/api/procedures')).body as { id: number, currentVersion: { versionNumber: number } }[]
    expect(list.find(p => p.id === created.id)!.currentVersion.versionNumber).toBe(2)
  })

  it('a bad template names the component field', async () => {
    const r = await quality.post('/api/procedures', {
      name: unique('Bad '), documentReference: 'B-1', decisionRule: 'simple-acceptance', cmc: [],
      template: [{ name: 'x', type: 'B', distribution: 'normal', value: 0.1, unit: 'K', input: 'reading' }, { name: 'y', type: 'B', distribution: 'standard', value: 0.1, unit: 'K', input: 'sourceEmissivity' }],
    })
    expect(r.status).toBe(400)
    expect(r.body.data.fields['template[0].coverageFactor']).toBeTruthy()
    expect(r.body.data.fields['template[1].unit']).toBeTruthy()
  })
})

describe('customers never see runs', () => {
  it('403 on the run and procedure routes', async () => {
    const { run } = await submitted()
    for (const [m, p] of [['GET', '/api/runs'], ['GET', `/api/runs/${run.id}`], ['POST', '/api/runs'], ['GET', '/api/procedures'], ['PATCH', `/api/runs/${run.id}`], ['POST', `/api/runs/${run.id}/points`]] as const) {
      expect((await customer.request(m, p, m === 'GET' ? undefined : {})).status, `${m} ${p}`).toBe(403)
    }
  })
})

describe('submission and review', () => {
  it('the person who performed a run cannot approve it (403); the technician’s run is approved by the quality manager', async () => {
    const own = await submitted(quality)
    const refused = await quality.post(`/api/runs/${own.run.id}/approve`, { version: own.run.version })
    expect(refused.status).toBe(403)
    expect(refused.body.message).toMatch(/You performed this run/)
    const other = await submitted(tech)
    const ok = await quality.post(`/api/runs/${other.run.id}/approve`, { version: other.run.version })
    expect(ok.status, JSON.stringify(ok.body)).toBe(200)
    expect(ok.body.status).toBe('approved')
    expect(ok.body.reviewerName).toBe('Quinn Halvorsen')
    expect(ok.body.technicianName).toBe('Tomas Reyne')
    expect(ok.body.locked).toBe(true)
  })

  it('approve only from submitted; return with comments, correct and submit again', async () => {
    const draft = await newRun()
    expect((await quality.post(`/api/runs/${draft.id}/approve`, { version: draft.version })).status).toBe(409)
    expect((await tech.post(`/api/runs/${draft.id}/submit`, { version: draft.version })).status).toBe(400) // no points
    const { run, point: pt } = await submitted()
    expect((await quality.post(`/api/runs/${run.id}/return`, { version: run.version })).status).toBe(400)
    const back = await quality.post(`/api/runs/${run.id}/return`, { version: run.version, comments: 'Repeat the 50 °C point' })
    expect(back.status).toBe(200)
    expect(back.body.status).toBe('returned')
    expect(back.body.reviewComments).toBe('Repeat the 50 °C point')
    const fix = await tech.patch(`/api/runs/${run.id}/points/${pt.id}`, { version: pt.version, readingsK: [323.25, 323.3, 323.2], reason: 'Point repeated after review' })
    expect(fix.status, JSON.stringify(fix.body)).toBe(200)
    const again = await tech.post(`/api/runs/${run.id}/submit`, { version: await versionOf(run.id) })
    expect(again.status).toBe(200)
    expect(again.body.status).toBe('submitted')
  })

  it('an adjusted run needs as-found and as-left points before submission', async () => {
    const run = await newRun(tech, { adjusted: true })
    expect(run.asLeftEqualsAsFound).toBe(false)
    await tech.post(`/api/runs/${run.id}/points`, point())
    const refused = await tech.post(`/api/runs/${run.id}/submit`, { version: await versionOf(run.id) })
    expect(refused.status).toBe(400)
    expect(refused.body.data.fields.points).toMatch(/as-left/)
    expect((await tech.post(`/api/runs/${run.id}/points`, { ...point(), stage: 'as-left' })).status).toBe(201)
    expect((await tech.post(`/api/runs/${run.id}/submit`, { version: await versionOf(run.id) })).status).toBe(200)
    const plain = await newRun()
    expect(plain.asLeftEqualsAsFound).toBe(true)
  })
})

describe('amendments after submission (ISO/IEC 17025 7.5.2)', () => {
  it('need a reason (400 naming reason) and keep the earlier value in a revision', async () => {
    const { run: sent, point: pt } = await submitted()
    const back = await quality.post(`/api/runs/${sent.id}/return`, { version: sent.version, comments: 'Check the reflected temperature' })
    expect(back.status, JSON.stringify(back.body)).toBe(200)
    const run = back.body
    const noReason = await tech.patch(`/api/runs/${run.id}`, { version: run.version, reflectedTemperatureK: 297.15 })
    expect(noReason.status).toBe(400)
    expect(noReason.body.data.fields.reason).toBeTruthy()
    const ok = await tech.patch(`/api/runs/${run.id}`, { version: run.version, reflectedTemperatureK: 297.15, reason: 'Wall thermometer read 24 °C, not 23 °C' })
    expect(ok.status, JSON.stringify(ok.body)).toBe(200)
    const rev = ok.body.revisions.at(-1)
    expect(rev.reason).toMatch(/Wall thermometer/)
    expect(rev.before).toEqual({ reflectedTemperatureK: 296.15 })
    expect(rev.after).toEqual({ reflectedTemperatureK: 297.15 })
    expect(rev.userName).toBe('Tomas Reyne')
    // the point was recomputed with the new reflected temperature
    expect(ok.body.points[0].result.inputs.reflectedTemperatureK).toBe(297.15)
    expect(ok.body.points[0].result.expectedReadingK).not.toBe(pt.result.expectedReadingK)

    const p2 = ok.body.points[0]
    expect((await tech.patch(`/api/runs/${run.id}/points/${pt.id}`, { version: p2.version, readingsK: [323.1] })).status).toBe(400)
    const edit = await tech.patch(`/api/runs/${run.id}/points/${pt.id}`, { version: p2.version, readingsK: [323.1], reason: 'Transcription error in the readings' })
    expect(edit.status).toBe(200)
    const added = await tech.post(`/api/runs/${run.id}/points`, point())
    expect(added.status).toBe(400)
    expect(added.body.data.fields.reason).toBeTruthy()
    const detail = (await tech.get(`/api/runs/${run.id}`)).body
    const pointRev = detail.revisions.find((r: { pointId: number | null }) => r.pointId === pt.id)
    expect(pointRev.before.readingsK).toEqual([323.3, 323.2, 323.4])
    expect(pointRev.after.readingsK).toEqual([323.1])
    expect(detail.audit.some((a: { action: string, entity: string }) => a.action === 'update' && a.entity === 'RunPoint')).toBe(true)
  })

  it('before submission no reason is needed and no revision is kept', async () => {
    const run = await newRun()
    const ok = await tech.patch(`/api/runs/${run.id}`, { version: run.version, distanceMm: 250 })
    expect(ok.status).toBe(200)
    expect(ok.body.revisions).toEqual([])
    expect((await tech.patch(`/api/runs/${run.id}`, { version: run.version, distanceMm: 260 })).status).toBe(409)
  })
})

describe('approved runs are locked', () => {
  it('every write route answers 409 "approved runs cannot change"', async () => {
    const { run, point: pt } = await submitted()
    const approved = (await quality.post(`/api/runs/${run.id}/approve`, { version: run.version })).body
    const v = approved.version
    const csv = `stage,sourceAssetTag,setPointK,sourceIndicatedK,reading1\nas-found,${plate.assetTag},323.15,323.15,323.2`
    const attempts: [Client, string, string, unknown][] = [
      [tech, 'PATCH', `/api/runs/${run.id}`, { version: v, distanceMm: 100, reason: 'x' }],
      [tech, 'POST', `/api/runs/${run.id}/points`, { ...point(), reason: 'x' }],
      [tech, 'PATCH', `/api/runs/${run.id}/points/${pt.id}`, { version: pt.version, readingsK: [323.2], reason: 'x' }],
      [tech, 'POST', `/api/runs/${run.id}/points/import`, { csv, commit: true, reason: 'x' }],
      [tech, 'POST', `/api/runs/${run.id}/submit`, { version: v }],
      [quality, 'POST', `/api/runs/${run.id}/approve`, { version: v }],
      [quality, 'POST', `/api/runs/${run.id}/return`, { version: v, comments: 'x' }],
      [admin, 'POST', `/api/runs/${run.id}/points/${pt.id}/monte-carlo`, { trials: 10_000 }],
    ]
    for (const [c, m, p, body] of attempts) {
      const res = await c.request(m, p, body)
      expect(res.status, `${m} ${p}`).toBe(409)
      expect(res.body.message, `${m} ${p}`).toBe('approved runs cannot change')
    }
  })
})

describe('run list and demo runs', () => {
  it('pages, filters and finds runs in every state; approved demo runs were performed and approved by different people', async () => {
    for (const status of ['draft', 'submitted', 'returned', 'approved']) {
      const r = await tech.get(`/api/runs?status=${status}&pageSize=100`)
      expect(r.status).toBe(200)
      expect(r.body.total, status).toBeGreaterThan(0)
      expect(r.body.rows.every((x: { status: string }) => x.status === status)).toBe(true)
    }
    const approved = (await tech.get('/api/runs?status=approved&pageSize=100')).body.rows as { id: number, technicianId: number, reviewerId: number }[]
    for (const a of approved) expect(a.technicianId).not.toBe(a.reviewerId)
    const all = (await tech.get('/api/runs?pageSize=500')).body.rows as { id: number, instrumentSerial: string, calibrationDate: string }[]
    // the demo runs (the tests' own runs are dated 2026-11-25)
    const details = await Promise.all(all.filter(r => r.calibrationDate !== '2026-11-25').map(r => tech.get(`/api/runs/${r.id}`).then(x => x.body)))
    expect(details.some(d => d.points.some((p: { result: { conformity: { verdict: string } } }) => p.result.conformity.verdict === 'fail'))).toBe(true)
    expect(details.some(d => d.adjusted && d.status === 'approved' && new Set(d.points.map((p: { stage: string }) => p.stage)).size === 2)).toBe(true)
    const serial = all[0]!.instrumentSerial
    const bySerial = (await tech.get(`/api/runs?q=${encodeURIComponent(serial.slice(0, 6))}`)).body
    expect(bySerial.rows.length).toBeGreaterThan(0)
    expect(bySerial.rows.every((r: { instrumentSerial: string }) => r.instrumentSerial.toLowerCase().startsWith(serial.slice(0, 6).toLowerCase()))).toBe(true)
    const sorted = (await tech.get('/api/runs?sort=calibrationDate&dir=asc&pageSize=500')).body.rows.map((r: { calibrationDate: string }) => r.calibrationDate)
    expect([...sorted].sort()).toEqual(sorted)
    expect((await tech.get('/api/runs?sort=nope')).status).toBe(400)
  })
})
