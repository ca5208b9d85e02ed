import { describe, expect, it } from 'vitest'
import { readingModel, readingSensitivities, type Band } from '../../../shared/radiometry'
import {
  coverageFactor,
  EngineInputError,
  evaluateBudget,
  MC_BLOCK_SIZE,
  numericalTolerance,
  runMonteCarlo,
  runMonteCarloAsync,
  runMonteCarloChunk,
  splitTrials,
  summarizeMonteCarlo,
  validateGumResult,
  Xoshiro128,
  type MonteCarloInput,
} from '../../../shared/uncertainty'

const sum4 = (x: Float64Array): number => x[0]! + x[1]! + x[2]! + x[3]!

describe('xoshiro128** generator', () => {
  it('reproduces the reference algorithm from state {1, 2, 3, 4}', () => {
    // Blackman & Vigna, xoshiro128** 1.1 reference C code: the first three outputs from state
    // {1, 2, 3, 4}, worked by hand from the published algorithm: 11520, 0, 5927040
    const g = Xoshiro128.fromState(1, 2, 3, 4)
    expect([g.nextUint32(), g.nextUint32(), g.nextUint32()]).toEqual([11520, 0, 5927040])
  })

  it('gives uniform doubles in (0, 1) with the right mean and variance', () => {
    const g = new Xoshiro128(2024)
    const n = 200_000
    let s = 0
    let s2 = 0
    let min = 1
    let max = 0
    for (let i = 0; i < n; i++) {
      const u = g.nextDouble()
      s += u
      s2 += u * u
      if (u < min) min = u
      if (u > max) max = u
    }
    expect(min).toBeGreaterThan(0)
    expect(max).toBeLessThan(1)
    expect(Math.abs(s / n - 0.5)).toBeLessThan(5 * Math.sqrt(1 / 12 / n))
    expect(Math.abs(s2 / n - (s / n) ** 2 - 1 / 12)).toBeLessThan(0.002)
  })

  it('is reproducible for a seed and differs between seeds and streams', () => {
    const a = new Xoshiro128(7, 3)
    const b = new Xoshiro128(7, 3)
    const c = new Xoshiro128(8, 3)
    const d = new Xoshiro128(7, 4)
    const va = [a.nextUint32(), a.nextUint32()]
    expect([b.nextUint32(), b.nextUint32()]).toEqual(va)
    expect([c.nextUint32(), c.nextUint32()]).not.toEqual(va)
    expect([d.nextUint32(), d.nextUint32()]).not.toEqual(va)
  })
})

describe('samplers (JCGM 101 6.4)', () => {
  const moments = (input: MonteCarloInput, n = 200_000): { mean: number; variance: number; min: number; max: number; values: Float64Array } => {
    const v = runMonteCarloChunk((x) => x[0]!, [input], 99, 0, n)
    let s = 0
    let min = Infinity
    let max = -Infinity
    for (const x of v) {
      s += x
      if (x < min) min = x
      if (x > max) max = x
    }
    const mean = s / n
    let q = 0
    for (const x of v) q += (x - mean) ** 2
    return { mean, variance: q / (n - 1), min, max, values: v }
  }

  it('have the GUM variances: a²/3, a²/6, a²/2, σ², s²ν/(ν − 2), (δ/2)²/3', () => {
    // variances of the rectangular, triangular, arcsine, normal and scaled t distributions
    // (JCGM 101 6.4; textbook moments)
    const r = moments({ name: 'r', distribution: 'rectangular', value: 10, halfWidth: 2 })
    expect(Math.abs(r.variance / (4 / 3) - 1)).toBeLessThan(0.01)
    expect(r.min).toBeGreaterThanOrEqual(8)
    expect(r.max).toBeLessThanOrEqual(12)
    const t = moments({ name: 't', distribution: 'triangular', value: 0, halfWidth: 3 })
    expect(Math.abs(t.variance / (9 / 6) - 1)).toBeLessThan(0.01)
    expect(t.min).toBeGreaterThanOrEqual(-3)
    const u = moments({ name: 'u', distribution: 'u-shaped', value: 1, halfWidth: 0.5 })
    expect(Math.abs(u.variance / (0.25 / 2) - 1)).toBeLessThan(0.01)
    expect(u.max).toBeLessThanOrEqual(1.5)
    const nrm = moments({ name: 'n', distribution: 'normal', value: -4, standardUncertainty: 0.3 })
    expect(Math.abs(nrm.mean + 4)).toBeLessThan(5 * (0.3 / Math.sqrt(200_000)))
    expect(Math.abs(nrm.variance / 0.09 - 1)).toBeLessThan(0.01)
    const st = moments({ name: 's', distribution: 'student-t', value: 0, scale: 2, dof: 8 })
    expect(Math.abs(st.variance / ((4 * 8) / 6) - 1)).toBeLessThan(0.03)
    const res = moments({ name: 'd', distribution: 'resolution', value: 0, resolution: 0.1 })
    expect(Math.abs(res.variance / (0.01 / 12) - 1)).toBeLessThan(0.01)
    expect(res.max).toBeLessThanOrEqual(0.05)
  })

  it('normal: 95 % of values within ±1.96σ; Student t with ν = 1 (Cauchy) has quartiles ±1', () => {
    // standard normal quantile 1.959964; Cauchy quartiles are exactly ±1 (tan(π/4))
    const n = moments({ name: 'n', distribution: 'normal', value: 0, standardUncertainty: 1 }).values
    const inside = n.filter((x) => Math.abs(x) <= 1.959964).length / n.length
    expect(Math.abs(inside - 0.95)).toBeLessThan(0.003)
    const c = Float64Array.from(moments({ name: 'c', distribution: 'student-t', value: 0, scale: 1, dof: 1 }).values).sort()
    expect(Math.abs(c[Math.floor(c.length / 4)]! + 1)).toBeLessThan(0.02)
    expect(Math.abs(c[Math.floor((3 * c.length) / 4)]! - 1)).toBeLessThan(0.02)
  })
})

