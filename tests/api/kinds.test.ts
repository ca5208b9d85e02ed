// Every kind of instrument through the API (issue 16): the ratio-reading contract against an independent
// computation (scipy), the calibration-equation calculation against hand arithmetic, ratio pyrometers
// (two bands, the ratio setting, the source's emissivity in both bands) and thermal imagers (regions of
// interest, uniformity, NETD) from the register to a signed certificate, and a calibration equation's
// table on a spot instrument's certificate. The instruments, sources and procedures are made here by the
// factories; the demo's ratio pyrometers and imager calibration are checked at the end.
import { beforeAll, describe, expect, it } from 'vitest'
import { BASE_URL, Client, DEMO_PASSWORD, signedIn, unique } from '../support/http'
import { makeCustomer, makeInstrument, makeProcedure, makeRun, makeSource } from '../support/factories'
import { hasPdftotext, pdfText } from '../support/pdf'

let tech: Client
let quality: Client
let customer: Client
let org: number

type Body = Record<string, unknown>

const BANDS: Record<string, Body> = {
  A1: { kind: 'rectangular', lambda1Um: 0.95, lambda2Um: 1.0 },
  A2: { kind: 'rectangular', lambda1Um: 1.0, lambda2Um: 1.05 },
  B1: { kind: 'rectangular', lambda1Um: 0.75, lambda2Um: 0.85 },
  B2: { kind: 'rectangular', lambda1Um: 0.95, lambda2Um: 1.05 },
  C1: { kind: 'rectangular', lambda1Um: 1.5, lambda2Um: 1.6 },
  C2: { kind: 'rectangular', lambda1Um: 2.0, lambda2Um: 2.4 },
  T1: { kind: 'tabulated', points: [[0.85, 0], [0.9, 0.6], [0.95, 1], [1.0, 0.7], [1.02, 0]] },
  T2: { kind: 'tabulated', points: [[1.02, 0], [1.05, 0.5], [1.1, 1], [1.15, 0.8], [1.2, 0]] },
}

// Printed by tests/reference/ratio_pyrometer.py (scipy 1.17.1): band radiance by scipy.integrate.quad
// (epsabs=0, epsrel=1e-12; tabulated bands segment by segment with the same piecewise-linear responsivity),
// the ratio equation by scipy.optimize.brentq on [50 K, 5000 K] (xtol=1e-12, rtol=1e-15), CODATA 2018.
// Columns: [pair, T_s K, ε_1, ε_2, T_w K, k, T_R K]. Grey (ε_1 = ε_2) and non-grey sources, k ≠ 1, rectangular
// (A, B, C) and tabulated (T) bands.
const SCIPY_RATIO: [string, number, number, number, number, number, number][] = [
  ['A', 1273.15, 0.9, 0.9, 296.15, 1.0, 1273.150000000],
  ['A', 1273.15, 0.9, 0.85, 296.15, 1.0, 1417.198504673],
  ['A', 1273.15, 0.9, 0.85, 296.15, 0.95, 1577.256548696],
  ['A', 1273.15, 0.9, 0.9, 296.15, 1.05, 1171.438374419],
  ['A', 700.0, 0.6, 0.7, 296.15, 1.0, 607.603164133],
  ['A', 2500.0, 0.35, 0.4, 300.0, 0.95, 1940.219945183],
  ['B', 1000.0, 0.8, 0.8, 296.15, 1.05, 985.975513521],
  ['B', 1800.0, 0.4, 0.3, 800.0, 1.0, 2109.229934445],
  ['B', 1800.0, 0.4, 0.3, 800.0, 1.3, 1823.475216100],
  ['C', 700.0, 0.95, 0.9, 296.15, 1.05, 700.932044204],
  ['C', 700.0, 0.7, 0.7, 500.0, 1.0, 698.499541005],
  ['C', 1273.15, 0.5, 0.6, 296.15, 0.95, 1198.995766913],
  ['T', 1000.0, 0.9, 0.9, 296.15, 1.0, 1000.000000000],
  ['T', 1273.15, 0.85, 0.9, 296.15, 1.05, 1199.253139178],
  ['T', 1800.0, 0.3, 0.25, 900.0, 0.95, 2216.418067585],
  ['T', 2500.0, 0.6, 0.55, 296.15, 1.0, 2773.510639181],
]

const ratioBody = (pair: string, ts: number, e1: number, e2: number, tw: number, k: number): Body => ({
  band1: BANDS[`${pair}1`], band2: BANDS[`${pair}2`], sourceTemperatureK: ts, sourceEmissivity1: e1, sourceEmissivity2: e2, reflectedTemperatureK: tw, emissivityRatioSetting: k,
})

const fieldsOf = (r: { status: number, body: { data?: { fields?: Record<string, string> } } }) => Object.keys(r.body?.data?.fields ?? {})

