import { describe, expect, it } from 'vitest'
import {
  EngineInputError,
  expectedRatioReading,
  expectedReadingK,
  prepareBand,
  RATIO_MODEL_INPUTS,
  ratioReadingModel,
  type Band,
  type RatioReadingInput,
} from '../../../shared/radiometry'

const BANDS: Record<string, Band> = {
  A1: { kind: 'rectangular', lambda1Um: 0.95, lambda2Um: 1.0 },
  A2: { kind: 'rectangular', lambda1Um: 1.0, lambda2Um: 1.05 },
  B1: { kind: 'rectangular', lambda1Um: 0.75, lambda2Um: 0.85 },
  B2: { kind: 'rectangular', lambda1Um: 0.95, lambda2Um: 1.05 },
  C1: { kind: 'rectangular', lambda1Um: 1.5, lambda2Um: 1.6 },
  C2: { kind: 'rectangular', lambda1Um: 2.0, lambda2Um: 2.4 },
  T1: { kind: 'tabulated', points: [[0.85, 0], [0.9, 0.6], [0.95, 1], [1.0, 0.7], [1.02, 0]] },
  T2: { kind: 'tabulated', points: [[1.02, 0], [1.05, 0.5], [1.1, 1], [1.15, 0.8], [1.2, 0]] },
}

const input = (pair: string, ts: number, e1: number, e2: number, tw: number, k: number): RatioReadingInput => ({
  band1: BANDS[`${pair}1`]!,
  band2: BANDS[`${pair}2`]!,
  sourceTemperatureK: ts,
  sourceEmissivity1: e1,
  sourceEmissivity2: e2,
  reflectedTemperatureK: tw,
  emissivityRatioSetting: k,
})

// Printed by tests/reference/ratio_pyrometer.py (scipy 1.17.1): band radiance by scipy.integrate.quad
// (epsabs=0, epsrel=1e-12; tabulated bands integrated segment by segment with the same piecewise-linear
// responsivity), the ratio equation by scipy.optimize.brentq on [50 K, 5000 K] (xtol=1e-12, rtol=1e-15),
// CODATA 2018 constants. Columns: [pair, T_s K, ε_1, ε_2, T_w K, k, T_R K].
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

// Same script: single band 0.95–1.05 µm, emissivity setting 1, T_s = 1273.15 K, solving
// L(T_m) = ε_s·L(T_s) + (1 − ε_s)·L(T_w) by brentq. Columns: [ε_s, T_w K, T_m − T_s K].
const SCIPY_SINGLE: [number, number, number][] = [
  [0.999, 296.15, -0.113197946],
  [0.999, 1000.0, -0.107938834],
  [0.995, 296.15, -0.566924496],
  [0.995, 1000.0, -0.540543986],
  [0.95, 296.15, -5.777689565],
  [0.95, 1000.0, -5.503885236],
]