describe('chunked runs', () => {
  const inputs: MonteCarloInput[] = [
    { name: 'a', distribution: 'normal', value: 1, standardUncertainty: 0.1 },
    { name: 'b', distribution: 'rectangular', value: 2, halfWidth: 0.5 },
    { name: 'c', distribution: 'student-t', value: 0, scale: 1, dof: 3 },
    { name: 'd', distribution: 'u-shaped', value: 0, halfWidth: 1 },
  ]
  it('chunks concatenate to exactly one run, whatever the boundaries', () => {
    const whole = runMonteCarloChunk(sum4, inputs, 42, 0, 5000)
    const parts = [
      runMonteCarloChunk(sum4, inputs, 42, 0, 1500),
      runMonteCarloChunk(sum4, inputs, 42, 1500, 3333),
      runMonteCarloChunk(sum4, inputs, 42, 3333, 5000),
    ]
    const joined = new Float64Array(5000)
    let o = 0
    for (const p of parts) {
      joined.set(p, o)
      o += p.length
    }
    expect(Array.from(joined)).toEqual(Array.from(whole))
    expect(Array.from(runMonteCarloChunk(sum4, inputs, 43, 0, 10))).not.toEqual(Array.from(whole.subarray(0, 10)))
  })

  it('splitTrials covers [0, M) in block-aligned chunks; the sync, async and chunked runs agree', async () => {
    const ranges = splitTrials(100_000, 3)
    expect(ranges[0]![0]).toBe(0)
    expect(ranges[ranges.length - 1]![1]).toBe(100_000)
    for (let i = 1; i < ranges.length; i++) {
      expect(ranges[i]![0]).toBe(ranges[i - 1]![1])
      expect(ranges[i]![0] % MC_BLOCK_SIZE).toBe(0)
    }
    const progress: number[] = []
    const a = runMonteCarlo(sum4, inputs, { trials: 100_000, seed: 5, chunkTrials: 30_000, onProgress: (d) => progress.push(d) })
    const b = await runMonteCarloAsync(sum4, inputs, { trials: 100_000, seed: 5 })
    expect(b).toEqual(a)
    expect(progress).toEqual([30_000, 60_000, 90_000, 100_000])
    const joined = new Float64Array(100_000)
    for (const [s, e] of ranges) joined.set(runMonteCarloChunk(sum4, inputs, 5, s, e), s)
    const { seed: _seed, ...summary } = a
    expect(summarizeMonteCarlo(joined, 0.95)).toEqual(summary)
  })
})

