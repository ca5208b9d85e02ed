import { describe, expect, it } from 'vitest'
import {
  bandRadiance,
  bandRadianceDerivative,
  bandRadianceQuadrature,
  EngineInputError,
  prepareBand,
  prepareSignalTable,
  readingModel,
  SIGNAL_TABLE_TOLERANCE,
  temperatureFromRadiance,
  type Band,
  type TabulatedBand,
} from '../../../shared/radiometry'
import { runMonteCarlo, runMonteCarloChunk, Xoshiro128, type MonteCarloInput } from '../../../shared/uncertainty'

// Inputs only: the demo's invented thermopile responsivity (server/utils/seedRegisters.ts), 33 points
// 0.25 µm apart and a 121-point version 1/15 µm apart. The reference everywhere is the exact closed-form
// integral of ./planck (itself checked against Simpson, Gauss–Kronrod and scipy in planck.test.ts and
// bandIntegral.test.ts) and, for a few points, the adaptive Gauss–Kronrod quadrature.
function thermopile(step: number): TabulatedBand {
  const points: [number, number][] = []
  const n = Math.round(8 / step)
  for (let i = 0; i <= n; i++) {
    const l = 7 + i * step
    const rise = 1 / (1 + Math.exp(-(l - 8) / 0.18))
    const fall = 1 / (1 + Math.exp((l - 14) / 0.22))
    points.push([l, rise * fall * (0.82 + (0.18 * (l - 7)) / 8)])
  }
  return { kind: 'tabulated', points }
}
const DEMO33 = thermopile(0.25)
const DEMO121 = thermopile(1 / 15)
const SILICON: Band = { kind: 'tabulated', points: [[0.55, 0.05], [0.62, 0.6], [0.65, 1], [0.68, 0.55], [0.75, 0]] }
const LW: Band = { kind: 'rectangular', lambda1Um: 8, lambda2Um: 14 }
const RED: Band = { kind: 'rectangular', lambda1Um: 0.645, lambda2Um: 0.655 }
const rel = (a: number, b: number): number => Math.abs(a - b) / Math.abs(b)

