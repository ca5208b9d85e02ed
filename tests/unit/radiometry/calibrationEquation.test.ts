import { describe, expect, it } from 'vitest'
import {
  bandRadiance,
  calibrationEquationAtReading,
  calibrationEquationAtReference,
  EngineInputError,
  fitCalibrationEquation,
  temperatureFromRadiance,
  type Band,
  type CalibrationEquation,
  type CalibrationEquationInput,
  type CalibrationPointInput,
} from '../../../shared/radiometry'

const pt = (T: number, R: number, U: number, k: number): CalibrationPointInput => ({ referenceTemperatureK: T, readingK: R, expandedUncertaintyK: U, coverageFactor: k })
const rel = (a: number, b: number): number => Math.abs(a - b) / Math.abs(b)

// Illustrative as-left points of a 0.8–1.0 µm pyrometer (inputs only; the expected values below come
// from the scipy script).
const BAND: Band = { kind: 'rectangular', lambda1Um: 0.8, lambda2Um: 1.0 }
const R5 = [872.4, 1072.1, 1271.65, 1471.2, 1670.9]
const T5 = [873.15, 1073.15, 1273.15, 1473.15, 1673.15]
const U5 = [1.6, 2.0, 2.4, 3.0, 3.6]
const K5 = [2, 2, 2.1, 2, 2.2]
const P5 = R5.map((r, i) => pt(T5[i]!, r, U5[i]!, K5[i]!))

interface Ref {
  parameters: number[]
  covariance: number[][]
  chi2: number
  atReading: [number, number, number][]
  atReference: [number, number, number][]
}

// Printed by tests/reference/calibration_equation.py (numpy 2.4.6, scipy 1.17.1): the straight line by
// numpy.polyfit(R, T, 1, w=1/u, cov='unscaled'); the Sakuma–Hattori form by
// scipy.optimize.curve_fit(sigma=u or the 2-D covariance D·K·D, absolute_sigma=True, method='lm',
// xtol=ftol=gtol=1e-15) in (A, B, ln C), covariance transformed to (A, B, C); values at a reading
// [R, T, u] with u = √(gᵀVg); at a reference temperature [T, R, u] with R by scipy.optimize.brentq
// (xtol=1e-13) and u = √(gᵀVg)/|df/dR|.
const SCIPY: Record<string, Ref> = {
  line5: {
    parameters: [9.340294919062e-01, 9.982954960731e-01],
    covariance: [[2.5267510819e-01, -6.7049206604e-04], [-6.7049206604e-04, 1.8305818240e-06]],
    chi2: 3.1936813236e-01,
    atReading: [[300, 300.422678314, 1.230131405e-01], [333.3, 333.665918333, 9.530162566e-02], [420, 420.218137843, 1.112492988e-01], [500, 500.081777528, 1.995707848e-01]],
    atReference: [[310, 309.593674141, 1.140933549e-01], [480, 479.883934559, 1.755718364e-01]],
  },
  sh5: {
    parameters: [8.765686077420e-01, 3.017354556044e+01, 9.963913199037e-01],
    covariance: [
      [2.9860630238e-04, -1.6984602268e-01, -2.1954297733e-03],
      [-1.6984602268e-01, 9.7656421766e+01, 1.2374731051e+00],
      [-2.1954297733e-03, 1.2374731051e+00, 1.6288685538e-02],
    ],
    chi2: 6.0622331824e-03,
    atReading: [[872.4, 873.135582141, 7.757013279e-01], [950, 950.875026612, 5.971270526e-01], [1173.15, 1174.440851715, 7.657554945e-01], [1400, 1401.736131679, 7.879304970e-01], [1670.9, 1673.197653898, 1.494361279e+00]],
    atReference: [[900, 899.216530462, 6.882162080e-01], [1173.15, 1171.861612284, 7.632936153e-01], [1600, 1597.856938130, 1.124872808e+00]],
  },
  sh5corr: {
    parameters: [8.765689837951e-01, 3.017377166835e+01, 9.963959798261e-01],
    covariance: [
      [1.7921239754e-04, -1.0187900120e-01, -1.3166741744e-03],
      [-1.0187900120e-01, 5.8611332690e+01, 7.4284774047e-01],
      [-1.3166741744e-03, 7.4284774047e-01, 9.7807253537e-03],
    ],
    chi2: 1.0100777737e-02,
    atReading: [[872.4, 873.134714928, 7.851536278e-01], [950, 950.874084121, 7.180806049e-01], [1173.15, 1174.439673544, 9.073449666e-01], [1400, 1401.734684701, 1.040971408e+00], [1670.9, 1673.195847346, 1.564727573e+00]],
    atReference: [[900, 899.217421704, 7.442927396e-01], [1173.15, 1171.862786769, 9.044737813e-01], [1600, 1597.858640027, 1.320225929e+00]],
  },
  sh3: {
    parameters: [8.775678313611e-01, 2.958159597870e+01, 9.897752084593e-01],
    covariance: [
      [5.5442224676e-04, -3.1830757045e-01, -3.9226208351e-03],
      [-3.1830757045e-01, 1.8388843306e+02, 2.2388284410e+00],
      [-3.9226208351e-03, 2.2388284410e+00, 2.7952989219e-02],
    ],
    chi2: 0,
    atReading: [[872.4, 873.15, 8.000000000e-01], [950, 950.860621437, 6.441249102e-01], [1173.15, 1174.370900410, 1.281340684e+00], [1400, 1401.651309237, 1.406390281e+00], [1670.9, 1673.15, 1.636363636e+00], [1072.1, 1073.15, 1.000000000e+00]],
    atReference: [[900, 899.212633222, 6.905506484e-01], [1173.15, 1171.931237286, 1.276515587e+00], [1600, 1597.920351186, 1.388838399e+00]],
  },
}