describe('summary (JCGM 101 7.6, 7.7)', () => {
  it('takes the probabilistically symmetric interval from the order statistics', () => {
    // JCGM 101 7.7 (index rule as recalled): M = 1000, p = 0.95 → q = 950, r = 25 → [y(25), y(975)]
    const v = Float64Array.from({ length: 1000 }, (_, i) => 1000 - i) // values 1…1000, unsorted
    const s = summarizeMonteCarlo(v, 0.95)
    expect(s.coverageInterval).toEqual({ low: 25, high: 975 })
    expect(s.mean).toBe(500.5)
    expect(s.standardUncertainty).toBeCloseTo(Math.sqrt((1000 * 1001) / 12), 9) // variance of 1…n with n − 1: n(n+1)/12
  })

  it('finds the shortest interval for a skewed output', () => {
    const v = Float64Array.from({ length: 1000 }, (_, i) => (i + 1) ** 2)
    const s = summarizeMonteCarlo(v, 0.9)
    expect(s.shortestCoverageInterval.low).toBe(1)
    expect(s.shortestCoverageInterval.high).toBe(901 ** 2)
    expect(s.coverageInterval.low).toBeGreaterThan(1)
  })

  it('refuses NaN model values and bad options', () => {
    expect(() => runMonteCarlo(() => Number.NaN, [{ name: 'a', distribution: 'constant', value: 1 }], { trials: 10 })).toThrow(EngineInputError)
    const field = (f: () => unknown): string => {
      try {
        f()
      } catch (e) {
        expect(e).toBeInstanceOf(RangeError)
        return (e as EngineInputError).field
      }
      return 'no error'
    }
    const ok: MonteCarloInput[] = [{ name: 'a', distribution: 'normal', value: 0, standardUncertainty: 1 }]
    expect(field(() => runMonteCarlo(sum4, [{ name: 'a', distribution: 'poisson', value: 1 } as never]))).toBe('inputs[0].distribution')
    expect(field(() => runMonteCarlo(sum4, [{ name: 'a', distribution: 'rectangular', value: 1, halfWidth: -1 }]))).toBe('inputs[0].halfWidth')
    expect(field(() => runMonteCarlo(sum4, [{ name: 'a', distribution: 'student-t', value: 1, scale: 1, dof: 0 }]))).toBe('inputs[0].dof')
    expect(field(() => runMonteCarlo(sum4, [{ name: 'a', distribution: 'normal', value: Number.NaN, standardUncertainty: 1 }]))).toBe('inputs[0].value')
    expect(field(() => runMonteCarlo(sum4, []))).toBe('inputs')
    expect(field(() => runMonteCarlo(sum4, ok, { trials: 1 }))).toBe('trials')
    expect(field(() => runMonteCarlo(sum4, ok, { trials: 100, seed: -1 }))).toBe('seed')
    expect(field(() => runMonteCarlo(sum4, ok, { trials: 100, coverageProbability: 1.5 }))).toBe('coverageProbability')
  })
})

