// Calibration points through the API: equipment checks, reference temperature, CMC floor, decision
// rules, agreement with the calculation API, CSV entry and the Monte Carlo check.
// Expected values are hand calculations written here or published rules, named beside each check.
// The instrument, sources and reference thermometer are made here by the factories, with the data
// the checks depend on stated below.
import { beforeAll, describe, expect, it } from 'vitest'
import { type Client, signedIn, unique } from '../support/http'
import { makeCustomer, makeInstrument, makeReference, makeSource } from '../support/factories'

let tech: Client
let quality: Client
let handheld: { id: number }
let plate: { id: number, assetTag: string }
let pastDue: { id: number, assetTag: string }
let prt: { id: number, assetTag: string }

const C = (c: number) => Math.round((c + 273.15) * 100) / 100

async function procedure(over: Record<string, unknown> = {}) {
  const r = await quality.post('/api/procedures', {
    name: unique('Test procedure '),
    documentReference: 'TP-1',
    decisionRule: 'simple-acceptance',
    template: [{ name: 'Ambient', type: 'B', distribution: 'standard', value: 0.05, unit: 'K', input: 'reading' }],
    cmc: [],
    applicability: { sourceKinds: ['flat-plate', 'cavity'], bandMinUm: 0.5, bandMaxUm: 20, minK: 200, maxK: 2000 },
    ...over,
  })
  expect(r.status, JSON.stringify(r.body)).toBe(201)
  return r.body
}

async function run(procedureVersionId: number, over: Record<string, unknown> = {}) {
  const r = await tech.post('/api/runs', {
    instrumentId: handheld.id,
    procedureVersionId,
    calibrationDate: '2026-11-25',
    ambientTemperatureK: 296.15,
    relativeHumidityPct: 40,
    distanceMm: 300,
    emissivitySetting: 0.95,
    reflectedTemperatureK: 296.15,
    instrumentTemperatureK: 296.15,
    ...over,
  })
  expect(r.status, JSON.stringify(r.body)).toBe(201)
  return r.body
}

beforeAll(async () => {
  tech = await signedIn('technician')
  quality = await signedIn('quality')
  // An 8–14 µm handheld: ±1 % of reading (°C) or ±1 K, whichever is greater; display resolution 0.1 K.
  handheld = await makeInstrument(tech, (await makeCustomer(tech)).id, { accuracy: { kind: 'greaterOf', a: 1, b: 1 }, resolutionK: 0.1 })
  // A flat plate, ε = 0.95, whose certificate table runs from −20 °C to 150 °C with +0.10 K at 50 °C;
  // calibration current on the runs' date (2026-11-25).
  plate = await makeSource(quality, {
    emissivity: 0.95,
    minTemperatureK: C(-20),
    maxTemperatureK: C(150),
    corrections: [[C(-20), 0.35], [C(0), 0.22], [C(50), 0.1], [C(100), -0.05], [C(150), -0.18]],
  })
  // A cavity whose calibration fell due on 2026-10-15, before the runs' date.
  pastDue = await makeSource(quality, {
    kind: 'cavity', minTemperatureK: C(50), maxTemperatureK: C(500), emissivity: 0.995, emissivityU: 0.001,
    corrections: [[C(50), 0.05], [C(500), 0.3]],
    calibration: { calibrationDate: '2025-10-15', dueDate: '2026-10-15' },
  })
  prt = await makeReference(quality)
})