/** Compares a fit with a scipy reference: parameters to 1e-6 of their standard uncertainty (from scipy's
 * covariance, not the fit's own), covariance entries to 1e-6 relative (1e-10 digits printed), χ², values to
 * 1e-7 K and uncertainties to 1e-7 relative. */
function expectMatches(eq: CalibrationEquation, ref: Ref): void {
  expect(eq.converged).toBe(true)
  // as many parameters and covariance entries as the reference, so the loops below cannot run empty
  expect(eq.parameters).toHaveLength(ref.parameters.length)
  expect(eq.covariance.map(row => row.length)).toEqual(ref.covariance.map(row => row.length))
  eq.parameters.forEach((p, i) => expect(Math.abs(p - ref.parameters[i]!)).toBeLessThan(1e-6 * Math.sqrt(ref.covariance[i]![i]!)))
  eq.parameterStandardUncertainties.forEach((u, i) => expect(rel(u, Math.sqrt(ref.covariance[i]![i]!))).toBeLessThan(1e-6))
  eq.covariance.forEach((row, i) => row.forEach((v, j) => expect(rel(v, ref.covariance[i]![j]!)).toBeLessThan(1e-6)))
  expect(Math.abs(eq.chiSquared - ref.chi2)).toBeLessThan(1e-9 + 1e-6 * ref.chi2)
  for (const [r, t, u] of ref.atReading) {
    const v = calibrationEquationAtReading(eq, r)
    expect(Math.abs(v.referenceTemperatureK - t)).toBeLessThan(1e-7)
    expect(v.correctionK).toBeCloseTo(t - r, 7)
    expect(rel(v.standardUncertaintyK, u)).toBeLessThan(1e-7)
    expect(v.expandedUncertaintyK).toBe(2 * v.standardUncertaintyK)
  }
  for (const [t, r, u] of ref.atReference) {
    const v = calibrationEquationAtReference(eq, t)
    expect(Math.abs(v.readingK - r)).toBeLessThan(1e-7)
    expect(rel(v.standardUncertaintyK, u)).toBeLessThan(1e-6)
  }
}

