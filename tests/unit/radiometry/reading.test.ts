import { describe, expect, it } from 'vitest'
import {
  EngineInputError,
  expectedReading,
  expectedReadingK,
  readingModel,
  readingSensitivities,
  type Band,
  type ReadingInput,
} from '../../../shared/radiometry'

// Independent reference: band signal by composite Simpson on the plain Planck formula, and the
// reading by bisection, both written here (exact SI constants, SI Brochure 2019).
const H = 6.62607015e-34
const C = 299792458
const K = 1.380649e-23
const planck = (lm: number, T: number): number => (2 * H * C * C) / lm ** 5 / Math.expm1((H * C) / (K * lm * T))
function signal(l1: number, l2: number, T: number): number {
  const n = 4000
  const h = (l2 - l1) / n
  let s = planck(l1 * 1e-6, T) + planck(l2 * 1e-6, T)
  for (let i = 1; i < n; i++) s += (i % 2 ? 4 : 2) * planck((l1 + i * h) * 1e-6, T)
  return (s * h * 1e-6) / 3
}
function referenceReading(l1: number, l2: number, ts: number, es: number, tw: number, td: number, ei: number): number {
  const target = (es * signal(l1, l2, ts) + (1 - es) * signal(l1, l2, tw) - (1 - ei) * signal(l1, l2, td)) / ei
  let lo = 50
  let hi = 5000
  for (let i = 0; i < 80; i++) {
    const m = (lo + hi) / 2
    if (signal(l1, l2, m) < target) lo = m
    else hi = m
  }
  return (lo + hi) / 2
}

const LW: Band = { kind: 'rectangular', lambda1Um: 8, lambda2Um: 14 }
const base: ReadingInput = {
  band: LW,
  sourceTemperatureK: 373.15,
  sourceEmissivity: 0.95,
  reflectedTemperatureK: 296.15,
  instrumentTemperatureK: 296.15,
  emissivitySetting: 1,
}