describe('reference equipment must be usable on the calibration date (ISO/IEC 17025 6.4)', () => {
  it('refuses a past-due cavity (due 2026-10-15), naming sourceId with the reason', async () => {
    const p = await procedure()
    const r = await run(p.currentVersion.id, { emissivitySetting: 1 })
    const res = await tech.post(`/api/runs/${r.id}/points`, { sourceId: pastDue.id, setPointK: C(400), sourceIndicatedK: C(400), readingsK: [C(401)] })
    expect(res.status).toBe(400)
    expect(res.body.data.fields.sourceId).toMatch(new RegExp(`${pastDue.assetTag}.*2026-10-15`))
  })

  it('refuses an out-of-service source even with a current calibration', async () => {
    const tag = unique('BB-T-')
    const s = await quality.post('/api/sources', {
      assetTag: tag, kind: 'flat-plate', maker: 'Test', model: 'Plate', serial: unique('S'), apertureMm: 100,
      minTemperatureK: 250, maxTemperatureK: 450, emissivity: 0.95, emissivityU: 0.005, uniformityK: 0.2, stabilityK: 0.05,
      corrections: [[250, 0.1], [450, 0.1]], status: 'out-of-service',
    })
    expect(s.status, JSON.stringify(s.body)).toBe(201)
    const cal = await quality.post(`/api/sources/${s.body.id}/calibrations`, { provider: 'Test lab', certificateNumber: unique('C'), calibrationDate: '2026-06-01', dueDate: '2027-06-01' })
    expect(cal.status).toBe(201)
    const p = await procedure()
    const r = await run(p.currentVersion.id)
    const res = await tech.post(`/api/runs/${r.id}/points`, { sourceId: s.body.id, setPointK: 323.15, sourceIndicatedK: 323.15, readingsK: [323.2] })
    expect(res.status).toBe(400)
    expect(res.body.data.fields.sourceId).toMatch(/out of service/)
  })

  it('a set-point outside the certificate table is refused on sourceIndicatedK (no extrapolation)', async () => {
    const p = await procedure()
    const r = await run(p.currentVersion.id)
    // the plate's table runs from −20 °C to 150 °C
    const res = await tech.post(`/api/runs/${r.id}/points`, { sourceId: plate.id, setPointK: C(160), sourceIndicatedK: C(160), readingsK: [C(160)] })
    expect(res.status).toBe(400)
    expect(res.body.data.fields.sourceIndicatedK).toMatch(/outside/)
  })

  it('takes the reference temperature from the source table or from a reference thermometer', async () => {
    const p = await procedure()
    const r = await run(p.currentVersion.id)
    // the plate's certificate: correction +0.10 K at 50 °C → T_s = 323.25 K
    const a = await tech.post(`/api/runs/${r.id}/points`, { sourceId: plate.id, setPointK: C(50), sourceIndicatedK: C(50), readingsK: [323.3, 323.4] })
    expect(a.status).toBe(201)
    expect(Math.abs(a.body.result.referenceTemperatureK - 323.25)).toBeLessThan(1e-9)
    expect(Math.abs(a.body.result.sourceCorrectionK - 0.1)).toBeLessThan(1e-12)
    const b = await tech.post(`/api/runs/${r.id}/points`, { sourceId: plate.id, setPointK: C(50), referenceInstrumentId: prt.id, referenceReadingK: 323.2, readingsK: [323.3] })
    expect(b.status).toBe(201)
    expect(b.body.result.referenceTemperatureK).toBe(323.2)
    expect(b.body.referenceAssetTag).toBe(prt.assetTag)
    const c = await tech.post(`/api/runs/${r.id}/points`, { sourceId: plate.id, setPointK: C(50), referenceInstrumentId: prt.id, readingsK: [323.3] })
    expect(c.status).toBe(400)
    expect(c.body.data.fields.referenceReadingK).toBeTruthy()
    const d = await tech.post(`/api/runs/${r.id}/points`, { sourceId: plate.id, setPointK: C(50), readingsK: [323.3] })
    expect(d.status).toBe(400)
    expect(d.body.data.fields.sourceIndicatedK).toBeTruthy()
    const e = await tech.post(`/api/runs/${r.id}/points`, { stage: 'as-left', sourceId: plate.id, setPointK: C(50), sourceIndicatedK: C(50), readingsK: [323.3] })
    expect(e.status).toBe(400)
    expect(e.body.data.fields.stage).toBeTruthy()
  })
})