describe('calibration equation: straight line (closed forms)', () => {
  it('three points, equal u: weighted least squares by hand', () => {
    // Points (R, T) = (400, 400.5), (500, 500.2), (600, 600.4), U = 1 K with k = 2, so u = 0.5 K, w = 1/u² = 4.
    // Closed form of the weighted straight line (e.g. ISO/TS 28037:2010, from memory; any regression text):
    //   S = Σw = 12, Sx = ΣwR = 6000, Sxx = ΣwR² = 3 080 000, Δ = S·Sxx − Sx² = 960 000
    //   b = Σ(R − R̄)(T − T̄)/Σ(R − R̄)² = (−100·−99.8667 + 100·100.0333)/20000 = 19990/20000 = 0.9995
    //   a = T̄ − b·R̄ = 500.36667 − 499.75 = 0.616667 (= 37/60)
    //   V = (1/Δ)·[[Sxx, −Sx], [−Sx, S]] = [[3.208333, −0.00625], [−0.00625, 1.25e-5]]
    //   residuals T − a − bR: +1/12, −1/6, +1/12 K; χ² = 4·(1/144 + 1/36 + 1/144) = 1/6
    //   u²(f(R)) = (Sxx − 2R·Sx + R²·S)/Δ = u²·(1/n + (R − R̄)²/Σ(R − R̄)²):
    //     at R = 500: 0.25·(1/3) → u = 0.5/√3 = 0.288675 K; at 600 (and 400): 0.25·(1/3 + 1/2) → u = 0.456435 K
    const eq = fitCalibrationEquation({ model: 'linear', points: [pt(400.5, 400, 1, 2), pt(500.2, 500, 1, 2), pt(600.4, 600, 1, 2)] })
    expect(eq.parameterNames).toEqual(['a', 'b'])
    expect(eq.parameters[0]).toBeCloseTo(37 / 60, 9)
    expect(eq.parameters[1]).toBeCloseTo(0.9995, 12)
    expect(eq.covariance[0]![0]).toBeCloseTo(3.08e6 / 960000, 9)
    expect(eq.covariance[0]![1]).toBeCloseTo(-6000 / 960000, 12)
    expect(eq.covariance[1]![0]).toBeCloseTo(-6000 / 960000, 12)
    expect(eq.covariance[1]![1]).toBeCloseTo(12 / 960000, 14)
    expect(eq.residuals.map((r) => r.residualK)).toEqual([expect.closeTo(1 / 12, 9), expect.closeTo(-1 / 6, 9), expect.closeTo(1 / 12, 9)])
    expect(eq.chiSquared).toBeCloseTo(1 / 6, 10)
    expect(eq.degreesOfFreedom).toBe(1)
    const mid = calibrationEquationAtReading(eq, 500)
    expect(mid.referenceTemperatureK).toBeCloseTo(500.2 / 3 + 400.5 / 3 + 600.4 / 3, 9)
    expect(mid.standardUncertaintyK).toBeCloseTo(0.5 / Math.sqrt(3), 10)
    expect(calibrationEquationAtReading(eq, 600).standardUncertaintyK).toBeCloseTo(0.5 * Math.sqrt(5 / 6), 10)
    expect(calibrationEquationAtReading(eq, 400).standardUncertaintyK).toBeCloseTo(0.5 * Math.sqrt(5 / 6), 10)
    // at a reference temperature the reading's u is u(f)/b (first order, b = 0.9995)
    const back = calibrationEquationAtReference(eq, mid.referenceTemperatureK)
    expect(back.readingK).toBeCloseTo(500, 9)
    expect(back.standardUncertaintyK).toBeCloseTo(0.5 / Math.sqrt(3) / 0.9995, 10)
  })

  it('two points (as many as parameters): the line interpolates and u follows from the points’ u only', () => {
    // (R, T) = (300, 300.3) with u1 = 0.2 K and (500, 500.8) with u2 = 0.4 K. The line through two points is
    // f(R) = T1·(R − R2)/(R1 − R2) + T2·(R − R1)/(R2 − R1), so by propagation (uncorrelated T1, T2)
    //   u²(f(R)) = ((R − R2)/(R1 − R2))²·u1² + ((R − R1)/(R2 − R1))²·u2²
    //   at R = 400: 0.25·0.04 + 0.25·0.16 = 0.05 → u = 0.223607 K; at R = 300: u = u1; at 500: u = u2.
    const eq = fitCalibrationEquation({ model: 'linear', points: [pt(300.3, 300, 0.4, 2), pt(500.8, 500, 0.8, 2)] })
    expect(eq.degreesOfFreedom).toBe(0)
    expect(eq.chiSquared).toBeLessThan(1e-20)
    expect(calibrationEquationAtReading(eq, 400).referenceTemperatureK).toBeCloseTo(400.55, 9)
    expect(calibrationEquationAtReading(eq, 400).standardUncertaintyK).toBeCloseTo(Math.sqrt(0.05), 10)
    expect(calibrationEquationAtReading(eq, 300).standardUncertaintyK).toBeCloseTo(0.2, 10)
    expect(calibrationEquationAtReading(eq, 500).standardUncertaintyK).toBeCloseTo(0.4, 10)
    // correlated points (ρ = 0.5): u²(400) = 0.25·0.04 + 0.25·0.16 + 2·0.5·0.5·0.5·0.2·0.4 = 0.07
    const c = fitCalibrationEquation({ model: 'linear', points: [pt(300.3, 300, 0.4, 2), pt(500.8, 500, 0.8, 2)], correlation: [[1, 0.5], [0.5, 1]] })
    expect(calibrationEquationAtReading(c, 400).standardUncertaintyK).toBeCloseTo(Math.sqrt(0.07), 10)
  })

  it('five points with unequal u match numpy.polyfit(w = 1/u, cov = "unscaled")', () => {
    const pts = [pt(300.42, 300, 0.3, 2), pt(350.31, 350, 0.3, 2), pt(400.35, 400, 0.4, 2), pt(450.12, 450, 0.5, 2), pt(500.05, 500, 0.6, 2)]
    expectMatches(fitCalibrationEquation({ model: 'linear', points: pts }), SCIPY.line5!)
  })
})

