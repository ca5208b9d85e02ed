import { describe, expect, it } from 'vitest'
import { bandRadiance, bandRadianceDerivative, bandRadianceQuadrature, CODATA_2018, ITS_90, type Band } from '../../../shared/radiometry'
import {
  bandIntegral3,
  bandIntegral3WithBracket,
  boundaryTerm4,
  incomplete3,
  lowerIntegral3,
  PANEL_SWITCH_X,
  upperIntegral3,
} from '../../../shared/radiometry/bandIntegral'
import { rectangularRadiance, rectangularRadianceAndDerivativeSeries, rectangularRadianceSeries } from '../../../shared/radiometry/planck'
import { headPow3, tailExp3, Z3 } from '../../../shared/radiometry/series'

// Independent reference for band radiance, written here: the plain Planck formula with the exact SI
// constants (SI Brochure 2019) integrated by composite Gauss–Legendre quadrature, 20 nodes per
// sub-interval (nodes by Newton's method on the Legendre recurrence, the common textbook routine),
// sub-intervals doubled until two estimates agree to 2e-15.
const H = 6.62607015e-34
const C = 299792458
const K = 1.380649e-23
function planckPerUm(lUm: number, T: number, c2 = (H * C) / K): number {
  const lm = lUm * 1e-6
  return ((2 * H * C * C) / lm ** 5 / Math.expm1(c2 / (lm * T))) * 1e-6
}
const GL_N = 20
const [GL_X, GL_W] = ((): [number[], number[]] => {
  const x: number[] = []
  const w: number[] = []
  for (let i = 1; i <= GL_N; i++) {
    let z = Math.cos((Math.PI * (i - 0.25)) / (GL_N + 0.5))
    let dp = 0
    for (let it = 0; it < 100; it++) {
      let p0 = 1
      let p1 = z
      for (let k = 2; k <= GL_N; k++) {
        const p2 = ((2 * k - 1) * z * p1 - (k - 1) * p0) / k
        p0 = p1
        p1 = p2
      }
      dp = (GL_N * (z * p1 - p0)) / (z * z - 1)
      const dz = p1 / dp
      z -= dz
      if (Math.abs(dz) < 1e-16) break
    }
    x.push(z)
    w.push(2 / ((1 - z * z) * dp * dp))
  }
  return [x, w]
})()
function gaussLegendre(f: (l: number) => number, a: number, b: number, m: number): number {
  const h = (b - a) / m
  let s = 0
  for (let j = 0; j < m; j++) {
    const mid = a + (j + 0.5) * h
    let t = 0
    for (let i = 0; i < GL_N; i++) t += GL_W[i]! * f(mid + (h / 2) * GL_X[i]!)
    s += (t * h) / 2
  }
  return s
}
function referenceBand(l1: number, l2: number, T: number, c2?: number): number {
  const f = (l: number): number => planckPerUm(l, T, c2)
  let m = 4
  let prev = gaussLegendre(f, l1, l2, m)
  for (; m <= 4096; m *= 2) {
    const next = gaussLegendre(f, l1, l2, 2 * m)
    if (Math.abs(next - prev) <= 2e-15 * Math.abs(next)) return next
    prev = next
  }
  throw new Error(`reference quadrature did not converge for ${l1}–${l2} µm at ${T} K`)
}
const rel = (a: number, b: number): number => Math.abs(a - b) / Math.abs(b)
const rect = (lambda1Um: number, lambda2Um: number): Band => ({ kind: 'rectangular', lambda1Um, lambda2Um })

