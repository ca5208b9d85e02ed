// The calculation API contract (issue 3). Expected values come from outside the project
// and are named beside each check.
import { beforeAll, describe, expect, it } from 'vitest'
import { type Client, signedIn } from '../support/http'

let tech: Client
beforeAll(async () => {
  tech = await signedIn('technician')
})

const LWIR = { kind: 'rectangular', lambda1Um: 8, lambda2Um: 14 } as const
// CODATA 2018 (h, c, k exact) → σ = 2π⁵k⁴/(15h³c²) = 5.670374419e-8 W·m⁻²·K⁻⁴.
const SIGMA = 5.670374419e-8
const point = { band: LWIR, sourceTemperatureK: 373.15, sourceEmissivity: 0.95, reflectedTemperatureK: 296.15, instrumentTemperatureK: 296.15, emissivitySetting: 0.95 }

describe('POST /api/calculations/band-radiance and /temperature', () => {
  it('a band wide enough to hold nearly all the spectrum gives σT⁴/π (Stefan–Boltzmann law, CODATA 2018 σ)', async () => {
    const r = await tech.post('/api/calculations/band-radiance', { band: { kind: 'rectangular', lambda1Um: 0.05, lambda2Um: 1000 }, temperatureK: 1000 })
    expect(r.status).toBe(200)
    expect(Math.abs(r.body.radiance / ((SIGMA * 1000 ** 4) / Math.PI) - 1)).toBeLessThan(1e-6)
  })
  it('round-trips temperature → radiance → temperature to 1 µK', async () => {
    for (const T of [250, 373.15, 1234.93]) {
      const L = (await tech.post('/api/calculations/band-radiance', { band: LWIR, temperatureK: T })).body.radiance
      const back = await tech.post('/api/calculations/temperature', { band: LWIR, radiance: L })
      expect(back.status).toBe(200)
      expect(Math.abs(back.body.temperatureK - T)).toBeLessThan(1e-6)
    }
  })
  it('accepts a tabulated band', async () => {
    const r = await tech.post('/api/calculations/band-radiance', { band: { kind: 'tabulated', points: [[7.5, 0], [10, 1], [14.5, 0]] }, temperatureK: 300 })
    expect(r.status).toBe(200)
    expect(r.body.radiance).toBeGreaterThan(0)
  })
})

describe('POST /api/calculations/expected-reading', () => {
  it('reads the source temperature when ε_i = ε_s and T_d = T_w (the reading model’s identity, ASTM E2758 form)', async () => {
    const r = await tech.post('/api/calculations/expected-reading', point)
    expect(r.status).toBe(200)
    expect(Math.abs(r.body.expectedReadingK - 373.15)).toBeLessThan(1e-6)
    expect(Object.keys(r.body.sensitivities).sort()).toEqual(['emissivitySetting', 'instrumentTemperature', 'reflectedTemperature', 'sourceEmissivity', 'sourceTemperature'])
    // About 0.6 K per 0.01 of emissivity at 100 °C in 8–14 µm (domain primer §3, common practice).
    expect(r.body.sensitivities.sourceEmissivity / 100).toBeGreaterThan(0.5)
    expect(r.body.sensitivities.sourceEmissivity / 100).toBeLessThan(0.75)
  })
  it('a 0.95 plate read with ε_i = 1 reads several kelvin low at 100 °C in 8–14 µm (domain primer §5, common practice)', async () => {
    const r = await tech.post('/api/calculations/expected-reading', { ...point, emissivitySetting: 1 })
    const low = 373.15 - r.body.expectedReadingK
    expect(low).toBeGreaterThan(2)
    expect(low).toBeLessThan(5)
  })
  it('sensitivities agree with central differences of the API itself', async () => {
    const base = (await tech.post('/api/calculations/expected-reading', point)).body
    const h = 1e-3
    const up = (await tech.post('/api/calculations/expected-reading', { ...point, reflectedTemperatureK: point.reflectedTemperatureK + h })).body.expectedReadingK
    const dn = (await tech.post('/api/calculations/expected-reading', { ...point, reflectedTemperatureK: point.reflectedTemperatureK - h })).body.expectedReadingK
    expect(Math.abs((up - dn) / (2 * h) - base.sensitivities.reflectedTemperature)).toBeLessThan(1e-5)
  })
})