async function pdfOf(c: Client, certificateId: number): Promise<Buffer> {
  const res = await fetch(`${BASE_URL}/api/certificates/${certificateId}/pdf`, { headers: { cookie: c.cookieHeader() } })
  expect(res.status).toBe(200)
  return Buffer.from(await res.arrayBuffer())
}

/** Submit (technician), approve (quality) and sign (quality) a run; answers the certificate. */
async function certify(runId: number): Promise<{ id: number, number: string }> {
  const s = await tech.post(`/api/runs/${runId}/submit`, { version: (await tech.get(`/api/runs/${runId}`)).body.version })
  expect(s.status, `submit: ${JSON.stringify(s.body)}`).toBe(200)
  const a = await quality.post(`/api/runs/${runId}/approve`, { version: s.body.version })
  expect(a.status, `approve: ${JSON.stringify(a.body)}`).toBe(200)
  const c = await quality.post('/api/certificates', { runId, password: DEMO_PASSWORD, signatoryFunction: 'Quality manager' })
  expect(c.status, `issue: ${JSON.stringify(c.body)}`).toBe(201)
  return c.body
}

beforeAll(async () => {
  ;[tech, quality, customer] = await Promise.all([signedIn('technician'), signedIn('quality'), signedIn('customer')])
  org = (await makeCustomer(tech)).id
})

describe('POST /api/calculations/ratio-reading (the contract)', () => {
  it('matches scipy (quad + brentq) within 1 mK: grey and non-grey sources, k ≠ 1, rectangular and tabulated bands', async () => {
    for (const [pair, ts, e1, e2, tw, k, tr] of SCIPY_RATIO) {
      const r = await tech.post('/api/calculations/ratio-reading', ratioBody(pair, ts, e1, e2, tw, k))
      expect(r.status, JSON.stringify(r.body)).toBe(200)
      expect(Math.abs(r.body.expectedReadingK - tr), `${pair} ${ts} ${e1} ${e2} ${tw} ${k}`).toBeLessThan(1e-3)
      expect(Object.keys(r.body.sensitivities).sort()).toEqual(['emissivityRatioSetting', 'reflectedTemperature', 'sourceEmissivity1', 'sourceEmissivity2', 'sourceTemperature'])
    }
  })

  it('sensitivities: a grey source at k = 1 reads T_s whatever ε, so ∂T_R/∂ε₁ = −∂T_R/∂ε₂ · (ε₂/ε₁) there, and ∂T_R/∂k < 0', async () => {
    // With T_w far below T_s (no reflection at 1 µm), T_R depends on ε₁/(k·ε₂) only: ε₁·∂T/∂ε₁ = −ε₂·∂T/∂ε₂ = −k·∂T/∂k.
    const s = (await tech.post('/api/calculations/ratio-reading', ratioBody('A', 1273.15, 0.9, 0.9, 296.15, 1))).body.sensitivities
    expect(Math.abs(0.9 * s.sourceEmissivity1 + 0.9 * s.sourceEmissivity2) / Math.abs(s.sourceEmissivity1)).toBeLessThan(1e-6)
    expect(Math.abs(0.9 * s.sourceEmissivity1 + 1 * s.emissivityRatioSetting) / Math.abs(s.sourceEmissivity1)).toBeLessThan(1e-6)
    expect(s.emissivityRatioSetting).toBeLessThan(0)
    expect(Math.abs(s.sourceTemperature - 1)).toBeLessThan(1e-6)
  })

  it('bad input is a 400 naming the field; roles without calculation:run are refused', async () => {
    const good = ratioBody('A', 1273.15, 0.9, 0.85, 296.15, 1)
    const cases: [Body, string][] = [
      [{ ...good, band2: undefined }, 'band2'],
      [{ ...good, band1: { kind: 'rectangular', lambda1Um: 1.0, lambda2Um: 0.95 } }, 'band1.lambda2Um'],
      [{ ...good, sourceEmissivity1: 0 }, 'sourceEmissivity1'],
      [{ ...good, sourceEmissivity2: 1.2 }, 'sourceEmissivity2'],
      [{ ...good, emissivityRatioSetting: 0 }, 'emissivityRatioSetting'],
      [{ ...good, emissivityRatioSetting: 'one' }, 'emissivityRatioSetting'],
      [{ ...good, sourceTemperatureK: -5 }, 'sourceTemperatureK'],
      [{ ...good, reflectedTemperatureK: undefined }, 'reflectedTemperatureK'],
      // overlapping bands: the ratio need not be monotonic (the engine names band2)
      [{ ...good, band2: { kind: 'rectangular', lambda1Um: 0.98, lambda2Um: 1.05 } }, 'band2'],
      // a reading beyond the inversion range
      [{ ...good, sourceTemperatureK: 4900, emissivityRatioSetting: 0.5 }, 'sourceTemperatureK'],
    ]
    for (const [body, field] of cases) {
      const r = await tech.post('/api/calculations/ratio-reading', body)
      expect(r.status, `${field}: ${JSON.stringify(r.body)}`).toBe(400)
      expect(fieldsOf(r)[0]?.startsWith(field), `${field}: ${JSON.stringify(r.body)}`).toBe(true)
    }
    expect((await customer.post('/api/calculations/ratio-reading', good)).status).toBe(403)
    expect((await new Client().post('/api/calculations/ratio-reading', good)).status).toBe(401)
  })
})

