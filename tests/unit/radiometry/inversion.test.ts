import { describe, expect, it } from 'vitest'
import {
  bandRadiance,
  EngineInputError,
  INVERSION_RANGE_K,
  prepareBand,
  spectralRadiance,
  temperatureFromRadiance,
  type Band,
} from '../../../shared/radiometry'

const bands: [string, Band][] = [
  ['0.65 µm narrow', { kind: 'rectangular', lambda1Um: 0.645, lambda2Um: 0.655 }],
  ['0.9–1.1 µm', { kind: 'rectangular', lambda1Um: 0.9, lambda2Um: 1.1 }],
  ['1.6 µm', { kind: 'rectangular', lambda1Um: 1.5, lambda2Um: 1.7 }],
  ['2.2 µm', { kind: 'rectangular', lambda1Um: 2.0, lambda2Um: 2.4 }],
  ['3.9 µm', { kind: 'rectangular', lambda1Um: 3.8, lambda2Um: 4.0 }],
  ['4.8–5.2 µm', { kind: 'rectangular', lambda1Um: 4.8, lambda2Um: 5.2 }],
  ['8–14 µm', { kind: 'rectangular', lambda1Um: 8, lambda2Um: 14 }],
  ['1 nm – 1 m (total radiance)', { kind: 'rectangular', lambda1Um: 1e-3, lambda2Um: 1e6 }],
  ['tabulated thermopile', { kind: 'tabulated', points: [[7.5, 0], [8, 0.4], [9, 0.95], [11, 1], [13, 0.9], [14, 0.3], [14.5, 0]] }],
  ['tabulated silicon', { kind: 'tabulated', points: [[0.55, 0.05], [0.62, 0.6], [0.65, 1], [0.68, 0.55], [0.75, 0]] }],
]

describe('temperature from band radiance', () => {
  it('round trip T → S → T within 1 µK for many bands and temperatures (50 K to 5000 K)', () => {
    const temps = [50, 77.3, 150, 273.15, 300, 373.15, 505.078, 933.473, 1234.93, 1337.33, 2000, 3000, 4500, 5000]
    let compared = 0
    for (const [name, b] of bands) {
      const p = prepareBand(b)
      for (const T of temps) {
        const S = bandRadiance(p, T)
        if (!(S > 1e-300)) continue // 0.65 µm at 50 K is ~1e-190: still representable; guard anyway
        const back = temperatureFromRadiance(p, S)
        expect(Math.abs(back - T), `${name} at ${T} K`).toBeLessThan(1e-6)
        // a plain (unprepared) band gives the same answer
        expect(Math.abs(temperatureFromRadiance(b, S) - T)).toBeLessThan(1e-6)
        compared++
      }
    }
    // every case is representable, so the guard must skip none (a band radiance of NaN or 0 would be skipped)
    expect(compared).toBe(bands.length * temps.length)
  })

  it('round trip with the ITS-90 c2, and the two constant sets give different temperatures', () => {
    const b: Band = { kind: 'rectangular', lambda1Um: 0.645, lambda2Um: 0.655 }
    for (const T of [1234.93, 1337.33, 1357.77, 2500]) {
      const S = bandRadiance(b, T, 'ITS-90')
      expect(Math.abs(temperatureFromRadiance(b, S, { constants: 'ITS-90' }) - T)).toBeLessThan(1e-6)
      // c2 differs by 1.6e-5 relative, so the temperatures differ by about that fraction of T (Wien limit)
      const other = temperatureFromRadiance(b, S)
      expect(Math.abs(other / T - 1 - (14387.768775 / 14388 - 1))).toBeLessThan(2e-7)
    }
  })

  it('converges from poor starting points without diverging', () => {
    const b: Band = { kind: 'rectangular', lambda1Um: 8, lambda2Um: 14 }
    const S = bandRadiance(b, 1000)
    for (const start of [50.0001, 60, 300, 4999, 4999.999]) {
      expect(Math.abs(temperatureFromRadiance(b, S, { initialTemperatureK: start }) - 1000)).toBeLessThan(1e-6)
    }
  })

  it('monochromatic limit: a very narrow band inverts like Planck at its centre', () => {
    // Planck's law inverted by hand: T = c2/(λ ln(1 + c1L λ⁻⁵ Δλ / S)) for Δλ → 0 (Wien/Planck identity)
    const b: Band = { kind: 'rectangular', lambda1Um: 0.65 - 1e-6, lambda2Um: 0.65 + 1e-6 }
    const S = spectralRadiance(0.65, 1337.33) * 2e-6
    expect(Math.abs(temperatureFromRadiance(b, S) - 1337.33)).toBeLessThan(1e-4)
  })

  it('rejects radiance outside the inversion range and bad values, naming the field', () => {
    const b: Band = { kind: 'rectangular', lambda1Um: 8, lambda2Um: 14 }
    const field = (f: () => unknown): string => {
      try {
        f()
      } catch (e) {
        expect(e).toBeInstanceOf(EngineInputError)
        return (e as EngineInputError).field
      }
      return 'no error'
    }
    expect(INVERSION_RANGE_K).toEqual({ min: 50, max: 5000 })
    expect(field(() => temperatureFromRadiance(b, bandRadiance(b, 5001)))).toBe('radiance')
    expect(field(() => temperatureFromRadiance(b, bandRadiance(b, 49.9)))).toBe('radiance')
    expect(field(() => temperatureFromRadiance(b, 0))).toBe('radiance')
    expect(field(() => temperatureFromRadiance(b, -1))).toBe('radiance')
    expect(field(() => temperatureFromRadiance(b, Number.NaN))).toBe('radiance')
    expect(field(() => temperatureFromRadiance(b, Number.POSITIVE_INFINITY))).toBe('radiance')
    expect(field(() => temperatureFromRadiance({ kind: 'rectangular', lambda1Um: 8, lambda2Um: 7 }, 10))).toBe('band.lambda2Um')
    expect(field(() => temperatureFromRadiance(b, 10, { minTemperatureK: 0 }))).toBe('minTemperatureK')
    expect(field(() => temperatureFromRadiance(b, 10, { minTemperatureK: 300, maxTemperatureK: 200 }))).toBe('maxTemperatureK')
    // the message states the range
    expect(() => temperatureFromRadiance(b, bandRadiance(b, 6000))).toThrow(/50 K to 5000 K/)
    // a custom range is honoured
    const S = bandRadiance(b, 6000)
    expect(Math.abs(temperatureFromRadiance(b, S, { maxTemperatureK: 8000 }) - 6000)).toBeLessThan(1e-5)
    expect(field(() => temperatureFromRadiance(b, bandRadiance(b, 250), { minTemperatureK: 260 }))).toBe('radiance')
  })
})