describe('ratio (two-colour) pyrometer', () => {
  it('matches the scipy reference (quad + brentq) within 1e-7 K, grey and non-grey, k ≠ 1, rectangular and tabulated', () => {
    for (const [pair, ts, e1, e2, tw, k, tr] of SCIPY_RATIO) {
      const r = expectedRatioReading(input(pair, ts, e1, e2, tw, k))
      expect(Math.abs(r.expectedReadingK - tr), `${pair} ${ts} ${e1} ${e2} ${tw} ${k}`).toBeLessThan(1e-7)
    }
  })

  it('a grey source without reflection read at k = 1 gives T_s (model identity, domain notes §7)', () => {
    for (const pair of ['A', 'B', 'C', 'T']) {
      for (const ts of [700, 1273.15, 2500]) {
        for (const e of [1, 0.95, 0.3]) {
          // no reflection: T_w tiny (its band radiance underflows to zero), or ε = 1 with any T_w
          const tw = e === 1 ? 2000 : 1e-3
          const r = expectedRatioReading(input(pair, ts, e, e, tw, 1))
          expect(Math.abs(r.expectedReadingK - ts)).toBeLessThan(1e-9 * ts)
        }
      }
    }
  })

  it('issue figures: grey 1273.15 K source, 0.95–1.00/1.00–1.05 µm ratio reads T_s; one 0.95–1.05 µm band reads −0.11, −0.57, −5.78 K', () => {
    // The ratio instrument (k = 1) with surroundings at 296.15 K reads T_s to well under 1 µK: the
    // reflected radiance at 1 µm from 296 K is ~e⁻³⁷ of the source's.
    for (const e of [0.999, 0.995, 0.95]) {
      const r = expectedRatioReading(input('A', 1273.15, e, e, 296.15, 1))
      expect(Math.abs(r.expectedReadingK - 1273.15)).toBeLessThan(1e-6)
    }
    // The single-band figures of the issue are reproduced by the existing reading model with emissivity
    // setting ε_i = 1 (so the instrument temperature drops out; 296.15 K here) and reflected temperature
    // T_w = 296.15 K — any T_w up to ~500 K gives the same to 1e-6 K; T_w = 1000 K would not (−0.108,
    // −0.541, −5.504 K). Checked against scipy (SCIPY_SINGLE).
    const issue: [number, number][] = [[0.999, -0.11], [0.995, -0.57], [0.95, -5.78]]
    for (const [es, rounded] of issue) {
      const t = expectedReadingK({ band: BANDS.B2!, sourceTemperatureK: 1273.15, sourceEmissivity: es, reflectedTemperatureK: 296.15, instrumentTemperatureK: 296.15, emissivitySetting: 1 })
      expect(Math.round((t - 1273.15) * 100) / 100).toBe(rounded)
    }
    for (const [es, tw, d] of SCIPY_SINGLE) {
      const t = expectedReadingK({ band: BANDS.B2!, sourceTemperatureK: 1273.15, sourceEmissivity: es, reflectedTemperatureK: tw, instrumentTemperatureK: 296.15, emissivitySetting: 1 })
      expect(Math.abs(t - 1273.15 - d)).toBeLessThan(1e-6)
    }
  })

  it('narrow bands follow the Wien-limit two-colour formula 1/T_R − 1/T_s = λ1λ2/(c2(λ2 − λ1))·ln(kε2/ε1)', () => {
    // textbook two-colour relation (e.g. DeWitt & Nutter 1988, from memory) for monochromatic bands in
    // the Wien limit. Here 0.02 nm bands at 0.65 and 0.90 µm: the band widths shift T_R by < 1e-6 K; the
    // Wien approximation drops ln(1 − e^(−c2/λT)) terms, e^(−16) ≈ 1e-7 in ln r at 1000 K and 0.9 µm,
    // i.e. ≈ 1e-7 / (d ln r/dT ≈ 6e-3 K⁻¹) ≈ 2e-5 K; hence the 5e-5 K bound and T ≤ 1000 K.
    const c2 = ((6.62607015e-34 * 299792458) / 1.380649e-23) * 1e6
    const b1: Band = { kind: 'rectangular', lambda1Um: 0.64999, lambda2Um: 0.65001 }
    const b2: Band = { kind: 'rectangular', lambda1Um: 0.89999, lambda2Um: 0.90001 }
    const lr = (0.65 * 0.9) / (0.9 - 0.65)
    for (const [ts, e1, e2, k] of [[1000, 0.9, 0.85, 1], [800, 0.5, 0.6, 1], [1000, 0.6, 0.5, 1.02], [900, 0.8, 0.8, 0.95]] as const) {
      const tr = expectedRatioReading({ band1: b1, band2: b2, sourceTemperatureK: ts, sourceEmissivity1: e1, sourceEmissivity2: e2, reflectedTemperatureK: 1e-3, emissivityRatioSetting: k }).expectedReadingK
      const wien = 1 / (1 / ts + (lr / c2) * Math.log((k * e2) / e1))
      expect(Math.abs(tr - ts)).toBeGreaterThan(5) // a real shift, not the identity
      expect(Math.abs(tr - wien)).toBeLessThan(5e-5)
    }
  })

  it('sensitivity coefficients match central differences', () => {
    const cases: RatioReadingInput[] = [
      input('A', 1273.15, 0.9, 0.85, 296.15, 0.95),
      input('B', 1800, 0.4, 0.3, 800, 1.3),
      input('C', 700, 0.7, 0.75, 500, 1.0),
      input('T', 1273.15, 0.85, 0.9, 600, 1.05),
    ]
    const keys = [
      ['sourceTemperatureK', 'sourceTemperature', 1e-2],
      ['sourceEmissivity1', 'sourceEmissivity1', 1e-5],
      ['sourceEmissivity2', 'sourceEmissivity2', 1e-5],
      ['reflectedTemperatureK', 'reflectedTemperature', 1e-2],
      ['emissivityRatioSetting', 'emissivityRatioSetting', 1e-5],
    ] as const
    for (const inp of cases) {
      const s = expectedRatioReading(inp).sensitivities
      for (const [field, out, h] of keys) {
        const up = expectedRatioReading({ ...inp, [field]: inp[field] + h }).expectedReadingK
        const dn = expectedRatioReading({ ...inp, [field]: inp[field] - h }).expectedReadingK
        const cd = (up - dn) / (2 * h)
        expect(Math.abs(s[out] - cd), `${out}`).toBeLessThan(1e-5 * Math.max(1, Math.abs(cd)))
      }
    }
  })

  it('grey source: the ε_1 and ε_2 coefficients cancel, and no reflection gives ∂T_R/∂T_w = 0', () => {
    const s = expectedRatioReading(input('B', 1500, 0.7, 0.7, 1e-3, 1)).sensitivities
    expect(s.sourceEmissivity1).toBeCloseTo(-s.sourceEmissivity2, 8)
    expect(s.sourceEmissivity1).toBeGreaterThan(0)
    expect(s.reflectedTemperature).toBe(0)
    expect(s.sourceTemperature).toBeCloseTo(1, 9)
  })

  it('ratioReadingModel (for Monte Carlo) agrees with expectedRatioReading and gives NaN on failure', () => {
    expect(RATIO_MODEL_INPUTS).toEqual(['sourceTemperatureK', 'sourceEmissivity1', 'sourceEmissivity2', 'reflectedTemperatureK', 'emissivityRatioSetting'])
    const f = ratioReadingModel(BANDS.T1!, BANDS.T2!)
    const x = Float64Array.of(1273.15, 0.85, 0.9, 296.15, 1.05)
    expect(Math.abs(f(x) - expectedRatioReading(input('T', 1273.15, 0.85, 0.9, 296.15, 1.05)).expectedReadingK)).toBeLessThan(1e-9)
    expect(Number.isNaN(f(Float64Array.of(1273.15, 0.9, 0.9, 296.15, 0)))).toBe(true) // k = 0
    expect(Number.isNaN(f(Float64Array.of(500, 1.5, 0.9, 2000, 1)))).toBe(true) // S_1 < 0
    expect(Number.isNaN(f(Float64Array.of(4900, 0.9, 0.3, 296.15, 1)))).toBe(true) // T_R above 5000 K
  })

  it('accepts prepared bands and tabulated bands whose zero-response ends overlap', () => {
    const t1: Band = { kind: 'tabulated', points: [[0.9, 0], [0.95, 1], [1.0, 0], [1.1, 0]] }
    const t2: Band = { kind: 'tabulated', points: [[0.98, 0], [1.0, 0], [1.05, 1], [1.1, 0]] }
    const base = { sourceTemperatureK: 1400, sourceEmissivity1: 0.8, sourceEmissivity2: 0.8, reflectedTemperatureK: 1e-3, emissivityRatioSetting: 1 }
    expect(Math.abs(expectedRatioReading({ ...base, band1: t1, band2: t2 }).expectedReadingK - 1400)).toBeLessThan(1e-6)
    const a = expectedRatioReading({ ...input('A', 1273.15, 0.9, 0.85, 296.15, 1), band1: prepareBand(BANDS.A1!), band2: prepareBand(BANDS.A2!) })
    expect(Math.abs(a.expectedReadingK - 1417.198504673)).toBeLessThan(1e-6)
  })

  it('rejects bad inputs with the API field names', () => {
    const base = input('A', 1273.15, 0.9, 0.85, 296.15, 1)
    const field = (patch: Partial<RatioReadingInput>): string => {
      try {
        expectedRatioReading({ ...base, ...patch })
      } catch (e) {
        expect(e).toBeInstanceOf(EngineInputError)
        return (e as EngineInputError).field
      }
      return 'no error'
    }
    expect(field({})).toBe('no error')
    expect(field({ band1: { kind: 'rectangular', lambda1Um: 0, lambda2Um: 1 } })).toBe('band1.lambda1Um')
    expect(field({ band2: { kind: 'rectangular', lambda1Um: 1.05, lambda2Um: 1.0 } })).toBe('band2.lambda2Um')
    expect(field({ band1: { kind: 'tabulated', points: [[1, 1]] } })).toBe('band1.points')
    expect(field({ band2: { kind: 'other' } as unknown as Band })).toBe('band2')
    expect(field({ band2: { kind: 'rectangular', lambda1Um: 0.99, lambda2Um: 1.05 } })).toBe('band2') // overlap
    expect(field({ band1: BANDS.A2!, band2: BANDS.A1! })).toBe('band2') // reversed
    expect(field({ sourceTemperatureK: 0 })).toBe('sourceTemperatureK')
    expect(field({ sourceTemperatureK: Number.NaN })).toBe('sourceTemperatureK')
    expect(field({ sourceEmissivity1: 0 })).toBe('sourceEmissivity1')
    expect(field({ sourceEmissivity1: 1.01 })).toBe('sourceEmissivity1')
    expect(field({ sourceEmissivity2: -0.1 })).toBe('sourceEmissivity2')
    expect(field({ reflectedTemperatureK: -1 })).toBe('reflectedTemperatureK')
    expect(field({ emissivityRatioSetting: 0 })).toBe('emissivityRatioSetting')
    expect(field({ emissivityRatioSetting: Number.POSITIVE_INFINITY })).toBe('emissivityRatioSetting')
    expect(field({ constants: 'bogus' as never })).toBe('constants')
    // the reading leaves the 50 K – 5000 K range (non-grey source near the top of the range)
    expect(field({ sourceTemperatureK: 4900, sourceEmissivity1: 0.9, sourceEmissivity2: 0.3 })).toBe('sourceTemperatureK')
    expect(field({ sourceTemperatureK: 55, sourceEmissivity1: 0.1, sourceEmissivity2: 1, reflectedTemperatureK: 1e-3 })).toBe('sourceTemperatureK')
    expect(() => ratioReadingModel(BANDS.A2!, BANDS.A1!)).toThrow(EngineInputError)
  })
})