describe('POST /api/calculations/calibration-equation (interpolation)', () => {
  const line = [[400, 400.5], [500, 500.2], [600, 600.4]].map(([R, T]) => ({ referenceTemperatureK: T, readingK: R, expandedUncertaintyK: 1, coverageFactor: 2 }))

  it('the uncertainty of an interpolated value: a straight line through three points, independent and correlated (hand calculation)', async () => {
    // u = U/k = 0.5 K at each point, n = 3, R̄ = 500, Sxx = Σ(R − R̄)² = 20000. With every pair of points correlated
    // with r (V_y = u²[(1 − r)I + r·11ᵀ]) the fitted line is the ordinary one and
    //   u²(f(R)) = u²[(1 − r)(1/n + (R − R̄)²/Sxx) + r]      (JCGM 100 eq. (13) through the parameters' covariance)
    // r = 0:   R = 450: 0.25·(1/3 + 2500/20000) = 0.25·0.4583333 = 0.1145833 → u = 0.3385016 K
    //          R = 500: 0.25·(1/3)                              = 0.0833333 → u = 0.2886751 K
    // r = 0.5: R = 450: 0.25·(0.5·0.4583333 + 0.5) = 0.25·0.7291667 = 0.1822917 → u = 0.4269563 K
    //          R = 500: 0.25·(0.5·0.3333333 + 0.5) = 0.25·0.6666667 = 0.1666667 → u = 0.4082483 K
    //          R = 600: 0.25·(0.5·0.8333333 + 0.5) = 0.25·0.9166667 = 0.2291667 → u = 0.4787136 K
    // and the line itself, a = 37/60, b = 0.9995: at R = 450, T = 0.616667 + 449.775 = 450.391667 K.
    const independent = await tech.post('/api/calculations/calibration-equation', { points: line, model: 'linear', readingsK: [450, 500] })
    expect(independent.status, JSON.stringify(independent.body)).toBe(200)
    expect(independent.body.atReading[0].referenceTemperatureK).toBeCloseTo(450.391667, 5)
    expect(independent.body.atReading.map((v: { standardUncertaintyK: number }) => v.standardUncertaintyK)).toEqual([expect.closeTo(0.3385016, 6), expect.closeTo(0.2886751, 6)])
    expect(independent.body.atReading[1].expandedUncertaintyK).toBeCloseTo(2 * 0.2886751, 6)
    const correlated = await tech.post('/api/calculations/calibration-equation', { points: line, model: 'linear', readingsK: [450, 500, 600], pointCorrelation: 0.5 })
    expect(correlated.status).toBe(200)
    expect(correlated.body.atReading.map((v: { standardUncertaintyK: number }) => v.standardUncertaintyK)).toEqual([expect.closeTo(0.4269563, 6), expect.closeTo(0.4082483, 6), expect.closeTo(0.4787136, 6)])
    expect(correlated.body.parameters[1]).toBeCloseTo(0.9995, 9)
  })

  it('Sakuma–Hattori at reference temperatures matches scipy curve_fit; outside the points it is refused naming the value', async () => {
    // Printed by tests/reference/calibration_equation.py (scipy.optimize.curve_fit, absolute sigma; brentq for R(T)):
    // case sh5, T = 900 K → R = 899.216530462 K, u = 0.6882162080 K.
    const pts = [[873.15, 872.4, 1.6, 2], [1073.15, 1072.1, 2.0, 2], [1273.15, 1271.65, 2.4, 2.1], [1473.15, 1471.2, 3.0, 2], [1673.15, 1670.9, 3.6, 2.2]]
      .map(([T, R, U, k]) => ({ referenceTemperatureK: T, readingK: R, expandedUncertaintyK: U, coverageFactor: k }))
    const band = { kind: 'rectangular', lambda1Um: 0.8, lambda2Um: 1.0 }
    const r = await tech.post('/api/calculations/calibration-equation', { points: pts, band, temperaturesK: [900] })
    expect(r.status, JSON.stringify(r.body)).toBe(200)
    expect(Math.abs(r.body.atReference[0].readingK - 899.216530462)).toBeLessThan(1e-6)
    expect(Math.abs(r.body.atReference[0].standardUncertaintyK - 0.688216208) / 0.688216208).toBeLessThan(1e-6)
    expect(r.body).toMatchObject({ model: 'sakuma-hattori', parameterNames: ['A', 'B', 'C'], constants: 'CODATA-2018' })
    const outside = await tech.post('/api/calculations/calibration-equation', { points: pts, band, temperaturesK: [900, 1700] })
    expect(outside.status).toBe(400)
    expect(fieldsOf(outside)).toEqual(['temperaturesK[1]'])
    expect((await tech.post('/api/calculations/calibration-equation', { points: line, model: 'linear', readingsK: [700] })).body.data.fields).toHaveProperty(['readingsK[0]'])
    expect(fieldsOf(await tech.post('/api/calculations/calibration-equation', { points: pts }))).toEqual(['band'])
    expect(fieldsOf(await tech.post('/api/calculations/calibration-equation', { points: pts, band, pointCorrelation: 1 }))).toEqual(['pointCorrelation'])
  })
})