describe('calibration equation: Sakuma–Hattori form', () => {
  it('five uncorrelated points match scipy.optimize.curve_fit (absolute_sigma = True)', () => {
    const eq = fitCalibrationEquation({ points: P5, band: BAND })
    expect(eq.model).toBe('sakuma-hattori')
    expect(eq.parameterNames).toEqual(['A', 'B', 'C'])
    expect(eq.degreesOfFreedom).toBe(2)
    expectMatches(eq, SCIPY.sh5!)
  })

  it('five points with correlation 0.4 match curve_fit with the 2-D covariance D·K·D', () => {
    const K = R5.map((_, i) => R5.map((_, j) => (i === j ? 1 : 0.4)))
    expectMatches(fitCalibrationEquation({ points: P5, band: BAND, correlation: K }), SCIPY.sh5corr!)
  })

  it('three points: interpolates them, χ² = 0, and u at each point is that point’s u_i (pure propagation)', () => {
    const eq = fitCalibrationEquation({ points: [P5[0]!, P5[1]!, P5[4]!], band: BAND })
    expect(eq.degreesOfFreedom).toBe(0)
    expect(eq.chiSquared).toBeLessThan(1e-18)
    // the three points' u_i = U_i/k_i as given: 1.6/2, 2.0/2, 3.6/2.2 K
    const givenU = [0.8, 1.0, 3.6 / 2.2]
    expect(eq.residuals).toHaveLength(3)
    eq.residuals.forEach((r, i) => {
      expect(Math.abs(r.residualK)).toBeLessThan(1e-8)
      // with J square and invertible, gᵀ(JᵀWJ)⁻¹g at point i is exactly u_i² (algebra, JCGM 100 5.1.2)
      expect(rel(calibrationEquationAtReading(eq, r.readingK).standardUncertaintyK, givenU[i]!)).toBeLessThan(1e-8)
    })
    expectMatches(eq, SCIPY.sh3!)
  })

  it('a perfect instrument gives A = A_n, B = B_n, C = 1 and no correction anywhere', () => {
    const eq = fitCalibrationEquation({ points: T5.map((t) => pt(t, t, 2, 2)), band: BAND })
    // the nominal A, B are the band estimate of 0.8–1.0 µm (λ0 = 0.9 µm, σ² = 0.2²/12; see sakumaHattori.test.ts)
    const sd2 = 0.2 ** 2 / 12
    expect(eq.nominal!.A).toBeCloseTo(0.9 * (1 - (6 * sd2) / 0.9 ** 2), 12)
    expect(eq.nominal!.B).toBeCloseTo((((6.62607015e-34 * 299792458) / 1.380649e-23) * 1e6 * sd2) / (2 * 0.9 ** 2), 9)
    expect(eq.parameters[0]).toBeCloseTo(eq.nominal!.A, 9)
    expect(eq.parameters[1]).toBeCloseTo(eq.nominal!.B, 6)
    expect(eq.parameters[2]).toBeCloseTo(1, 9)
    for (const r of [873.15, 1000, 1234.5, 1673.15]) expect(Math.abs(calibrationEquationAtReading(eq, r).correctionK)).toBeLessThan(1e-8)
  })

  it('three points reproduce a gain error of the signal between the points (Planck band model)', () => {
    // An instrument whose signal is g·S(T) (S the exact band radiance of ./planck) but which reads with
    // S⁻¹ shows R(T) = S⁻¹(g·S(T)). The Sakuma–Hattori form through three points reproduces R(T) between
    // them to well under 1 mK (the reason it is recommended for interpolation; Saunders & White 2003,
    // from memory). Measured here: ≤ 0.08 mK (0.8–1.0 µm, 873–1673 K), ≤ 0.8 mK (8–14 µm, 273–573 K).
    const cases: [Band, number[], number][] = [
      [BAND, [873.15, 1273.15, 1673.15], 2e-4],
      [{ kind: 'rectangular', lambda1Um: 8, lambda2Um: 14 }, [273.15, 373.15, 573.15], 2e-3],
    ]
    for (const [band, Ts, tol] of cases) {
      for (const gain of [1.01, 0.97]) {
        const reading = (t: number): number => temperatureFromRadiance(band, gain * bandRadiance(band, t))
        const eq = fitCalibrationEquation({ points: Ts.map((t) => pt(t, reading(t), 1, 2)), band })
        const lo = Ts[0]!
        const hi = Ts[2]!
        for (let t = lo; t <= hi; t += (hi - lo) / 40) {
          const v = calibrationEquationAtReference(eq, t)
          expect(Math.abs(v.readingK - reading(t))).toBeLessThan(tol)
          expect(Math.abs(calibrationEquationAtReading(eq, v.readingK).referenceTemperatureK - t)).toBeLessThan(1e-9)
        }
      }
    }
  })
})