describe('signal table', () => {
  it('has 33 and 121 points in the demo-shaped tables', () => {
    expect(DEMO33.points).toHaveLength(33)
    expect(DEMO121.points).toHaveLength(121)
  })

  it('S and dS/dT agree with the exact integral to 1e-10 and 1e-8 over 50–5000 K (3000 temperatures per band)', () => {
    const rng = new Xoshiro128(17)
    for (const [name, band] of [['demo 33', DEMO33], ['demo 121', DEMO121], ['silicon', SILICON], ['8–14 µm', LW], ['0.65 µm', RED]] as const) {
      const p = prepareBand(band)
      const table = prepareSignalTable(p, 50, 5000)
      let worstS = 0
      let worstD = 0
      const out = new Float64Array(2)
      for (let i = 0; i < 3000; i++) {
        const T = 50 * 100 ** ((i + rng.nextDouble()) / 3000)
        table.signalAndDerivative(T, out)
        worstS = Math.max(worstS, rel(out[0]!, bandRadiance(p, T)))
        worstD = Math.max(worstD, rel(out[1]!, bandRadianceDerivative(p, T)))
        expect(table.signal(T)).toBe(out[0])
      }
      expect(worstS, name).toBeLessThan(1e-10)
      expect(worstD, name).toBeLessThan(1e-8)
      expect(table.maxCheckedError, name).toBeLessThanOrEqual(SIGNAL_TABLE_TOLERANCE)
      expect(table.panels, name).toBeGreaterThan(0)
    }
  })

  it('agrees with adaptive Gauss–Kronrod quadrature of the demo table to 1e-10', () => {
    const table = prepareSignalTable(DEMO33, 223.15, 823.15)
    for (const T of [233.15, 373.15, 500, 773.15]) {
      const q = bandRadianceQuadrature(DEMO33, T, { relativeTolerance: 1e-12 })
      expect(q.converged).toBe(true)
      expect(rel(table.signal(T), q.value)).toBeLessThan(1e-10)
    }
  })

  it('builds only what is used, and is exact outside its range', () => {
    const p = prepareBand(DEMO33)
    const table = prepareSignalTable(p, 290, 310)
    expect(table.panels).toBe(0)
    expect(rel(table.signal(300), bandRadiance(p, 300))).toBeLessThan(1e-10)
    expect(table.panels).toBe(1)
    for (const T of [289.999, 310.001, 1000, 60]) expect(table.signal(T)).toBe(bandRadiance(p, T))
    const out = new Float64Array(2)
    table.signalAndDerivative(400, out)
    expect(out[1]).toBe(bandRadianceDerivative(p, 400))
  })

  it('inverts S → T to 1e-8 K inside its range and falls back to the exact inversion outside', () => {
    const p = prepareBand(DEMO33)
    const table = prepareSignalTable(p, 200, 900)
    for (const T of [200, 200.5, 273.15, 296.15, 373.15, 642.7, 899.9, 900]) {
      for (const guess of [T, 250, 880, 40, 6000]) {
        expect(Math.abs(table.temperature(bandRadiance(p, T), guess) - T), `${T} K from ${guess} K`).toBeLessThan(1e-8)
      }
    }
    // outside the table (950 K, 150 K): the exact inversion answers
    for (const T of [150, 950, 4000]) {
      const s = bandRadiance(p, T)
      expect(Math.abs(table.temperature(s, 300) - temperatureFromRadiance(p, s))).toBeLessThan(1e-6)
    }
    // outside 50–5000 K: the exact inversion throws, naming the field given
    const above = () => table.temperature(bandRadiance(p, 5000) * 1.01, 300, 'sourceTemperatureK')
    expect(above).toThrow(EngineInputError)
    expect(above).toThrow(expect.objectContaining({ field: 'sourceTemperatureK' }))
  })

  it('rejects bad ranges and bands, naming the field', () => {
    const field = (f: () => unknown): string | undefined => {
      try {
        f()
      } catch (e) {
        expect(e).toBeInstanceOf(EngineInputError)
        return (e as EngineInputError).field
      }
      return undefined
    }
    expect(field(() => prepareSignalTable(DEMO33, 0, 500))).toBe('minTemperatureK')
    expect(field(() => prepareSignalTable(DEMO33, Number.NaN, 500))).toBe('minTemperatureK')
    expect(field(() => prepareSignalTable(DEMO33, 300, 300))).toBe('maxTemperatureK')
    expect(field(() => prepareSignalTable(DEMO33, 300, Number.POSITIVE_INFINITY))).toBe('maxTemperatureK')
    expect(field(() => prepareSignalTable({ kind: 'tabulated', points: [[8, 1]] }, 200, 300))).toBe('band.points')
    expect(field(() => readingModel(DEMO33, undefined, { temperatureRangeK: { min: 300, max: 200 } }))).toBe('temperatureRangeK')
    expect(field(() => readingModel(DEMO33, undefined, { temperatureRangeK: { min: Number.NaN, max: 200 } }))).toBe('temperatureRangeK')
  })
})