/** A ratio pyrometer with bands 0.95–1.00 and 1.00–1.05 µm (or the body's), k = 1 in the register. */
async function ratioInstrument(over: Body = {}) {
  return tech.post('/api/instruments', {
    organizationId: org, serial: unique('CR-'), maker: 'Testwick Optics', model: 'Two-colour 10', kind: 'ratio-pyrometer',
    bandLambda1Um: 0.95, bandLambda2Um: 1.0, band2Lambda1Um: 1.0, band2Lambda2Um: 1.05, emissivityRatioSetting: 1,
    distanceToSpot: 150, rangeMinK: 873.15, rangeMaxK: 2273.15, defaultEmissivity: 1, resolutionK: 0.1,
    accuracy: { kind: 'percentPlus', a: 0.5, b: 3 }, calibrationIntervalMonths: 24, ...over,
  })
}

describe('instruments: what each kind records', () => {
  it('a ratio pyrometer needs its second band at longer wavelengths (tables too) and its ratio setting; no other kind has either', async () => {
    const made = await ratioInstrument()
    expect(made.status, JSON.stringify(made.body)).toBe(201)
    expect(made.body).toMatchObject({ kind: 'ratio-pyrometer', band2Lambda1Um: 1, band2Lambda2Um: 1.05, band2SpectralResponseId: null, emissivityRatioSetting: 1 })
    expect(fieldsOf(await ratioInstrument({ band2Lambda1Um: null, band2Lambda2Um: null }))).toContain('band2Lambda1Um')
    expect(fieldsOf(await ratioInstrument({ emissivityRatioSetting: null }))).toContain('emissivityRatioSetting')
    expect(fieldsOf(await ratioInstrument({ band2Lambda1Um: 0.8, band2Lambda2Um: 0.9 }))).toContain('band2Lambda1Um')
    // band 1 as a table whose response reaches 1.02 µm: a band 2 from 1.00 µm overlaps it
    const table = await tech.post('/api/responsivities', { name: unique('Short band '), csv: 'wavelengthUm,response\n0.85,0\n0.9,1\n1.02,0' })
    expect(table.status, JSON.stringify(table.body)).toBe(201)
    const overlap = await ratioInstrument({ bandLambda1Um: null, bandLambda2Um: null, spectralResponseId: table.body.id })
    expect(overlap.status).toBe(400)
    expect(overlap.body.data.fields.band2Lambda1Um).toMatch(/overlaps band 1/)
    const tabulated2 = await ratioInstrument({ bandLambda1Um: 0.75, bandLambda2Um: 0.8, band2Lambda1Um: null, band2Lambda2Um: null, band2SpectralResponseId: table.body.id })
    expect(tabulated2.status, JSON.stringify(tabulated2.body)).toBe(201)
    expect(tabulated2.body.band2SpectralResponseName).toBe(table.body.name)
    const spot = { organizationId: org, serial: unique('SP-'), maker: 'Testwick Optics', model: 'Spot', kind: 'spot-infrared', bandLambda1Um: 8, bandLambda2Um: 14, rangeMinK: 250, rangeMaxK: 700, defaultEmissivity: 0.95, resolutionK: 0.1, accuracy: { kind: 'absolute', b: 1 }, calibrationIntervalMonths: 12 }
    expect(fieldsOf(await tech.post('/api/instruments', { ...spot, band2Lambda1Um: 14, band2Lambda2Um: 15 }))).toContain('band2Lambda1Um')
    expect(fieldsOf(await tech.post('/api/instruments', { ...spot, emissivityRatioSetting: 1 }))).toContain('emissivityRatioSetting')
  })
})