describe('calibration equation: validation and range', () => {
  const eq = fitCalibrationEquation({ points: P5, band: BAND })

  it('refuses to extrapolate, naming temperatureK; the ends of the range are accepted', () => {
    const field = (f: () => unknown): string => {
      try {
        f()
      } catch (e) {
        expect(e).toBeInstanceOf(EngineInputError)
        return (e as EngineInputError).field
      }
      return 'no error'
    }
    expect(field(() => calibrationEquationAtReading(eq, 872.4))).toBe('no error')
    expect(field(() => calibrationEquationAtReading(eq, 1670.9))).toBe('no error')
    expect(field(() => calibrationEquationAtReading(eq, 872.39))).toBe('temperatureK')
    expect(field(() => calibrationEquationAtReading(eq, 1671))).toBe('temperatureK')
    expect(field(() => calibrationEquationAtReading(eq, Number.NaN))).toBe('temperatureK')
    // reference range is [873.15, 1673.15], not the readings'
    expect(field(() => calibrationEquationAtReference(eq, 873.15))).toBe('no error')
    expect(field(() => calibrationEquationAtReference(eq, 873))).toBe('temperatureK')
    expect(field(() => calibrationEquationAtReference(eq, 1673.2))).toBe('temperatureK')
  })

  it('rejects bad inputs with the API field names', () => {
    const base: CalibrationEquationInput = { points: P5, band: BAND }
    const field = (patch: Partial<CalibrationEquationInput>): string => {
      try {
        fitCalibrationEquation({ ...base, ...patch })
      } catch (e) {
        expect(e).toBeInstanceOf(EngineInputError)
        return (e as EngineInputError).field
      }
      return 'no error'
    }
    const withPoint = (i: number, p: Partial<CalibrationPointInput>): CalibrationPointInput[] => P5.map((q, j) => (j === i ? { ...q, ...p } : q))
    expect(field({})).toBe('no error')
    expect(field({ points: P5.slice(0, 2) })).toBe('points')
    expect(field({ model: 'linear', points: P5.slice(0, 1) })).toBe('points')
    expect(field({ points: [P5[0]!, P5[0]!, P5[0]!, P5[1]!] })).toBe('points') // two distinct readings
    expect(field({ points: withPoint(2, { referenceTemperatureK: 0 }) })).toBe('points[2].referenceTemperatureK')
    expect(field({ points: withPoint(1, { readingK: Number.NaN }) })).toBe('points[1].readingK')
    expect(field({ points: withPoint(3, { expandedUncertaintyK: 0 }) })).toBe('points[3].expandedUncertaintyK')
    expect(field({ points: withPoint(4, { coverageFactor: -2 }) })).toBe('points[4].coverageFactor')
    expect(field({ model: 'cubic' as never })).toBe('model')
    expect(field({ band: undefined })).toBe('band')
    expect(field({ band: { kind: 'rectangular', lambda1Um: 1, lambda2Um: 0.8 } })).toBe('band.lambda2Um')
    expect(field({ coverageFactor: 0 })).toBe('coverageFactor')
    expect(field({ correlation: [[1, 0], [0, 1]] })).toBe('correlation')
    const K = (f: (i: number, j: number) => number): number[][] => R5.map((_, i) => R5.map((_, j) => f(i, j)))
    expect(field({ correlation: K((i, j) => (i === j ? 0.9 : 0)) })).toBe('correlation[0][0]')
    expect(field({ correlation: K((i, j) => (i === j ? 1 : i === 1 && j === 0 ? 0.3 : 0)) })).toBe('correlation[1][0]') // not symmetric
    expect(field({ correlation: K((i, j) => (i === j ? 1 : 1.2)) })).toBe('correlation[0][1]')
    expect(field({ correlation: K((i, j) => (i === j ? 1 : i + j === 1 ? 1 : 0)) })).toBe('correlation') // singular
    // the linear model needs no band
    expect(field({ model: 'linear', band: undefined })).toBe('no error')
  })
})