describe('CMC floor and decision rules', () => {
  // Point: the plate at 50 °C → T_s = 323.25 K; ε_i = ε_s = 0.95 and T_d = T_w, so the expected
  // reading is T_s (reading model identity). One reading 324.10 K → E = +0.85 K.
  // Spec of the handheld: ±1 % of reading (°C) or ±1 K, whichever is greater → TL = 1 K at 50 °C.
  const point = () => ({ sourceId: plate.id, setPointK: C(50), sourceIndicatedK: C(50), readingsK: [324.1] })
  const cmc = [{ minK: 300, maxK: 400, expandedUncertaintyK: 0.5 }]

  it('states the CMC when the computed U is below it, reports both and flags it', async () => {
    const p = await procedure({ cmc })
    const r = await run(p.currentVersion.id)
    const res = await tech.post(`/api/runs/${r.id}/points`, point())
    expect(res.status).toBe(201)
    const b = res.body.result.budget
    // u_c² = 0.05² + (0.1/√12)² (ambient + resolution; n = 1) → U = 2·0.0576 = 0.115 K < 0.5 K
    expect(Math.abs(b.combinedStandardUncertaintyK - Math.sqrt(0.05 ** 2 + 0.01 / 12))).toBeLessThan(1e-9)
    expect(b.expandedUncertaintyK).toBeLessThan(0.5)
    expect(b.cmcK).toBe(0.5)
    expect(b.statedUncertaintyK).toBe(0.5)
    expect(b.cmcApplied).toBe(true)
    expect(res.body.result.rounded.uncertaintyText).toBe('0.50')
    expect(b.notes.join(' ')).toMatch(/One reading/)
  })

  it('simple acceptance: |E| = 0.85 ≤ 1 → pass (ILAC-G8:09/2019 §4.2.1)', async () => {
    const p = await procedure({ cmc, decisionRule: 'simple-acceptance' })
    const r = await run(p.currentVersion.id)
    const res = await tech.post(`/api/runs/${r.id}/points`, point())
    expect(Math.abs(res.body.result.errorK - 0.85)).toBeLessThan(1e-9)
    expect(res.body.result.conformity.tolerance).toBe(1)
    expect(res.body.result.conformity.verdict).toBe('pass')
  })

  it('guard band w = U = 0.5: acceptance limit 0.5 < 0.85 → fail (ILAC-G8:09/2019 guarded acceptance)', async () => {
    const p = await procedure({ cmc, decisionRule: 'guard-band', guardBandFactor: 1 })
    const r = await run(p.currentVersion.id)
    const c = (await tech.post(`/api/runs/${r.id}/points`, point())).body.result.conformity
    expect(c.verdict).toBe('fail')
    expect(Math.abs(c.acceptanceLimit - 0.5)).toBeLessThan(1e-12)
    expect(c.ruleReference).toMatch(/ILAC-G8/)
  })

  it('non-binary: 1 − 0.5 < 0.85 ≤ 1 → conditional pass (ILAC-G8:09/2019 non-binary statement)', async () => {
    const p = await procedure({ cmc, decisionRule: 'non-binary', guardBandFactor: 1 })
    const r = await run(p.currentVersion.id)
    const c = (await tech.post(`/api/runs/${r.id}/points`, point())).body.result.conformity
    expect(c.verdict).toBe('conditional-pass')
    expect(c.statement).toMatch(/Conditional pass/)
  })
})