describe('a ratio pyrometer’s run to a signed certificate', () => {
  let instrument: number
  let pv: number
  let cavity: { id: number, assetTag: string }
  let narrow: { id: number, assetTag: string }
  let longwave: { id: number, assetTag: string }

  beforeAll(async () => {
    instrument = (await ratioInstrument()).body.id
    // Its lines come from the registers: the source's U, ε in each band, uniformity, stability; the template holds
    // the reflected radiation, the instrument temperature (no input of the ratio model), the ratio setting.
    pv = (await makeProcedure(quality, {
      budgetFromEquipment: true,
      template: [
        { name: 'Reflected temperature', type: 'B', distribution: 'rectangular', value: 2, unit: 'K', input: 'reflectedTemperature' },
        { name: 'Instrument temperature', type: 'B', distribution: 'rectangular', value: 1, unit: 'K', input: 'instrumentTemperature' },
        { name: 'Ratio setting', type: 'B', distribution: 'rectangular', value: 0.001, unit: 'emissivity', input: 'emissivityRatioSetting' },
        { name: 'Ambient', type: 'B', distribution: 'standard', value: 0.05, unit: 'K', input: 'reading' },
      ],
    })).currentVersion.id
    const cav = { kind: 'cavity', apertureMm: 25, minTemperatureK: 673.15, maxTemperatureK: 1773.15, uniformityK: 0.5, stabilityK: 0.1, corrections: [[1073.15, 0.4], [1273.15, 0.6]], certifiedExpandedUncertaintyK: 2, certifiedCoverageFactor: 2 }
    // invented: ε linear from 0.92 at 0.6 µm to 0.87 at 1.1 µm, so 0.8825 over band 1 and 0.8775 over band 2 (their means)
    cavity = await makeSource(quality, { ...cav, emissivity: 0.9, emissivityU: 0.005, emissivityBandLambda1Um: 0.6, emissivityBandLambda2Um: 1.1, emissivityTable: [[0.6, 0.92, 0.004], [1.1, 0.87, 0.006]] })
    // emissivity known up to 1.00 µm only: band 1 yes, band 2 no
    narrow = await makeSource(quality, { ...cav, emissivity: 0.99, emissivityU: 0.002, emissivityBandLambda1Um: 0.6, emissivityBandLambda2Um: 1.0 })
    longwave = await makeSource(quality, { ...cav, emissivity: 0.99, emissivityU: 0.002, emissivityBandLambda1Um: 8, emissivityBandLambda2Um: 14 })
  })

  it('computes with the two-colour model: the ratio setting is the condition it needs; ε must be known in both bands; scipy within 1 mK', async () => {
    // No emissivity setting or instrument temperature: the two-colour model has neither.
    const run = await makeRun(tech, instrument, pv, { emissivitySetting: null, instrumentTemperatureK: null })
    const point = { sourceId: cavity.id, setPointK: 1073.15, sourceIndicatedK: 1073.15, readingsK: [1051.6, 1051.4, 1051.5] }
    const noK = await tech.post(`/api/runs/${run.id}/points`, point)
    expect(noK.status).toBe(400)
    expect(fieldsOf(noK)).toEqual(['emissivityRatioSetting'])
    expect((await tech.get(`/api/runs/${run.id}`)).body.missingConditions.map((m: { field: string }) => m.field)).toEqual(['emissivityRatioSetting'])
    const header = await tech.patch(`/api/runs/${run.id}`, { emissivityRatioSetting: 1.02, version: (await tech.get(`/api/runs/${run.id}`)).body.version })
    expect(header.status, JSON.stringify(header.body)).toBe(200)

    const band2 = await tech.post(`/api/runs/${run.id}/points`, { ...point, sourceId: narrow.id })
    expect(band2.status).toBe(400)
    expect(band2.body.data.fields.sourceId).toMatch(/is stated for 0\.6–1 µm; the ratio pyrometer’s band 2 1–1\.05 µm lies outside it/)
    const band1 = await tech.post(`/api/runs/${run.id}/points`, { ...point, sourceId: longwave.id })
    expect(band1.body.data.fields.sourceId).toMatch(/the ratio pyrometer’s band 1 0\.95–1 µm lies outside it/)

    // Printed by tests/reference/ratio_runs.py (scipy 1.17.1, quad + brentq): T_s = 1073.15 + 0.4 K and 1273.15 + 0.6 K
    // (the certificate corrections), ε₁ = 0.8825, ε₂ = 0.8775, T_w = 296.15 K, k = 1.02:
    //   T_R = 1051.244119081 K and 1242.520010746 K
    const p1 = await tech.post(`/api/runs/${run.id}/points`, point)
    expect(p1.status, JSON.stringify(p1.body)).toBe(201)
    const p2 = await tech.post(`/api/runs/${run.id}/points`, { sourceId: cavity.id, setPointK: 1273.15, sourceIndicatedK: 1273.15, readingsK: [1242.9, 1242.7, 1243.1] })
    expect(p2.status, JSON.stringify(p2.body)).toBe(201)
    expect(Math.abs(p1.body.result.expectedReadingK - 1051.244119081)).toBeLessThan(1e-3)
    expect(Math.abs(p2.body.result.expectedReadingK - 1242.520010746)).toBeLessThan(1e-3)
    const inputs = p1.body.result.inputs
    expect(inputs.sourceEmissivity).toBeCloseTo(0.8825, 12)
    expect(inputs.ratio).toMatchObject({ band2: { kind: 'rectangular', lambda1Um: 1, lambda2Um: 1.05 }, emissivityRatioSetting: 1.02 })
    expect(inputs.ratio.sourceEmissivity2).toBeCloseTo(0.8775, 12)

    // the budget: ε in each band from the register, the ratio model's sensitivities, c = 0 for the instrument temperature
    const lines = p1.body.result.budget.components as { name: string, input: string, sensitivity: number }[]
    const on = (input: string) => lines.filter(l => l.input === input)
    expect(on('sourceEmissivity').map(l => l.name)).toEqual([`Emissivity of ${cavity.assetTag} in band 1`])
    expect(on('sourceEmissivity2').map(l => l.name)).toEqual([`Emissivity of ${cavity.assetTag} in band 2`])
    expect(on('instrumentTemperature')[0]!.sensitivity).toBe(0)
    const contract = (await tech.post('/api/calculations/ratio-reading', { band1: BANDS.A1, band2: BANDS.A2, sourceTemperatureK: 1073.55, sourceEmissivity1: 0.8825, sourceEmissivity2: 0.8775, reflectedTemperatureK: 296.15, emissivityRatioSetting: 1.02 })).body
    expect(on('emissivityRatioSetting')[0]!.sensitivity).toBeCloseTo(contract.sensitivities.emissivityRatioSetting, 6)
    expect(on('sourceEmissivity2')[0]!.sensitivity).toBeCloseTo(contract.sensitivities.sourceEmissivity2, 6)
    expect(p1.body.result.budget.notes.join(' ')).toMatch(/taken as independent/)

    // its Monte Carlo check runs the two-colour model (JCGM 101): the MC u within 10 % of the GUM u_c
    const start = await tech.post(`/api/runs/${run.id}/points/${p1.body.id}/monte-carlo`, { trials: 50_000, seed: 5 })
    expect(start.status, JSON.stringify(start.body)).toBe(202)
    let job = start.body
    for (let i = 0; i < 150 && job.status === 'running'; i++) {
      await new Promise(res => setTimeout(res, 200))
      job = (await tech.get(`/api/calculations/monte-carlo/jobs/${start.body.id}`)).body
    }
    expect(job.status, JSON.stringify(job.error)).toBe('done')
    expect(Math.abs(job.result.standardUncertainty / p1.body.result.budget.combinedStandardUncertaintyK - 1)).toBeLessThan(0.1)
    expect(job.result.coverageInterval[0]).toBeLessThan(p1.body.result.expectedReadingK)
    expect(job.result.coverageInterval[1]).toBeGreaterThan(p1.body.result.expectedReadingK)

    // a calibration equation belongs to single-band instruments
    const eq = await tech.patch(`/api/runs/${run.id}`, { calibrationEquation: { temperaturesK: [1173.15] }, version: (await tech.get(`/api/runs/${run.id}`)).body.version })
    expect(fieldsOf(eq)).toEqual(['calibrationEquation'])

    const cert = await certify(run.id)
    if (hasPdftotext) {
      const text = pdfText(await pdfOf(quality, cert.id))
      for (const s of ['Ratio pyrometer', 'Band 1 0.95–1 µm', 'Band 2 1–1.05 µm', 'Emissivity-ratio setting 1.020', 'ratio (two-colour) pyrometer',
        `${cavity.assetTag} ε1 = 0.8825 in band 1, ε2 = 0.8775 in band 2`, 'model is 0.8825 in band 1 and 0.8775 in band 2']) {
        expect(text, s).toContain(s)
      }
      expect(text).not.toContain('Emissivity setting 0.950')
    }
  })
})