describe('POST /api/calculations/budget', () => {
  it('gives the GUM Table G.2 coverage factor for ν_eff = 10 at p = 95.45 % (t = 2.28)', async () => {
    const r = await tech.post('/api/calculations/budget', { components: [{ name: 'repeatability', standardUncertainty: 0.1, sensitivity: 1, dof: 10 }] })
    expect(r.status).toBe(200)
    expect(r.body.effectiveDegreesOfFreedom).toBeCloseTo(10, 9)
    expect(Math.abs(r.body.coverageFactor - 2.28)).toBeLessThan(0.005)
    expect(r.body.expandedUncertainty).toBeCloseTo(0.1 * r.body.coverageFactor, 12)
  })
  it('combines a rectangular and a normal component (GUM 4.3.7: a/√3; 4.3.3: U/k); infinite ν gives null and k = 2.00 (Table G.2)', async () => {
    const r = await tech.post('/api/calculations/budget', {
      components: [
        { name: 'plate emissivity', distribution: 'rectangular', halfWidth: 0.01, sensitivity: 62 },
        { name: 'reference thermometer', distribution: 'normal', halfWidth: 0.05, coverageFactor: 2, sensitivity: 1 },
      ],
    })
    expect(r.status).toBe(200)
    const u1 = (0.01 / Math.sqrt(3)) * 62
    const u2 = 0.025
    expect(r.body.combinedStandardUncertainty).toBeCloseTo(Math.hypot(u1, u2), 12)
    expect(r.body.effectiveDegreesOfFreedom).toBeNull()
    expect(Math.abs(r.body.coverageFactor - 2.0)).toBeLessThan(0.005)
    expect(r.body.contributions[0].percent + r.body.contributions[1].percent).toBeCloseTo(100, 9)
  })
})

describe('POST /api/calculations/monte-carlo', () => {
  it('returns the contract and validates GUM for a nearly linear, normal case (JCGM 101 §8)', async () => {
    const r = await tech.post('/api/calculations/monte-carlo', {
      band: LWIR,
      inputs: {
        sourceTemperatureK: { distribution: 'normal', value: 373.15, standardUncertainty: 0.2 },
        sourceEmissivity: { distribution: 'constant', value: 0.95 },
        reflectedTemperatureK: { distribution: 'normal', value: 296.15, standardUncertainty: 0.5 },
        instrumentTemperatureK: { distribution: 'constant', value: 296.15 },
        emissivitySetting: { distribution: 'constant', value: 0.95 },
      },
      trials: 200_000,
      seed: 7,
    })
    expect(r.status).toBe(200)
    expect(r.body).toMatchObject({ trials: 200_000, seed: 7, validated: true })
    expect(r.body.coverageInterval).toHaveLength(2)
    expect(r.body.tolerance).toBeGreaterThan(0)
    expect(Math.abs(r.body.mean - 373.15)).toBeLessThan(0.01)
    expect(r.body.gum.expectedReadingK).toBeCloseTo(373.15, 6)
  })
  it('is reproducible for a seed', async () => {
    const body = { band: LWIR, inputs: { sourceTemperatureK: { distribution: 'rectangular', value: 400, halfWidth: 1 }, sourceEmissivity: { distribution: 'rectangular', value: 0.95, halfWidth: 0.01 }, reflectedTemperatureK: { distribution: 'constant', value: 296 }, instrumentTemperatureK: { distribution: 'constant', value: 296 }, emissivitySetting: { distribution: 'constant', value: 1 } }, trials: 20_000, seed: 42 }
    const a = await tech.post('/api/calculations/monte-carlo', body)
    const b = await tech.post('/api/calculations/monte-carlo', body)
    expect(a.body.mean).toBe(b.body.mean)
    expect(a.body.coverageInterval).toEqual(b.body.coverageInterval)
  })
  it('reports progress through a job that only its owner can see', async () => {
    const start = await tech.post('/api/calculations/monte-carlo/jobs', { band: LWIR, inputs: { sourceTemperatureK: { distribution: 'normal', value: 373.15, standardUncertainty: 0.1 }, sourceEmissivity: { distribution: 'rectangular', value: 0.95, halfWidth: 0.01 }, reflectedTemperatureK: { distribution: 'constant', value: 296 }, instrumentTemperatureK: { distribution: 'constant', value: 296 }, emissivitySetting: { distribution: 'constant', value: 0.95 } }, trials: 1_000_000 })
    expect(start.status).toBe(202)
    const other = await signedIn('quality')
    expect((await other.get(`/api/calculations/monte-carlo/jobs/${start.body.id}`)).status).toBe(404)
    let last = start.body
    const seen = new Set<number>()
    for (let i = 0; i < 200 && last.status === 'running'; i++) {
      await new Promise(r => setTimeout(r, 50))
      last = (await tech.get(`/api/calculations/monte-carlo/jobs/${start.body.id}`)).body
      seen.add(last.done)
    }
    expect(last.status).toBe('done')
    expect(seen.size).toBeGreaterThan(1)
    expect(last.result.trials).toBe(1_000_000)
  })
})