describe('expected reading', () => {
  it('reads T_s when ε_i = ε_s and T_d = T_w (model identity)', () => {
    for (const band of [LW, { kind: 'rectangular', lambda1Um: 0.645, lambda2Um: 0.655 } as Band, { kind: 'tabulated', points: [[1.4, 0], [1.6, 1], [1.8, 0]] } as Band]) {
      for (const [ts, e, tw] of [[373.15, 0.95, 296.15], [1273.15, 0.6, 300], [250, 0.98, 290], [600, 1, 1000]] as const) {
        const t = expectedReadingK({ band, sourceTemperatureK: ts, sourceEmissivity: e, reflectedTemperatureK: tw, instrumentTemperatureK: tw, emissivitySetting: e })
        expect(Math.abs(t - ts)).toBeLessThan(1e-7)
      }
    }
  })

  it('a 0.95 plate at 100 °C read with ε_i = 1 in 8–14 µm reads several kelvin low', () => {
    // common practice (emissivity mismatch on flat-plate sources); reference by Simpson + bisection here
    const r = expectedReading(base)
    expect(base.sourceTemperatureK - r.expectedReadingK).toBeGreaterThan(2)
    expect(base.sourceTemperatureK - r.expectedReadingK).toBeLessThan(6)
    expect(Math.abs(r.expectedReadingK - referenceReading(8, 14, 373.15, 0.95, 296.15, 296.15, 1))).toBeLessThan(1e-6)
  })

  it('matches the independent reference for mixed settings', () => {
    const cases: [number, number, number, number, number][] = [
      [373.15, 0.95, 296.15, 300.15, 0.97],
      [523.15, 0.9, 310, 296, 1],
      [253.15, 0.97, 293.15, 293.15, 0.95],
      [1073.15, 0.99, 296, 305, 0.95],
    ]
    for (const [ts, es, tw, td, ei] of cases) {
      const t = expectedReadingK({ band: LW, sourceTemperatureK: ts, sourceEmissivity: es, reflectedTemperatureK: tw, instrumentTemperatureK: td, emissivitySetting: ei })
      expect(Math.abs(t - referenceReading(8, 14, ts, es, tw, td, ei))).toBeLessThan(1e-6)
    }
  })

  it('sensitivity coefficients match central differences', () => {
    const inputs: ReadingInput[] = [
      { ...base, emissivitySetting: 0.95 },
      { ...base, instrumentTemperatureK: 303.15, emissivitySetting: 0.9 },
      { band: { kind: 'rectangular', lambda1Um: 3.8, lambda2Um: 4 }, sourceTemperatureK: 773.15, sourceEmissivity: 0.9, reflectedTemperatureK: 300, instrumentTemperatureK: 298, emissivitySetting: 0.85 },
      { band: { kind: 'tabulated', points: [[7.5, 0], [8, 0.4], [9, 0.95], [11, 1], [13, 0.9], [14, 0.3], [14.5, 0]] }, sourceTemperatureK: 323.15, sourceEmissivity: 0.96, reflectedTemperatureK: 295, instrumentTemperatureK: 299, emissivitySetting: 0.93 },
    ]
    const keys = [
      ['sourceTemperatureK', 'sourceTemperature', 1e-3],
      ['sourceEmissivity', 'sourceEmissivity', 1e-5],
      ['reflectedTemperatureK', 'reflectedTemperature', 1e-3],
      ['instrumentTemperatureK', 'instrumentTemperature', 1e-3],
      ['emissivitySetting', 'emissivitySetting', 1e-5],
    ] as const
    for (const inp of inputs) {
      const s = readingSensitivities(inp)
      expect(Math.abs(s.expectedReadingK - expectedReadingK(inp))).toBeLessThan(1e-9)
      for (const [field, out, h] of keys) {
        const up = expectedReadingK({ ...inp, [field]: inp[field] + h })
        const dn = expectedReadingK({ ...inp, [field]: inp[field] - h })
        const cd = (up - dn) / (2 * h)
        expect(Math.abs(s[out] - cd), `${out}`).toBeLessThan(1e-6 * Math.max(1, Math.abs(cd)))
      }
    }
  })

  it('emissivity sensitivity on a plate at 100 °C is roughly 0.6 K per 0.01 (8–14 µm)', () => {
    // domain primer, common practice magnitude ("roughly 0.6 K per 0.01 of emissivity")
    const s = readingSensitivities({ ...base, emissivitySetting: 0.95 })
    expect(s.sourceEmissivity * 0.01).toBeGreaterThan(0.5)
    expect(s.sourceEmissivity * 0.01).toBeLessThan(0.8)
    expect(s.emissivitySetting).toBeCloseTo(-s.sourceEmissivity, 6) // ε_i = ε_s, T_d = T_w: symmetric
  })

  it('readingModel (for Monte Carlo) agrees with expectedReadingK', () => {
    const f = readingModel(LW)
    const x = Float64Array.of(373.15, 0.95, 296.15, 297, 0.96)
    expect(Math.abs(f(x) - expectedReadingK({ band: LW, sourceTemperatureK: 373.15, sourceEmissivity: 0.95, reflectedTemperatureK: 296.15, instrumentTemperatureK: 297, emissivitySetting: 0.96 }))).toBeLessThan(1e-9)
    expect(Number.isNaN(f(Float64Array.of(250, 1, 300, 400, 0.1)))).toBe(true)
  })

  it('rejects bad inputs with the API field names', () => {
    const field = (patch: Partial<ReadingInput>): string => {
      try {
        expectedReading({ ...base, ...patch })
      } catch (e) {
        expect(e).toBeInstanceOf(EngineInputError)
        return (e as EngineInputError).field
      }
      return 'no error'
    }
    expect(field({ sourceTemperatureK: 0 })).toBe('sourceTemperatureK')
    expect(field({ sourceTemperatureK: Number.NaN })).toBe('sourceTemperatureK')
    expect(field({ sourceEmissivity: 0 })).toBe('sourceEmissivity')
    expect(field({ sourceEmissivity: 1.01 })).toBe('sourceEmissivity')
    expect(field({ reflectedTemperatureK: -1 })).toBe('reflectedTemperatureK')
    expect(field({ instrumentTemperatureK: Number.POSITIVE_INFINITY })).toBe('instrumentTemperatureK')
    expect(field({ emissivitySetting: 1.5 })).toBe('emissivitySetting')
    expect(field({ band: { kind: 'rectangular', lambda1Um: 14, lambda2Um: 8 } })).toBe('band.lambda2Um')
    // instrument side needs a negative signal: hot detector, low emissivity setting, cold source
    expect(field({ sourceTemperatureK: 250, sourceEmissivity: 1, instrumentTemperatureK: 400, emissivitySetting: 0.1 })).toBe('instrumentTemperatureK')
    // reading above the inversion range
    expect(field({ sourceTemperatureK: 4990, sourceEmissivity: 1, emissivitySetting: 0.5, instrumentTemperatureK: 296 })).toBe('sourceTemperatureK')
  })
})