describe('a thermal imager’s run to a signed certificate', () => {
  let instrument: number
  let pv: number
  let plate: { id: number }
  // Five ROIs: offsets from the centre on the uniform plate and a scatter of +0, +0.1, −0.1 K.
  const OFFSETS: [string, number, number, number][] = [['centre', 0, 150, 110], ['top-left', -0.3, 40, 30], ['top-right', -0.2, 260, 30], ['bottom-left', -0.4, 40, 190], ['bottom-right', 0.1, 260, 190]]
  const rois = (base: number) => OFFSETS.map(([name, off, x, y]) => ({ name, xPx: x, yPx: y, widthPx: 20, heightPx: 20, readingsK: [0, 0.1, -0.1].map(s => Math.round((base + off + s) * 1000) / 1000) }))

  beforeAll(async () => {
    instrument = (await makeInstrument(tech, org, { kind: 'thermal-imager', model: 'Testwick IR camera', distanceToSpot: null, accuracy: { kind: 'greaterOf', a: 2, b: 2 } })).id
    pv = (await makeProcedure(quality)).currentVersion.id
    plate = await makeSource(quality)
  })

  it('records ROIs per point; states the centre error, the non-uniformity and the NETD; refuses what an imager lacks', async () => {
    const run = await makeRun(tech, instrument, pv, { spotDiameterMm: 10 })
    const base = { sourceId: plate.id, setPointK: 273.15, sourceIndicatedK: 273.15 }
    expect(fieldsOf(await tech.post(`/api/runs/${run.id}/points`, { ...base, readingsK: [273.5] }))).toEqual(['rois'])
    expect(fieldsOf(await tech.post(`/api/runs/${run.id}/points`, { ...base, rois: rois(273.5).slice(1) }))).toEqual(['rois'])
    expect(fieldsOf(await tech.post(`/api/runs/${run.id}/points`, { ...base, rois: rois(273.5), readingsK: [273.5] }))).toEqual(['readingsK'])
    expect(fieldsOf(await tech.post(`/api/runs/${run.id}/points/import`, { csv: 'sourceAssetTag,setPointK,sourceIndicatedK,reading1\nX,273.15,273.15,273.5' }))).toEqual(['csv'])

    const p1 = await tech.post(`/api/runs/${run.id}/points`, { ...base, rois: rois(273.5) })
    expect(p1.status, JSON.stringify(p1.body)).toBe(201)
    // The centre's readings are the point's; the error is at the centre: mean 273.5 K − expected reading.
    expect(p1.body.readingsK).toEqual([273.5, 273.6, 273.4])
    expect(p1.body.result.errorK).toBeCloseTo(273.5 - p1.body.result.expectedReadingK, 9)
    // Hand arithmetic: ROI means 273.5 + (0, −0.3, −0.2, −0.4, +0.1) → max − min = 0.1 − (−0.4) = 0.5 K;
    // offsets' mean −0.16, deviations 0.16, −0.14, −0.04, −0.24, 0.26 → Σd² = 0.172, s = √(0.172/4) = 0.2073644 K.
    const u = p1.body.result.imager.uniformity
    expect(u.rangeK).toBeCloseTo(0.5, 9)
    expect(u.standardDeviationK).toBeCloseTo(Math.sqrt(0.172 / 4), 9)
    expect(u).toMatchObject({ maxRoi: 'bottom-right', minRoi: 'bottom-left' })

    // NETD from 4 frames per ROI at 50 °C: the centre 323.52, 323.48, 323.51, 323.49 → s = √(0.001/3) = 0.0182574 K;
    // the four others ±0.04, ±0.02 about 323.5 → s = √(0.004/3) = 0.0365148 K; their mean (0.0182574 + 4·0.0365148)/5 = 0.0328633 K.
    const frames = OFFSETS.map(([name], j) => ({ name, framesK: j === 0 ? [323.52, 323.48, 323.51, 323.49] : [323.54, 323.46, 323.52, 323.48] }))
    const p2 = await tech.post(`/api/runs/${run.id}/points`, { ...base, setPointK: 323.15, sourceIndicatedK: 323.15, rois: rois(323.5), netdFrames: frames })
    expect(p2.status, JSON.stringify(p2.body)).toBe(201)
    expect(p2.body.result.imager.netd.netdK).toBeCloseTo((Math.sqrt(0.001 / 3) + 4 * Math.sqrt(0.004 / 3)) / 5, 9)
    const p3 = await tech.post(`/api/runs/${run.id}/points`, { ...base, setPointK: 373.15, sourceIndicatedK: 373.15, rois: rois(373.5) })
    expect(p3.status).toBe(201)

    // a new set of ROIs replaces the readings too (the centre's)
    const edited = await tech.patch(`/api/runs/${run.id}/points/${p3.body.id}`, { rois: rois(373.6), version: p3.body.version })
    expect(edited.status, JSON.stringify(edited.body)).toBe(200)
    expect(edited.body.readingsK).toEqual([373.6, 373.7, 373.5])

    // the imager's settings are needed before submission
    const s = await tech.post(`/api/runs/${run.id}/submit`, { version: (await tech.get(`/api/runs/${run.id}`)).body.version })
    expect(s.status).toBe(400)
    expect(fieldsOf(s)).toEqual(['imagerSettings'])
    const settings = { lens: 'Standard 25 mm lens', fieldOfView: '24° × 18°', rangeSetting: '−20 °C to 150 °C', nonUniformityCorrection: true }
    expect(fieldsOf(await tech.patch(`/api/runs/${run.id}`, { calibrationEquation: { temperaturesK: [300] }, version: (await tech.get(`/api/runs/${run.id}`)).body.version }))).toEqual(['calibrationEquation'])
    const h = await tech.patch(`/api/runs/${run.id}`, { imagerSettings: settings, version: (await tech.get(`/api/runs/${run.id}`)).body.version })
    expect(h.status, JSON.stringify(h.body)).toBe(200)
    expect(h.body.imagerSettings).toEqual(settings)

    const cert = await certify(run.id)
    if (hasPdftotext) {
      const text = pdfText(await pdfOf(quality, cert.id))
      for (const s of ['Thermal imager', 'Lens Standard 25 mm lens', 'Field of view 24° × 18°', 'Non-uniformity correction done before measuring',
        'Thermal imager: centre region of interest and uniformity', 'Error at the centre ROI', '0.50', '0.21', 'bottom-right 260 190 20 20',
        'NETD = 0.033 K (5 regions of interest, 4 frames)', 'common practice — no standard is named']) {
        expect(text, s).toContain(s)
      }
    }
  })
})