describe('piecewise-polynomial incomplete integrals', () => {
  it('match the Widger–Woodall and Bernoulli series within 2e-15 (relative) on 0 < x < 60', () => {
    // the series of ./series are the reference: their truncation is bounded analytically (< 1e-16)
    let worst = 0
    let worstLower = 0
    let worstUpper = 0
    for (let x = 1e-4; x < 60; x += 0.000913) {
      const lower = x < 3.5 ? headPow3(x) : Z3 - tailExp3(x)
      const upper = x < 3.5 ? Z3 - headPow3(x) : tailExp3(x)
      worst = Math.max(worst, rel(incomplete3(x), x < PANEL_SWITCH_X ? lower : upper))
      worstLower = Math.max(worstLower, rel(lowerIntegral3(x), lower))
      worstUpper = Math.max(worstUpper, rel(upperIntegral3(x), upper))
    }
    expect(worst).toBeLessThan(2e-15)
    expect(worstLower).toBeLessThan(2e-15)
    expect(worstUpper).toBeLessThan(2e-15)
  })

  it('keep full relative precision as x → 0: H(x) → x³/3 − x⁴/8 + x⁵/60 (Bernoulli numbers)', () => {
    for (const x of [1e-8, 1e-5, 1e-3, 0.01]) {
      expect(rel(lowerIntegral3(x), x ** 3 / 3 - x ** 4 / 8 + x ** 5 / 60 - x ** 7 / 5040)).toBeLessThan(2e-15)
    }
  })

  it('the boundary term x⁴/(eˣ − 1) matches the direct formula within 2e-15', () => {
    let worst = 0
    for (let x = 1e-5; x < 80; x += 0.00077) worst = Math.max(worst, rel(boundaryTerm4(x), x ** 4 / Math.expm1(x)))
    expect(worst).toBeLessThan(2e-15)
    expect(boundaryTerm4(800)).toBe(0)
  })

  it('band integral: whole range gives π⁴/15; adjacent intervals add', () => {
    expect(rel(bandIntegral3(5e3, 1e-9), Z3)).toBeLessThan(1e-15)
    for (const [a, m, b] of [[9, 5, 0.7], [50, 3.2, 2.9], [2.5, 1.1, 0.2], [45, 41, 39]] as const) {
      expect(rel(bandIntegral3(a, m) + bandIntegral3(m, b), bandIntegral3(a, b))).toBeLessThan(4e-15)
    }
    const out = new Float64Array(2)
    bandIntegral3WithBracket(7, 4, out)
    expect(out[0]).toBe(bandIntegral3(7, 4))
  })
})