describe('the stored result agrees with the calculation API for the same inputs', () => {
  it('expected reading and sensitivities (/api/calculations/expected-reading), u_c, ν_eff, k, U (/api/calculations/budget)', async () => {
    const p = await procedure({
      template: [
        { name: 'Reference', type: 'B', distribution: 'normal', value: 0.05, coverageFactor: 2, unit: 'K', input: 'sourceTemperature' },
        { name: 'Emissivity', type: 'B', distribution: 'rectangular', value: 0.01, unit: 'emissivity', input: 'sourceEmissivity' },
        { name: 'Reflected', type: 'B', distribution: 'rectangular', value: 1, unit: 'K', input: 'reflectedTemperature' },
        { name: 'Detector', type: 'B', distribution: 'triangular', value: 500, unit: 'mK', input: 'instrumentTemperature' },
      ],
    })
    const r = await run(p.currentVersion.id, { emissivitySetting: 0.97, instrumentTemperatureK: 298.15 })
    const res = await tech.post(`/api/runs/${r.id}/points`, { sourceId: plate.id, setPointK: C(100), sourceIndicatedK: C(100), readingsK: [372.6, 372.8, 372.7, 372.9] })
    expect(res.status).toBe(201)
    const result = res.body.result
    const detail = (await tech.get(`/api/runs/${r.id}`)).body
    const calc = await tech.post('/api/calculations/expected-reading', {
      band: detail.instrument.band,
      sourceTemperatureK: result.referenceTemperatureK,
      sourceEmissivity: result.inputs.sourceEmissivity,
      reflectedTemperatureK: 296.15,
      instrumentTemperatureK: 298.15,
      emissivitySetting: 0.97,
    })
    expect(calc.status).toBe(200)
    expect(Math.abs(calc.body.expectedReadingK - result.expectedReadingK)).toBeLessThan(1e-9)
    const lines = result.budget.components as { input: string, sensitivity: number, standardUncertainty: number, dof: number | null, name: string }[]
    for (const l of lines) {
      const expected = l.input === 'reading' ? 1 : calc.body.sensitivities[l.input]
      expect(Math.abs(l.sensitivity - expected), l.name).toBeLessThan(1e-9 * Math.max(1, Math.abs(expected)))
    }
    const budget = await tech.post('/api/calculations/budget', { components: lines.map(l => ({ name: l.name, standardUncertainty: l.standardUncertainty, sensitivity: l.sensitivity, dof: l.dof })) })
    expect(budget.status).toBe(200)
    expect(Math.abs(budget.body.combinedStandardUncertainty - result.budget.combinedStandardUncertaintyK)).toBeLessThan(1e-12)
    expect(budget.body.effectiveDegreesOfFreedom).toBeCloseTo(result.budget.effectiveDegreesOfFreedom, 9)
    expect(budget.body.coverageFactor).toBeCloseTo(result.budget.coverageFactor, 12)
    expect(Math.abs(budget.body.expandedUncertainty - result.budget.expandedUncertaintyK)).toBeLessThan(1e-12)
    // Independent checks: mean of 372.6…372.9 = 372.75; s = √(0.05/3) = 0.1291 (GUM 4.2.2); E = mean − expected
    expect(Math.abs(result.meanReadingK - 372.75)).toBeLessThan(1e-9)
    expect(Math.abs(result.stdDevK - Math.sqrt(0.05 / 3))).toBeLessThan(1e-9)
    expect(Math.abs(result.errorK - (372.75 - calc.body.expectedReadingK))).toBeLessThan(1e-9)
    expect(result.engineVersion).toMatch(/^\d+\.\d+\.\d+$/)
  })
})