describe('a calibration equation on a spot instrument’s certificate', () => {
  it('fits the as-left points, refuses table temperatures outside them at submission, and states the table as interpolated', async () => {
    const instrument = (await makeInstrument(tech, org)).id
    const pv = (await makeProcedure(quality)).currentVersion.id
    const plate = await makeSource(quality)
    const run = await makeRun(tech, instrument, pv, { calibrationEquation: { temperaturesK: [298.15, 400], pointCorrelation: 0.2 } })
    for (const [k, offset] of [[273.15, 0.3], [323.15, 0.2], [373.15, -0.1]] as const) {
      const r = await tech.post(`/api/runs/${run.id}/points`, { sourceId: plate.id, setPointK: k, sourceIndicatedK: k, readingsK: [k + offset, k + offset + 0.1, k + offset - 0.1] })
      expect(r.status, JSON.stringify(r.body)).toBe(201)
    }
    const detail = (await tech.get(`/api/runs/${run.id}`)).body
    expect(detail.equation.problem.field).toBe('calibrationEquation.temperaturesK[1]')
    const s = await tech.post(`/api/runs/${run.id}/submit`, { version: detail.version })
    expect(s.status).toBe(400)
    expect(fieldsOf(s)).toEqual(['calibrationEquation.temperaturesK[1]'])
    // the table at 298.15 K and at the second point's reference temperature (323.15 + its certificate correction)
    const t2 = detail.points[1].result.referenceTemperatureK
    const h = await tech.patch(`/api/runs/${run.id}`, { calibrationEquation: { temperaturesK: [298.15, t2], pointCorrelation: 0.2 }, version: detail.version })
    expect(h.status, JSON.stringify(h.body)).toBe(200)
    const fit = (await tech.get(`/api/runs/${run.id}`)).body.equation.fit
    expect(fit.pointCount).toBe(3)
    // three points, three parameters: the equation passes through each point, so at T_2 the reading is the point's mean
    expect(Math.abs(fit.rows[1].readingK - detail.points[1].result.meanReadingK)).toBeLessThan(1e-6)
    expect(fit.rows[1].expandedUncertaintyK).toBeGreaterThan(0)
    const cert = await certify(run.id)
    if (hasPdftotext) {
      const text = pdfText(await pdfOf(quality, cert.id))
      expect(text).toMatch(/25\.0\d? \(interpolated\)/)
      for (const s of ['Calibration equation (interpolated values)', 'they were not measured', 'must not be extrapolated', 'r = 0.20 between the points', 'Sakuma–Hattori']) {
        expect(text, s).toContain(s)
      }
    }
  })
})

