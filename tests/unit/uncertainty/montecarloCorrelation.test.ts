// Correlated inputs (JCGM 101 6.4.8, Gaussian copula matched to Pearson r) and the adaptive procedure
// (JCGM 101 7.9) of the Monte Carlo engine.
import { describe, expect, it } from 'vitest'
import {
  compileInputs,
  EngineInputError,
  evaluateBudget,
  numericalTolerance,
  runMonteCarlo,
  runMonteCarloAsync,
  runMonteCarloChunk,
  summarizeMonteCarlo,
  type MonteCarloCorrelation,
  type MonteCarloInput,
} from '../../../shared/uncertainty'

/** Samples of the inputs over trials [0, M): one Float64Array per input. */
function draw(inputs: MonteCarloInput[], correlations: MonteCarloCorrelation[], M: number, seed = 7): Float64Array[] {
  const c = compileInputs(inputs, correlations)
  const cols = inputs.map(() => new Float64Array(M))
  let t = 0
  runMonteCarloChunk((x) => {
    for (let i = 0; i < cols.length; i++) cols[i]![t] = x[i]!
    t++
    return 0
  }, c, seed, 0, M)
  return cols
}
const mean = (v: Float64Array): number => v.reduce((a, b) => a + b, 0) / v.length
const variance = (v: Float64Array): number => {
  const m = mean(v)
  return v.reduce((a, b) => a + (b - m) ** 2, 0) / (v.length - 1)
}
const correlation = (a: Float64Array, b: Float64Array): number => {
  const ma = mean(a)
  const mb = mean(b)
  let s = 0
  for (let i = 0; i < a.length; i++) s += (a[i]! - ma) * (b[i]! - mb)
  return s / (a.length - 1) / Math.sqrt(variance(a) * variance(b))
}
// statistical tolerance of a sample correlation: 4 standard errors, SE ≈ (1 − r²)/√M (large-sample
// result for the bivariate normal; used here as the scale for the other marginals too)
const corrTol = (r: number, M: number): number => (4 * (1 - r * r)) / Math.sqrt(M)

// Reference values: tests/reference/copula_correlation.py (scipy 1.17: scipy.integrate.dblquad of
// g1(Z1)·g2(Z2) with scipy.stats quantile functions), pasted from its output.
// [marginal 1, marginal 2, rho* of the normals, Pearson correlation of the pair]
const COPULA: [string, string, number, number][] = [
  ['triangular', 'u-shaped', 0.6, 0.5719128175850713],
  ['rectangular', 't8', -0.8, -0.7685580784926147],
  ['u-shaped', 'u-shaped', 0.3, 0.2719289886461056],
  ['triangular', 'rectangular', 0.95, 0.9390183540553007],
]

const unit = (k: string): MonteCarloInput =>
  k === 't8' ? { name: k, distribution: 'student-t', value: 0, scale: 1, dof: 8 } : { name: k, distribution: k as 'rectangular', value: 0, halfWidth: 1 }