describe('rectangular band radiance over 50–5000 K and 0.65–14 µm', () => {
  const bands: [number, number][] = [
    [0.645, 0.655], [0.64, 0.66], [0.65, 0.95], [0.95, 1.05], [1.5, 1.7], [2, 2.4], [3.8, 4], [4.8, 5.2], [8, 9], [8, 14], [0.65, 14],
  ]
  const temps = [50, 65, 80, 100, 150, 200, 273.15, 300, 400, 600, 900, 1234.93, 1500, 2000, 3000, 4000, 5000]

  it('agrees with independent Gauss–Legendre quadrature of the Planck formula within 1e-13', () => {
    let worst = 0
    let compared = 0
    for (const [l1, l2] of bands) {
      for (const T of temps) {
        const ref = referenceBand(l1, l2, T)
        if (!(ref > 1e-290)) continue
        const r = rel(bandRadiance(rect(l1, l2), T), ref)
        expect(r, `${l1}–${l2} µm at ${T} K`).toBeLessThan(2e-13)
        worst = Math.max(worst, r)
        compared++
      }
    }
    // every reference is representable (the smallest, 0.645–0.655 µm at 50 K, is ~1e-182), so the guard must
    // skip none
    expect(compared).toBe(bands.length * temps.length)
    expect(worst).toBeLessThan(2e-13)
  })

  it('agrees with scipy.integrate.quad within 1e-12', () => {
    // printed by tests/reference/band_radiance_scipy.py (scipy 1.17.1, scipy.integrate.quad,
    // epsabs=0, epsrel=1e-13, limit=200; CODATA 2018 constants): [λ1 µm, λ2 µm, T K, S, quad's error]
    const rows: [number, number, number, number, number][] = [
      [0.645, 0.655, 80.0, 1.3299505572295337e-113, 1.5e-127],
      [0.645, 0.655, 1234.93, 0.1688880085077172, 1.9e-15],
      [0.645, 0.655, 5000.0, 124148.89468914714, 1.4e-09],
      [0.95, 1.05, 300.0, 3.3031509870336225e-14, 3.7e-28],
      [0.95, 1.05, 2000.0, 8936.634809571293, 9.9e-11],
      [1.5, 1.7, 150.0, 8.348220834870503e-20, 9.3e-34],
      [1.5, 1.7, 1000.0, 283.0885005810804, 3.1e-12],
      [2.0, 2.4, 500.0, 2.0457127148600964, 2.3e-14],
      [3.8, 4.0, 900.0, 445.2244191470705, 4.9e-12],
      [8.0, 14.0, 50.0, 2.0740841693910985e-07, 2.3e-21],
      [8.0, 14.0, 273.15, 35.151961968050166, 3.9e-13],
      [8.0, 14.0, 373.15, 136.77833909360862, 1.5e-12],
      [8.0, 14.0, 5000.0, 18835.31756870269, 2.1e-10],
      [0.65, 14.0, 60.0, 7.888530191207955e-06, 8.8e-20],
      [0.65, 14.0, 3000.0, 1372807.300687735, 1.5e-08],
    ]
    for (const [l1, l2, T, S] of rows) expect(rel(bandRadiance(rect(l1, l2), T), S), `${l1}–${l2} µm at ${T} K`).toBeLessThan(1e-12)
  })

  it('uses the chosen c2 (ITS-90) consistently with the reference', () => {
    for (const T of [600, 1337.33, 3000]) {
      expect(rel(bandRadiance(rect(0.64, 0.66), T, 'ITS-90'), referenceBand(0.64, 0.66, T, 0.014388))).toBeLessThan(1e-13)
    }
  })

  it('agrees with the adaptive Gauss–Kronrod cross-check at 1e-12', () => {
    for (const [l1, l2] of [[0.645, 0.655], [1.5, 1.7], [8, 14]] as const) {
      for (const T of [80, 500, 2500]) {
        const q = bandRadianceQuadrature(rect(l1, l2), T, { relativeTolerance: 1e-12 })
        expect(q.converged).toBe(true)
        expect(rel(bandRadiance(rect(l1, l2), T), q.value)).toBeLessThan(2e-12)
      }
    }
  })

  it('agrees with the previous series evaluator within 3e-14 (value) and 1e-13 (dS/dT)', () => {
    const a = new Float64Array(2)
    const b = new Float64Array(2)
    let cases = 0
    let compared = 0
    for (const [l1, l2] of bands) {
      for (let T = 50; T <= 5000; T *= 1.013) {
        for (const c of [CODATA_2018, ITS_90]) {
          cases++
          const s = rectangularRadianceSeries(l1, l2, T, c)
          if (!(s > 1e-290)) continue
          expect(rel(rectangularRadiance(l1, l2, T, c), s)).toBeLessThan(3e-14)
          rectangularRadianceAndDerivativeSeries(l1, l2, T, c, a)
          b[1] = bandRadianceDerivative(rect(l1, l2), T, c)
          expect(rel(b[1], a[1]!)).toBeLessThan(1e-13)
          compared++
        }
      }
    }
    // every value here is representable (≥ ~1e-182), so the guard must skip none: a series that answered NaN
    // or 0 would otherwise leave its cases silently uncompared
    expect(cases).toBe(bands.length * 2 * 357)
    expect(compared).toBe(cases)
  })

  it('the fast path still rejects bad bands and temperatures with the field at fault', () => {
    const field = (f: () => unknown): string | undefined => {
      try {
        f()
      } catch (e) {
        return (e as { field?: string }).field
      }
      return undefined
    }
    expect(field(() => bandRadiance(rect(14, 8), 300))).toBe('band.lambda2Um')
    expect(field(() => bandRadiance({ kind: 'rectangular', lambda1Um: '8', lambda2Um: 14 } as unknown as Band, 300))).toBe('band.lambda1Um')
    expect(field(() => bandRadiance(rect(8, 14), '300' as unknown as number))).toBe('temperatureK')
    expect(field(() => bandRadianceDerivative(rect(8, Number.NaN), 300))).toBe('band.lambda2Um')
    expect(field(() => bandRadianceDerivative(rect(8, 14), -1))).toBe('temperatureK')
    expect(field(() => bandRadiance(rect(8, 14), 300, 'ITS-68' as never))).toBe('constants')
  })
})