describe('JCGM 101 9.2 additive model Y = X1 + X2 + X3 + X4, and validation (JCGM 101 8)', () => {
  it('numerical tolerance δ = ½·10^ℓ from two significant digits of u(y)', () => {
    // JCGM 101 8.2 / 7.9.2: u(y) = 2 → 20 × 10⁻¹ → δ = 0.05 (the 9.2 example)
    expect(numericalTolerance(2)).toBeCloseTo(0.05, 15)
    expect(numericalTolerance(0.35)).toBeCloseTo(0.005, 15)
    expect(numericalTolerance(0.0996)).toBeCloseTo(0.005, 15)
    expect(numericalTolerance(2, 1)).toBeCloseTo(0.5, 15)
  })

  it('normal inputs: Monte Carlo agrees with the GUM (u = 2, ±3.92 at 95 %) and validates it', () => {
    // JCGM 101 9.2.2: Xi ~ N(0, 1) → GUM y = 0, u(y) = 2, 95 % interval ±3.92
    const inputs: MonteCarloInput[] = Array.from({ length: 4 }, (_, i) => ({ name: `X${i + 1}`, distribution: 'normal', value: 0, standardUncertainty: 1 }))
    const gum = evaluateBudget(inputs.map((x) => ({ name: x.name, standardUncertainty: 1, sensitivity: 1 })), { coverageProbability: 0.95 })
    expect(gum.combinedStandardUncertainty).toBe(2)
    expect(Math.abs(gum.expandedUncertainty - 3.92)).toBeLessThan(0.001)
    const mc = runMonteCarlo(sum4, inputs, { trials: 1_000_000, seed: 11 })
    expect(Math.abs(mc.mean)).toBeLessThan(0.01)
    expect(Math.abs(mc.standardUncertainty - 2)).toBeLessThan(0.01)
    expect(Math.abs(mc.coverageInterval.low + 3.92)).toBeLessThan(0.02)
    expect(Math.abs(mc.coverageInterval.high - 3.92)).toBeLessThan(0.02)
    const v = validateGumResult({ y: 0, U: gum.expandedUncertainty, u: gum.combinedStandardUncertainty }, mc.coverageInterval)
    expect(v.tolerance).toBeCloseTo(0.05, 15)
    expect(v.validated).toBe(true)
  })

  it('rectangular inputs: the interval is narrower than the GUM’s; exact value from the Irwin–Hall distribution', () => {
    // JCGM 101 9.2.3 (from memory: MCM interval ±3.88 against the GUM's ±3.92). Checked here exactly:
    // Xi = √3(2Ui − 1) so Y = 2√3(ΣUi − 2); ΣUi has the Irwin–Hall CDF F(x) = Σ (−1)^k C(4,k)(x−k)⁴/24.
    const F = (x: number): number => {
      let s = 0
      const C4 = [1, 4, 6, 4, 1]
      for (let k = 0; k <= Math.floor(x); k++) s += (-1) ** k * C4[k]! * (x - k) ** 4
      return s / 24
    }
    let lo = 2
    let hi = 4
    for (let i = 0; i < 100; i++) {
      const m = (lo + hi) / 2
      if (F(m) < 0.975) lo = m
      else hi = m
    }
    const exact = 2 * Math.sqrt(3) * (lo - 2)
    expect(exact.toFixed(2)).toBe('3.88')
    const inputs: MonteCarloInput[] = Array.from({ length: 4 }, (_, i) => ({ name: `X${i + 1}`, distribution: 'rectangular', value: 0, halfWidth: Math.sqrt(3) }))
    const mc = runMonteCarlo(sum4, inputs, { trials: 1_000_000, seed: 3 })
    expect(Math.abs(mc.standardUncertainty - 2)).toBeLessThan(0.01)
    expect(Math.abs(mc.coverageInterval.high - exact)).toBeLessThan(0.01)
    expect(Math.abs(mc.coverageInterval.low + exact)).toBeLessThan(0.01)
    const U = coverageFactor(null, 0.95) * 2
    // GUM ±3.92 vs ±3.88: d ≈ 0.04 — validated at n_dig = 2 (δ = 0.05), not at n_dig = 3 (δ = 0.005)
    expect(validateGumResult({ y: 0, U, u: 2 }, mc.coverageInterval, 2).validated).toBe(true)
    expect(validateGumResult({ y: 0, U, u: 2 }, mc.coverageInterval, 3).validated).toBe(false)
  })
})

describe('Monte Carlo of the reading model', () => {
  it('agrees with the GUM budget built from the analytic sensitivities (flat plate, 8–14 µm)', () => {
    // cross-check between the two methods on a near-linear model (JCGM 101 8: GUM validated)
    const band: Band = { kind: 'rectangular', lambda1Um: 8, lambda2Um: 14 }
    const base = { band, sourceTemperatureK: 373.15, sourceEmissivity: 0.95, reflectedTemperatureK: 296.15, instrumentTemperatureK: 296.15, emissivitySetting: 0.95 }
    const s = readingSensitivities(base)
    const inputs: MonteCarloInput[] = [
      { name: 'T_s', distribution: 'normal', value: 373.15, standardUncertainty: 0.025 },
      { name: 'ε_s', distribution: 'rectangular', value: 0.95, halfWidth: 0.01 },
      { name: 'T_w', distribution: 'rectangular', value: 296.15, halfWidth: 1 },
      { name: 'T_d', distribution: 'rectangular', value: 296.15, halfWidth: 1 },
      { name: 'ε_i', distribution: 'constant', value: 0.95 },
    ]
    const gum = evaluateBudget(
      [
        { name: 'T_s', standardUncertainty: 0.025, sensitivity: s.sourceTemperature },
        { name: 'ε_s', distribution: 'rectangular', halfWidth: 0.01, sensitivity: s.sourceEmissivity },
        { name: 'T_w', distribution: 'rectangular', halfWidth: 1, sensitivity: s.reflectedTemperature },
        { name: 'T_d', distribution: 'rectangular', halfWidth: 1, sensitivity: s.instrumentTemperature },
      ],
      { coverageProbability: 0.95 },
    )
    const mc = runMonteCarlo(readingModel(band), inputs, { trials: 200_000, seed: 17 })
    expect(Math.abs(mc.mean - 373.15)).toBeLessThan(0.01)
    expect(Math.abs(mc.standardUncertainty / gum.combinedStandardUncertainty - 1)).toBeLessThan(0.01)
  })
})