describe('reading model through a signal table', () => {
  const sample = (rng: Xoshiro128, x: Float64Array): void => {
    const r = (a: number, b: number): number => a + (b - a) * rng.nextDouble()
    x[0] = r(240, 460)
    x[1] = rng.nextDouble() < 0.2 ? 1 : r(0.5, 1)
    x[2] = r(260, 340)
    x[3] = r(270, 330)
    x[4] = rng.nextDouble() < 0.2 ? 1 : r(0.6, 1)
  }

  it('equals the exact model within 1e-6 K (trials inside and outside the range, 33 and 121 points)', () => {
    for (const band of [DEMO33, DEMO121]) {
      const exact = readingModel(band)
      const fast = readingModel(band, undefined, { temperatureRangeK: { min: 265, max: 420 } })
      const rng = new Xoshiro128(5)
      const x = new Float64Array(5)
      let worst = 0
      let compared = 0
      for (let i = 0; i < 1500; i++) {
        sample(rng, x)
        const e = exact(x)
        const f = fast(x)
        if (Number.isNaN(e)) {
          expect(f).toBeNaN()
          continue
        }
        worst = Math.max(worst, Math.abs(f - e))
        compared++
      }
      expect(compared).toBeGreaterThan(1000)
      expect(worst).toBeLessThan(1e-6)
    }
  })

  it('returns NaN and throws exactly where the exact model does', () => {
    const exact = readingModel(DEMO33)
    const fast = readingModel(DEMO33, undefined, { temperatureRangeK: { min: 50, max: 5000 } })
    // instrument term larger than the scene: no reading
    const none = [300, 0.9, 300, 400, 0.2]
    expect(exact(none)).toBeNaN()
    expect(fast(none)).toBeNaN()
    // a reading above 5000 K: both throw with the same field
    const hot = [4990, 1, 300, 300, 0.5]
    const fieldOf = (f: () => unknown): string | undefined => {
      try {
        f()
      } catch (e) {
        return (e as EngineInputError).field
      }
      return undefined
    }
    expect(fieldOf(() => exact(hot))).toBe('sourceTemperatureK')
    expect(fieldOf(() => fast(hot))).toBe('sourceTemperatureK')
  })

  it('a rectangular band, or a range outside 50–5000 K, keeps the exact model', () => {
    const x = [373.15, 0.95, 296.15, 297.15, 0.97]
    expect(readingModel(LW, undefined, { temperatureRangeK: { min: 250, max: 500 } })(x)).toBe(readingModel(LW)(x))
    expect(readingModel(DEMO33, undefined, { temperatureRangeK: { min: 6000, max: 7000 } })(x)).toBe(readingModel(DEMO33)(x))
  })

  it('chunks run on separate models (as on worker threads) join into exactly one run', () => {
    // each bin's panels depend only on the band and the bin, not on which temperatures came first
    const inputs: MonteCarloInput[] = [
      { name: 'T_s', distribution: 'normal', value: 773.15, standardUncertainty: 2 },
      { name: 'ε_s', distribution: 'rectangular', value: 0.9, halfWidth: 0.02 },
      { name: 'T_w', distribution: 'rectangular', value: 296.15, halfWidth: 3 },
      { name: 'T_d', distribution: 'rectangular', value: 300.15, halfWidth: 3 },
      { name: 'ε_i', distribution: 'constant', value: 0.95 },
    ]
    const model = (): ((x: ArrayLike<number>) => number) => readingModel(DEMO33, undefined, { temperatureRangeK: { min: 50, max: 5000 } })
    const whole = runMonteCarloChunk(model(), inputs, 3, 0, 3000)
    const second = runMonteCarloChunk(model(), inputs, 3, 1700, 3000) // built from the other end first
    const first = runMonteCarloChunk(model(), inputs, 3, 0, 1700)
    expect(Array.from(first).concat(Array.from(second))).toEqual(Array.from(whole))
  })

  it('a Monte Carlo run gives the same summary as the exact model (JCGM 101 trials, same seed)', () => {
    const inputs: MonteCarloInput[] = [
      { name: 'T_s', distribution: 'normal', value: 373.15, standardUncertainty: 0.5 },
      { name: 'ε_s', distribution: 'rectangular', value: 0.95, halfWidth: 0.01 },
      { name: 'T_w', distribution: 'rectangular', value: 296.15, halfWidth: 2 },
      { name: 'T_d', distribution: 'triangular', value: 296.15, halfWidth: 2 },
      { name: 'ε_i', distribution: 'constant', value: 0.95 },
    ]
    const exact = runMonteCarlo(readingModel(DEMO33), inputs, { trials: 2000, seed: 11 })
    const fast = runMonteCarlo(readingModel(DEMO33, undefined, { temperatureRangeK: { min: 280, max: 390 } }), inputs, { trials: 2000, seed: 11 })
    expect(Math.abs(fast.mean - exact.mean)).toBeLessThan(1e-9)
    expect(Math.abs(fast.standardUncertainty - exact.standardUncertainty)).toBeLessThan(1e-9)
    expect(Math.abs(fast.coverageInterval.low - exact.coverageInterval.low)).toBeLessThan(1e-8)
    expect(Math.abs(fast.coverageInterval.high - exact.coverageInterval.high)).toBeLessThan(1e-8)
  })
})