describe('correlated inputs (JCGM 101 6.4.8)', () => {
  const M = 200_000

  it('a normal pair is the bivariate normal: r* = r, sample correlation and marginals as stated', () => {
    const inputs: MonteCarloInput[] = [
      { name: 'a', distribution: 'normal', value: 10, standardUncertainty: 2 },
      { name: 'b', distribution: 'normal', value: -1, standardUncertainty: 0.5 },
    ]
    const corr: MonteCarloCorrelation[] = [{ between: [0, 1], coefficient: -0.7 }]
    expect(compileInputs(inputs, corr).copula!.pairs[0]!.normalCoefficient).toBe(-0.7)
    const [a, b] = draw(inputs, corr, M)
    expect(Math.abs(correlation(a!, b!) + 0.7)).toBeLessThan(corrTol(0.7, M))
    expect(Math.abs(mean(a!) - 10)).toBeLessThan((4 * 2) / Math.sqrt(M))
    expect(Math.abs(variance(b!) / 0.25 - 1)).toBeLessThan(4 * Math.sqrt(2 / M))
  })

  it('two rectangular inputs: r* = 2·sin(πr/6) (Pearson 1907 / Kruskal 1958, from memory), sample correlation r, marginals still rectangular', () => {
    const inputs: MonteCarloInput[] = [
      { name: 'a', distribution: 'rectangular', value: 0, halfWidth: 1 },
      { name: 'b', distribution: 'rectangular', value: 5, halfWidth: 0.2 },
    ]
    const corr: MonteCarloCorrelation[] = [{ between: [1, 0], coefficient: 0.5 }]
    expect(Math.abs(compileInputs(inputs, corr).copula!.pairs[0]!.normalCoefficient - 2 * Math.sin(Math.PI / 12))).toBeLessThan(1e-12)
    const [a, b] = draw(inputs, corr, M)
    expect(Math.abs(correlation(a!, b!) - 0.5)).toBeLessThan(corrTol(0.5, M))
    expect(b!.reduce((m, x) => Math.min(m, x), Infinity)).toBeGreaterThanOrEqual(4.8)
    expect(b!.reduce((m, x) => Math.max(m, x), -Infinity)).toBeLessThanOrEqual(5.2)
    expect(Math.abs(variance(a!) / (1 / 3) - 1)).toBeLessThan(0.01)
    // a rectangular marginal has a flat histogram: each tenth of the range holds 10 % (±4 SE of a proportion)
    const counts = new Array(10).fill(0)
    for (const x of a!) counts[Math.min(9, Math.floor((x + 1) * 5))]++
    for (const k of counts) expect(Math.abs(k / M - 0.1)).toBeLessThan(4 * Math.sqrt(0.09 / M))
  })

  it('a normal and a rectangular input: r* = r/√(3/π) (Stein: E[Z·(2Φ(Z) − 1)] = 1/√π); r = 1 is out of reach', () => {
    const inputs: MonteCarloInput[] = [
      { name: 'a', distribution: 'normal', value: 0, standardUncertainty: 1 },
      { name: 'b', distribution: 'rectangular', value: 0, halfWidth: 3 },
    ]
    const c = compileInputs(inputs, [{ between: [0, 1], coefficient: 0.9 }])
    expect(Math.abs(c.copula!.pairs[0]!.normalCoefficient - 0.9 / Math.sqrt(3 / Math.PI))).toBeLessThan(1e-12)
    const [a, b] = draw(inputs, [{ between: [0, 1], coefficient: 0.9 }], M)
    expect(Math.abs(correlation(a!, b!) - 0.9)).toBeLessThan(corrTol(0.9, M))
    // r = 0.99 exceeds √(3/π) = 0.977: refused, naming the coefficient
    expect(() => compileInputs(inputs, [{ between: [0, 1], coefficient: 0.99 }])).toThrow(EngineInputError)
    expect(() => compileInputs(inputs, [{ between: [0, 1], coefficient: 0.99 }])).toThrow(expect.objectContaining({ field: 'correlations[0].coefficient' }))
  })

  it('other marginals: the normal-scale r* reproduces scipy (dblquad) to 1e-9', () => {
    for (const [ka, kb, rs, r] of COPULA) {
      const c = compileInputs([unit(ka), unit(kb)], [{ between: [0, 1], coefficient: r }])
      expect(Math.abs(c.copula!.pairs[0]!.normalCoefficient - rs), `${ka}–${kb}`).toBeLessThan(1e-9)
    }
    // and the sample correlation of a triangular–U-shaped pair is the stated one
    const [a, b] = draw([unit('triangular'), unit('u-shaped')], [{ between: [0, 1], coefficient: 0.5719128175850713 }], M)
    expect(Math.abs(correlation(a!, b!) - 0.5719128175850713)).toBeLessThan(corrTol(0.57, M))
  })

  it('a linear model with correlated normal inputs: Monte Carlo u(y) equals the GUM u_c with the same r (GUM 5.2.2)', () => {
    // y = x0 + 2·x1 − x2, u = 1, 0.5, 0.8; r(0,1) = 0.6, r(1,2) = −0.3; for a linear model with normal
    // inputs the GUM law of propagation is exact (JCGM 101 9.2), so the two must agree within MC noise
    const inputs: MonteCarloInput[] = [
      { name: 'x0', distribution: 'normal', value: 1, standardUncertainty: 1 },
      { name: 'x1', distribution: 'normal', value: 2, standardUncertainty: 0.5 },
      { name: 'x2', distribution: 'normal', value: 3, standardUncertainty: 0.8 },
    ]
    const correlations: MonteCarloCorrelation[] = [{ between: [0, 1], coefficient: 0.6 }, { between: [1, 2], coefficient: -0.3 }]
    const gum = evaluateBudget(
      [
        { name: 'x0', standardUncertainty: 1, sensitivity: 1 },
        { name: 'x1', standardUncertainty: 0.5, sensitivity: 2 },
        { name: 'x2', standardUncertainty: 0.8, sensitivity: -1 },
      ],
      { correlations },
    )
    // hand: 1 + 1 + 0.64 + 2·0.6·1·1 + 2·(−0.3)·1·(−0.8) = 2.64 + 1.2 + 0.48 = 4.32
    expect(Math.abs(gum.combinedStandardUncertainty - Math.sqrt(4.32))).toBeLessThan(1e-14)
    const mc = runMonteCarlo((x) => x[0]! + 2 * x[1]! - x[2]!, inputs, { trials: M, seed: 3, correlations })
    expect(Math.abs(mc.standardUncertainty / gum.combinedStandardUncertainty - 1)).toBeLessThan(4 / Math.sqrt(2 * M))
    expect(Math.abs(mc.mean - 2)).toBeLessThan((4 * Math.sqrt(4.32)) / Math.sqrt(M))
    expect(mc.correlations).toEqual([
      { between: [0, 1], coefficient: 0.6, normalCoefficient: 0.6 },
      { between: [1, 2], coefficient: -0.3, normalCoefficient: -0.3 },
    ])
    // without correlations the result keeps its former shape
    expect('correlations' in runMonteCarlo((x) => x[0]!, inputs, { trials: 100, seed: 3 })).toBe(false)
  })

  it('keeps the chunk guarantee: trial i sees the same numbers whatever the chunking', async () => {
    const inputs: MonteCarloInput[] = [
      { name: 'a', distribution: 'normal', value: 1, standardUncertainty: 0.1 },
      { name: 'b', distribution: 'rectangular', value: 2, halfWidth: 0.5 },
      { name: 'c', distribution: 'student-t', value: 0, scale: 1, dof: 6 },
      { name: 'd', distribution: 'u-shaped', value: 0, halfWidth: 1 },
      { name: 'e', distribution: 'triangular', value: 0, halfWidth: 1 },
    ]
    const correlations: MonteCarloCorrelation[] = [{ between: [0, 3], coefficient: 0.4 }, { between: [2, 4], coefficient: -0.5 }, { between: [3, 4], coefficient: 0.2 }]
    const f = (x: Float64Array): number => x[0]! + 3 * x[1]! + x[2]! * x[3]! - x[4]!
    const c = compileInputs(inputs, correlations)
    const whole = runMonteCarloChunk(f, c, 42, 0, 5000)
    const joined = new Float64Array(5000)
    for (const [s, e] of [[0, 1500], [1500, 3333], [3333, 5000]] as const) joined.set(runMonteCarloChunk(f, inputs, 42, s, e, correlations), s)
    expect(Array.from(joined)).toEqual(Array.from(whole))
    const a = runMonteCarlo(f, inputs, { trials: 20_000, seed: 9, correlations, chunkTrials: 3000 })
    const b = await runMonteCarloAsync(f, inputs, { trials: 20_000, seed: 9, correlations })
    expect(b).toEqual(a)
  })

  it('rejects correlations it cannot sample, with field names', () => {
    const inputs: MonteCarloInput[] = [
      { name: 'a', distribution: 'normal', value: 0, standardUncertainty: 1 },
      { name: 'b', distribution: 'constant', value: 1 },
      { name: 'c', distribution: 'student-t', value: 0, scale: 1, dof: 3 },
      { name: 'd', distribution: 'normal', value: 0, standardUncertainty: 1 },
      { name: 'e', distribution: 'normal', value: 0, standardUncertainty: 1 },
    ]
    const field = (correlations: unknown): string => {
      try {
        compileInputs(inputs, correlations as MonteCarloCorrelation[])
      } catch (e) {
        expect(e).toBeInstanceOf(EngineInputError)
        return (e as EngineInputError).field
      }
      return 'no error'
    }
    expect(field([{ between: [0, 1], coefficient: 0.5 }])).toBe('correlations[0].between') // a constant
    expect(field([{ between: [0, 2], coefficient: 0.5 }])).toBe('correlations[0].between') // t with ν = 3
    expect(field([{ between: [0, 5], coefficient: 0.5 }])).toBe('correlations[0].between')
    expect(field([{ between: [0, 3], coefficient: -1.5 }])).toBe('correlations[0].coefficient')
    expect(field([{ between: [0, 3], coefficient: 0.9 }, { between: [0, 4], coefficient: 0.9 }, { between: [3, 4], coefficient: -0.9 }])).toBe('correlations')
    expect(field([{ between: [0, 3], coefficient: 1 }])).toBe('no error')
  })
})