describe('bad input is 400 naming the field', () => {
  const cases: [string, string, unknown, string][] = [
    ['λ2 ≤ λ1', 'band-radiance', { band: { kind: 'rectangular', lambda1Um: 14, lambda2Um: 8 }, temperatureK: 300 }, 'band.lambda2Um'],
    ['T ≤ 0', 'band-radiance', { band: LWIR, temperatureK: 0 }, 'temperatureK'],
    ['negative T', 'expected-reading', { ...point, sourceTemperatureK: -5 }, 'sourceTemperatureK'],
    ['emissivity above 1', 'expected-reading', { ...point, sourceEmissivity: 1.2 }, 'sourceEmissivity'],
    ['emissivity 0', 'expected-reading', { ...point, emissivitySetting: 0 }, 'emissivitySetting'],
    ['one table point', 'band-radiance', { band: { kind: 'tabulated', points: [[10, 1]] }, temperatureK: 300 }, 'band.points'],
    ['unsorted table', 'band-radiance', { band: { kind: 'tabulated', points: [[10, 1], [9, 1], [12, 0]] }, temperatureK: 300 }, 'band.points[1][0]'],
    ['negative response', 'band-radiance', { band: { kind: 'tabulated', points: [[8, 1], [9, -1]] }, temperatureK: 300 }, 'band.points[1][1]'],
    ['a string for a number', 'band-radiance', { band: LWIR, temperatureK: '300' }, 'temperatureK'],
    ['unknown band kind', 'band-radiance', { band: { kind: 'triangle' }, temperatureK: 300 }, 'band.kind'],
    ['unknown distribution', 'budget', { components: [{ name: 'x', distribution: 'gamma', halfWidth: 1, sensitivity: 1 }] }, 'components[0].distribution'],
    ['half-width missing', 'budget', { components: [{ name: 'x', distribution: 'rectangular', sensitivity: 1 }] }, 'components[0].halfWidth'],
    ['radiance ≤ 0', 'temperature', { band: LWIR, radiance: -1 }, 'radiance'],
    ['MC unknown distribution', 'monte-carlo', { band: LWIR, inputs: { ...Object.fromEntries(['sourceTemperatureK', 'sourceEmissivity', 'reflectedTemperatureK', 'instrumentTemperatureK', 'emissivitySetting'].map(k => [k, { distribution: 'constant', value: 0.9 }])), sourceEmissivity: { distribution: 'lognormal', value: 0.9 } } }, 'inputs.sourceEmissivity.distribution'],
  ]
  for (const [what, route, body, field] of cases) {
    it(`${what} → ${field}`, async () => {
      const r = await tech.post(`/api/calculations/${route}`, body)
      expect(r.status).toBe(400)
      expect(Object.keys(r.body.data.fields)).toContain(field)
    })
  }
  it('NaN is not JSON: 400', async () => {
    const r = await tech.request('POST', '/api/calculations/band-radiance', '{"band":{"kind":"rectangular","lambda1Um":8,"lambda2Um":14},"temperatureK":NaN}')
    expect(r.status).toBe(400)
  })
  it('a radiance beyond the inversion range is refused, naming radiance', async () => {
    const r = await tech.post('/api/calculations/temperature', { band: LWIR, radiance: 1e30 })
    expect(r.status).toBe(400)
    expect(Object.keys(r.body.data.fields)[0]).toMatch(/radiance/)
  })
})