describe('CSV entry: POST /api/runs/[id]/points/import', () => {
  it('reports bad rows by line and field, refuses a commit with any bad row, then imports all rows', async () => {
    const p = await procedure()
    const r = await run(p.currentVersion.id)
    const bad = [
      'stage,sourceAssetTag,setPointK,sourceIndicatedK,referenceAssetTag,referenceReadingK,reading1,reading2,reading3',
      `as-found,${plate.assetTag},323.15,323.15,,,323.3,323.2,323.4`,
      `as-found,${unique('BB-NONE-')},323.15,323.15,,,323.3,,`,
      `as-found,${plate.assetTag},373.15,373.15,,,abc,373.2,`,
      `as-found,${pastDue.assetTag},673.15,673.15,,,673.2,,`,
      `as-found,${plate.assetTag},323.15,,${prt.assetTag},323.2,,,`,
    ].join('\n')
    const preview = await tech.post(`/api/runs/${r.id}/points/import`, { csv: bad })
    expect(preview.status, JSON.stringify(preview.body)).toBe(200)
    expect(preview.body.valid).toBe(1)
    expect(preview.body.invalid).toBe(4)
    const byLine = Object.fromEntries(preview.body.rows.map((x: { line: number, errors: Record<string, string> }) => [x.line, x.errors]))
    expect(byLine[2]).toEqual({})
    expect(byLine[3].sourceAssetTag).toMatch(/No blackbody source/)
    expect(byLine[4].reading1).toMatch(/not a number/)
    expect(byLine[5].sourceAssetTag).toMatch(/fell due/)
    expect(byLine[6].reading1).toBeTruthy()
    const refused = await tech.post(`/api/runs/${r.id}/points/import`, { csv: bad, commit: true })
    expect(refused.status).toBe(400)
    expect((await tech.get(`/api/runs/${r.id}`)).body.points).toHaveLength(0)
    const good = [bad.split('\n')[0], bad.split('\n')[1], `as-found,${plate.assetTag},323.15,,${prt.assetTag},323.2,323.3,323.1,`].join('\n')
    const done = await tech.post(`/api/runs/${r.id}/points/import`, { csv: good, commit: true })
    expect(done.status, JSON.stringify(done.body)).toBe(201)
    expect(done.body.created).toBe(2)
    const points = (await tech.get(`/api/runs/${r.id}`)).body.points
    expect(points.map((x: { readingsK: number[] }) => x.readingsK.length)).toEqual([3, 2])
  })

  it('a file without a known column is a 400 on csv', async () => {
    const p = await procedure()
    const r = await run(p.currentVersion.id)
    const res = await tech.post(`/api/runs/${r.id}/points/import`, { csv: 'a,b\n1,2' })
    expect(res.status).toBe(400)
    expect(res.body.data.fields.csv).toBeTruthy()
  })
})

describe('Monte Carlo check of a point (JCGM 101 §8)', () => {
  it('runs as a job and stores its summary on the point', async () => {
    const p = await procedure({
      template: [
        { name: 'Reference', type: 'B', distribution: 'normal', value: 0.05, coverageFactor: 2, unit: 'K', input: 'sourceTemperature' },
        { name: 'Plate non-uniformity', type: 'B', distribution: 'rectangular', value: 0.2, unit: 'K', input: 'sourceTemperature' },
        { name: 'Emissivity', type: 'B', distribution: 'rectangular', value: 0.01, unit: 'emissivity', input: 'sourceEmissivity' },
      ],
    })
    const r = await run(p.currentVersion.id)
    const pt = (await tech.post(`/api/runs/${r.id}/points`, { sourceId: plate.id, setPointK: C(100), sourceIndicatedK: C(100), readingsK: [373.2, 373.1, 373.3, 373.2, 373.25, 373.15, 373.2, 373.1, 373.3, 373.2] })).body
    const start = await tech.post(`/api/runs/${r.id}/points/${pt.id}/monte-carlo`, { trials: 50_000, seed: 7 })
    expect(start.status).toBe(202)
    let job = start.body
    for (let i = 0; i < 100 && job.status === 'running'; i++) {
      await new Promise(res => setTimeout(res, 200))
      job = (await tech.get(`/api/calculations/monte-carlo/jobs/${start.body.id}`)).body
    }
    expect(job.status, JSON.stringify(job.error)).toBe('done')
    const stored = (await tech.get(`/api/runs/${r.id}`)).body.points[0].monteCarlo
    expect(stored.trials).toBe(50_000)
    expect(typeof stored.validated).toBe('boolean')
    // The MC standard uncertainty is close to the GUM u_c for a nearly linear model (JCGM 101 §8 idea; 5 % band).
    // Ten readings: the Type A term is a t with ν = 9 (JCGM 101 6.4.9), variance ×9/7 on a small term.
    expect(Math.abs(stored.standardUncertainty / pt.result.budget.combinedStandardUncertaintyK - 1)).toBeLessThan(0.05)
    expect(stored.coverageInterval[0]).toBeLessThan(pt.result.expectedReadingK)
    expect(stored.coverageInterval[1]).toBeGreaterThan(pt.result.expectedReadingK)
  })
})