describe('the demo scenario', () => {
  it('the ratio pyrometers have two bands and the demo has one imager calibration with five ROIs at three points', async () => {
    const ratio = (await tech.get('/api/instruments?pageSize=200&q=CR10')).body.rows as { kind: string, bandLambda1Um: number, bandLambda2Um: number, band2Lambda1Um: number, band2Lambda2Um: number, emissivityRatioSetting: number }[]
    expect(ratio.length).toBeGreaterThan(0)
    for (const i of ratio) expect(i).toMatchObject({ kind: 'ratio-pyrometer', bandLambda1Um: 0.95, bandLambda2Um: 1, band2Lambda1Um: 1, band2Lambda2Um: 1.05, emissivityRatioSetting: 1 })
    const imager = (await tech.get('/api/instruments?q=BF-IR-009')).body.rows.find((i: { assetTag: string }) => i.assetTag === 'BF-IR-009')
    expect(imager.kind).toBe('thermal-imager')
    const run = (await tech.get(`/api/runs?instrumentId=${imager.id}`)).body.rows[0]
    const detail = (await tech.get(`/api/runs/${run.id}`)).body
    expect(detail.imagerSettings).toMatchObject({ nonUniformityCorrection: true })
    expect(detail.points).toHaveLength(3)
    for (const p of detail.points) expect(p.rois).toHaveLength(5)
    expect(detail.points.filter((p: { result: { imager: { netd: unknown } } }) => p.result.imager.netd)).toHaveLength(1)
  })
})
