import { describe, expect, it } from 'vitest'
import {
  bandRadiance,
  EngineInputError,
  fitSakumaHattori,
  sakumaHattoriFromBand,
  sakumaHattoriSignal,
  sakumaHattoriTemperature,
  temperatureFromRadiance,
  type Band,
} from '../../../shared/radiometry'

const C2UM = ((6.62607015e-34 * 299792458) / 1.380649e-23) * 1e6 // hc/k in µm·K, exact SI constants (CODATA 2018)

describe('Sakuma–Hattori equation', () => {
  it('signal and inverse are each other’s inverse, and follow the published form', () => {
    // Sakuma & Hattori 1982: S = C/(exp(c2/(AT + B)) − 1); T = c2/(A ln(C/S + 1)) − B/A
    const p = { A: 0.6495, B: 0.57, C: 2.05e7 }
    for (const T of [700, 1000, 1337.33, 2500]) {
      const S = sakumaHattoriSignal(p, T)
      expect(S).toBeCloseTo(p.C / Math.expm1(C2UM / (p.A * T + p.B)), 12)
      expect(Math.abs(sakumaHattoriTemperature(p, S) - T)).toBeLessThan(1e-9)
    }
  })

  it('band estimate: A = λ0(1 − 6σ²/λ0²), B = c2σ²/(2λ0²) (Saunders & White 2003, from memory)', () => {
    const e = sakumaHattoriFromBand({ kind: 'rectangular', lambda1Um: 0.64, lambda2Um: 0.66 })
    const sd2 = 0.02 ** 2 / 12
    expect(e.A).toBeCloseTo(0.65 * (1 - (6 * sd2) / 0.65 ** 2), 12)
    expect(e.B).toBeCloseTo((C2UM * sd2) / (2 * 0.65 ** 2), 9)
  })

  it('band estimate approximates the band well (narrow band, Wien regime)', () => {
    // check against this engine's exact band radiance: the estimate is a second-order approximation
    const band: Band = { kind: 'rectangular', lambda1Um: 0.64, lambda2Um: 0.66 }
    const e = sakumaHattoriFromBand(band)
    for (const T of [800, 1200, 1800]) {
      const S = bandRadiance(band, T)
      expect(Math.abs(sakumaHattoriTemperature(e, S) - T)).toBeLessThan(0.01)
    }
  })

  it('a fit to three points of a narrow band interpolates other temperatures to well under 1 mK', () => {
    const band: Band = { kind: 'rectangular', lambda1Um: 0.64, lambda2Um: 0.66 }
    const pts = [1000, 1200, 1400].map((T) => ({ temperatureK: T, signal: bandRadiance(band, T) }))
    const f = fitSakumaHattori(pts)
    expect(f.converged).toBe(true)
    expect(f.residuals).toHaveLength(3)
    for (const r of f.residuals) expect(Math.abs(r.temperatureResidualK)).toBeLessThan(1e-8)
    for (const T of [1050, 1100, 1300, 1350]) {
      expect(Math.abs(sakumaHattoriTemperature(f, bandRadiance(band, T)) - T)).toBeLessThan(1e-3)
    }
    // the fitted A is close to the band estimate
    expect(Math.abs(f.A - sakumaHattoriFromBand(band).A)).toBeLessThan(1e-3)
  })

  it('recovers known parameters from exact data (least squares, 6 points)', () => {
    const truth = { A: 1.55, B: 3.2, C: 4.0e6 }
    const pts = [500, 650, 800, 1000, 1200, 1500].map((T) => ({ temperatureK: T, signal: sakumaHattoriSignal(truth, T) }))
    const f = fitSakumaHattori(pts)
    expect(Math.abs(f.A / truth.A - 1)).toBeLessThan(1e-7)
    expect(Math.abs(f.B - truth.B)).toBeLessThan(1e-4)
    expect(Math.abs(f.C / truth.C - 1)).toBeLessThan(1e-6)
    expect(f.rmsLogResidual).toBeLessThan(1e-10)
  })

  it('fits a wide 8–14 µm band from a band start and reports residuals', () => {
    const band: Band = { kind: 'rectangular', lambda1Um: 8, lambda2Um: 14 }
    const temps = [253.15, 273.15, 323.15, 373.15, 423.15, 473.15]
    const pts = temps.map((T) => ({ temperatureK: T, signal: bandRadiance(band, T) }))
    const f = fitSakumaHattori(pts, { band })
    expect(f.residuals).toHaveLength(6)
    // the interpolation equation describes a wide band to ~0.05 K over this range (checked here
    // against the engine's exact inversion)
    for (const T of [263.15, 300, 400, 450]) {
      const S = bandRadiance(band, T)
      expect(Math.abs(sakumaHattoriTemperature(f, S) - temperatureFromRadiance(band, S))).toBeLessThan(0.05)
    }
  })

  it('rejects too few points and bad values', () => {
    const field = (fn: () => unknown): string => {
      try {
        fn()
      } catch (e) {
        expect(e).toBeInstanceOf(EngineInputError)
        return (e as EngineInputError).field
      }
      return 'no error'
    }
    expect(field(() => fitSakumaHattori([{ temperatureK: 300, signal: 1 }, { temperatureK: 400, signal: 2 }]))).toBe('points')
    expect(field(() => fitSakumaHattori([{ temperatureK: 300, signal: 1 }, { temperatureK: 300, signal: 1 }, { temperatureK: 400, signal: 2 }]))).toBe('points')
    expect(field(() => fitSakumaHattori([{ temperatureK: 300, signal: 1 }, { temperatureK: 400, signal: -2 }, { temperatureK: 500, signal: 3 }]))).toBe('points[1].signal')
    expect(field(() => fitSakumaHattori([{ temperatureK: 0, signal: 1 }, { temperatureK: 400, signal: 2 }, { temperatureK: 500, signal: 3 }]))).toBe('points[0].temperatureK')
    expect(field(() => sakumaHattoriTemperature({ A: 1, B: 0, C: 1 }, 0))).toBe('signal')
    expect(field(() => sakumaHattoriSignal({ A: -1, B: 0, C: 1 }, 300))).toBe('parameters.A')
  })
})