describe('adaptive Monte Carlo (JCGM 101 7.9)', () => {
  const four: MonteCarloInput[] = [0, 1, 2, 3].map(i => ({ name: `x${i}`, distribution: 'normal', value: 0, standardUncertainty: 1 }) as MonteCarloInput)
  const sum4 = (x: Float64Array): number => x[0]! + x[1]! + x[2]! + x[3]!
  const sdOfMean = (v: number[]): number => {
    const m = v.reduce((a, b) => a + b, 0) / v.length
    return Math.sqrt(v.reduce((a, b) => a + (b - m) ** 2, 0) / (v.length * (v.length - 1)))
  }
  const criterion = (b: { mean: number[], standardUncertainty: number[], low: number[], high: number[] }, delta: number): boolean =>
    [b.mean, b.standardUncertainty, b.low, b.high].every(v => 2 * sdOfMean(v) <= delta)

  it('stops at the first batch count h where 2s ≤ δ for y, u(y), y_low and y_high, and reports the trials used', () => {
    const r = runMonteCarlo(sum4, four, { seed: 11, coverageProbability: 0.95, adaptive: true })
    const a = r.adaptive!
    // JCGM 101 7.9.4: M = max(J, 10⁴), J = ⌈100/(1 − 0.95)⌉ = 2000
    expect(a.batchTrials).toBe(10_000)
    expect(a.converged).toBe(true)
    expect(a.batches).toBeGreaterThanOrEqual(2)
    expect(r.trials).toBe(a.batches * a.batchTrials)
    // u(y) = 2 (sum of four N(0, 1)) → two significant digits 2.0 → δ = 0.05 (JCGM 101 7.9.2)
    expect(a.tolerance).toBe(numericalTolerance(r.standardUncertainty, 2))
    expect(a.tolerance).toBe(0.05)
    // the criterion, recomputed here from the batch results: met at h, not met at any earlier h ≥ 2
    expect(criterion(a.batchResults, a.tolerance)).toBe(true)
    for (let h = 2; h < a.batches; h++) {
      const first = { mean: a.batchResults.mean.slice(0, h), standardUncertainty: a.batchResults.standardUncertainty.slice(0, h), low: a.batchResults.low.slice(0, h), high: a.batchResults.high.slice(0, h) }
      const u = summarizeMonteCarlo(runMonteCarloChunk(sum4, four, 11, 0, h * a.batchTrials), 0.95).standardUncertainty
      expect(criterion(first, numericalTolerance(u, 2)), `h = ${h}`).toBe(false)
    }
    // batch r is trials [rM, (r + 1)M) of the seed; all batches together are one fixed run of h·M trials
    const b2 = summarizeMonteCarlo(runMonteCarloChunk(sum4, four, 11, a.batchTrials, 2 * a.batchTrials), 0.95)
    expect(a.batchResults.mean[1]).toBe(b2.mean)
    expect(a.batchResults.high[1]).toBe(b2.coverageInterval.high)
    const fixed = runMonteCarlo(sum4, four, { seed: 11, coverageProbability: 0.95, trials: r.trials })
    expect(r.coverageInterval).toEqual(fixed.coverageInterval)
    expect(r.standardUncertainty).toBe(fixed.standardUncertainty)
    // and the result is what the GUM gives for this linear model: u = 2, ±1.96·2 at 95 % within δ
    expect(Math.abs(r.coverageInterval.high - 3.919928)).toBeLessThan(a.tolerance)
  })

  it('stops at maxTrials without stabilisation and says so; batch size follows p', () => {
    const r = runMonteCarlo(sum4, four, { seed: 2, adaptive: { significantDigits: 4, maxTrials: 30_000 } })
    // four significant digits of u = 2 → δ = 0.0005: far beyond three batches of 10⁴
    expect(r.adaptive!.converged).toBe(false)
    expect(r.adaptive!.batches).toBe(3)
    expect(r.trials).toBe(30_000)
    // p = 0.999: J = ⌈100/0.001⌉ = 100 000 trials per batch
    const big = runMonteCarlo((x) => x[0]!, four, { seed: 2, coverageProbability: 0.999, adaptive: { maxTrials: 200_000, significantDigits: 1 } })
    expect(big.adaptive!.batchTrials).toBe(100_000)
  })

  it('rejects bad adaptive settings', () => {
    const field = (adaptive: unknown): string => {
      try {
        runMonteCarlo(sum4, four, { adaptive: adaptive as true })
      } catch (e) {
        expect(e).toBeInstanceOf(EngineInputError)
        return (e as EngineInputError).field
      }
      return 'no error'
    }
    expect(field({ significantDigits: 0 })).toBe('adaptive.significantDigits')
    expect(field({ batchTrials: 1 })).toBe('adaptive.batchTrials')
    expect(field({ batchTrials: 10_000, maxTrials: 15_000 })).toBe('adaptive.maxTrials')
    expect(field('yes')).toBe('adaptive')
  })
})
