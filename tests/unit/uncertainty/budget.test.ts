import { erf } from 'mathjs'
import { describe, expect, it } from 'vitest'
import {
  coverageFactor,
  EngineInputError,
  evaluateBudget,
  roundResult,
  standardUncertaintyOf,
  type BudgetComponent,
} from '../../../shared/uncertainty'

describe('coverage factor (Student t)', () => {
  it('reproduces GUM Table G.2 at p = 95.45 %', () => {
    // JCGM 100:2008 Table G.2, column p = 95.45 % (each entry is scipy.stats.t.ppf((1 + p)/2, ν) rounded to
    // two decimals: tests/reference/published_tables.py)
    const table: [number | null, number][] = [[1, 13.97], [2, 4.53], [3, 3.31], [4, 2.87], [5, 2.65], [10, 2.28], [20, 2.13], [50, 2.05], [null, 2.0]]
    for (const [nu, k] of table) expect(Math.abs(coverageFactor(nu, 0.9545) - k), `ν = ${nu}`).toBeLessThan(0.005)
  })

  it('Table G.2 at p = 99 %, 68.27 % and 95 %: the Student t quantiles computed by scipy, to 1e-12 relative', () => {
    // Printed by tests/reference/published_tables.py (scipy 1.17.1): t_p(ν) = scipy.stats.t.ppf((1 + p)/2, ν),
    // scipy.stats.norm.ppf((1 + p)/2) for ν = ∞. The same script checks that JCGM 100:2008 Table G.2's
    // entries (63.66, 3.17, 2.576, 1.84, 12.71, 1.960; quoted here before from memory) are these values
    // rounded to the table's digits. Columns: [ν (null = ∞), p, t_p(ν)].
    const SCIPY: [number | null, number, number][] = [
      [1, 0.99, 63.656741162871526],
      [10, 0.99, 3.16927267261695],
      [null, 0.99, 2.5758293035489004],
      [1, 0.6827, 1.837409429490547],
      [1, 0.95, 12.706204736174694],
      [null, 0.95, 1.959963984540054],
      // and the p = 95.45 % column above, unrounded
      [1, 0.9545, 13.96781148750255],
      [2, 0.9545, 4.526550760081986],
      [3, 0.9545, 3.306829920720108],
      [4, 0.9545, 2.8693151696963826],
      [5, 0.9545, 2.6486542542831177],
      [10, 0.9545, 2.28368161329964],
      [20, 0.9545, 2.133028361890896],
      [50, 0.9545, 2.0512507818518815],
      [null, 0.9545, 2.0000024438996027],
    ]
    for (const [nu, p, k] of SCIPY) expect(Math.abs(coverageFactor(nu, p) / k - 1), `ν = ${nu}, p = ${p}`).toBeLessThan(1e-12)
  })

  it('for ν = ∞ gives the normal quantile: erf(k/√2) = p (mathjs erf as the independent check)', () => {
    for (const p of [0.6827, 0.9, 0.95, 0.9545, 0.99, 0.9973]) {
      const k = coverageFactor(Number.POSITIVE_INFINITY, p)
      expect(Math.abs(erf(k / Math.SQRT2) - p)).toBeLessThan(1e-12)
      expect(coverageFactor(undefined, p)).toBe(k)
      expect(coverageFactor(null, p)).toBe(k)
    }
  })

  it('truncates a non-integer ν by default (GUM G.4.1) or uses it as is', () => {
    expect(coverageFactor(16.7, 0.99)).toBe(coverageFactor(16, 0.99))
    const f = coverageFactor(16.7, 0.99, 'fractional')
    expect(f).toBeLessThan(coverageFactor(16, 0.99))
    expect(f).toBeGreaterThan(coverageFactor(17, 0.99))
    // ν below 1 is never truncated to 0
    expect(Number.isFinite(coverageFactor(0.5))).toBe(true)
    expect(coverageFactor(0.5)).toBeGreaterThan(coverageFactor(1))
  })

  it('rejects bad ν and p', () => {
    expect(() => coverageFactor(0)).toThrow(EngineInputError)
    expect(() => coverageFactor(-3)).toThrow(EngineInputError)
    expect(() => coverageFactor(5, 1)).toThrow(EngineInputError)
    expect(() => coverageFactor(5, 0)).toThrow(EngineInputError)
    expect(() => coverageFactor(5, Number.NaN)).toThrow(EngineInputError)
  })
})

describe('standard uncertainty of a component', () => {
  const c = (x: Partial<BudgetComponent>): BudgetComponent => ({ name: 'x', sensitivity: 1, ...x })
  it('applies the GUM 4.3 divisors', () => {
    // GUM 4.3.7 (rectangular a/√3), 4.3.9 (triangular a/√6), arcsine a/√2, F.2.2.1 (resolution δ/√12)
    expect(standardUncertaintyOf(c({ distribution: 'rectangular', halfWidth: 0.2 }))).toBeCloseTo(0.2 / Math.sqrt(3), 15)
    expect(standardUncertaintyOf(c({ distribution: 'triangular', halfWidth: 0.6 }))).toBeCloseTo(0.6 / Math.sqrt(6), 15)
    expect(standardUncertaintyOf(c({ distribution: 'u-shaped', halfWidth: 0.5 }))).toBeCloseTo(0.5 / Math.sqrt(2), 15)
    expect(standardUncertaintyOf(c({ distribution: 'resolution', resolution: 0.1 }))).toBeCloseTo(0.1 / Math.sqrt(12), 15)
    expect(standardUncertaintyOf(c({ distribution: 'normal', halfWidth: 0.05, coverageFactor: 2 }))).toBeCloseTo(0.025, 15)
    expect(standardUncertaintyOf(c({ standardUncertainty: 0.03 }))).toBe(0.03)
    expect(standardUncertaintyOf(c({ standardUncertainty: 0.03, distribution: 'normal' }))).toBe(0.03)
  })

  it('rejects ambiguous or incomplete components with the field name', () => {
    const field = (x: Partial<BudgetComponent>, i = 3): string => {
      try {
        standardUncertaintyOf(c(x), i)
      } catch (e) {
        expect(e).toBeInstanceOf(RangeError)
        return (e as EngineInputError).field
      }
      return 'no error'
    }
    expect(field({ distribution: 'resolution', halfWidth: 0.05 })).toBe('components[3].resolution')
    expect(field({ distribution: 'normal', halfWidth: 0.05 })).toBe('components[3].coverageFactor')
    expect(field({ distribution: 'rectangular' })).toBe('components[3].halfWidth')
    expect(field({ distribution: 'rectangular', halfWidth: -1 })).toBe('components[3].halfWidth')
    expect(field({ distribution: 'rectangular', halfWidth: Number.NaN })).toBe('components[3].halfWidth')
    expect(field({ distribution: 'lognormal' as never, halfWidth: 1 })).toBe('components[3].distribution')
    expect(field({})).toBe('components[3].standardUncertainty')
    expect(field({ standardUncertainty: -0.1 })).toBe('components[3].standardUncertainty')
    expect(field({ standardUncertainty: 0.1, distribution: 'rectangular', halfWidth: 0.2 })).toBe('components[3].distribution')
  })
})

describe('budget', () => {
  it('GUM Annex H.1 end gauge, contribution form of Table H.1 (from memory)', () => {
    // JCGM 100:2008 H.1, Table H.1: |cᵢ|u(xᵢ) in nm and νᵢ: l_s 25 (18), d 9.7 (25.6), α_s 0, θ 0,
    // δα 2.9 (50), δθ 16.6 (2); published u_c = 32 nm, ν_eff = 16, k99 = 2.92, U99 = 93 nm
    const comps: BudgetComponent[] = [
      { name: 'l_s', standardUncertainty: 25, sensitivity: 1, dof: 18 },
      { name: 'd', standardUncertainty: 9.7, sensitivity: 1, dof: 25.6 },
      { name: 'α_s', standardUncertainty: 0, sensitivity: 1 },
      { name: 'θ', standardUncertainty: 0, sensitivity: 1 },
      { name: 'δα', standardUncertainty: 2.9, sensitivity: 1, dof: 50 },
      { name: 'δθ', standardUncertainty: 16.6, sensitivity: 1, dof: 2 },
    ]
    const r = evaluateBudget(comps, { coverageProbability: 0.99 })
    expect(Math.abs(r.combinedStandardUncertainty - 32)).toBeLessThan(0.5)
    expect(r.effectiveDegreesOfFreedom).toBeGreaterThan(16)
    expect(r.effectiveDegreesOfFreedom).toBeLessThan(17.5)
    expect(r.degreesOfFreedomUsed).toBe(16)
    expect(Math.abs(r.coverageFactor - 2.92)).toBeLessThan(0.005)
    // GUM H.1.6 states U99 = 2.92 × 32 nm = 93 nm, i.e. from u_c already rounded to 32 nm; the
    // unrounded product is 92.5 nm
    expect(Math.abs(r.expandedUncertainty - 92.5)).toBeLessThan(0.2)
    const ucRounded = Number(roundResult(0, r.combinedStandardUncertainty).uncertaintyText)
    expect(ucRounded).toBe(32)
    expect(roundResult(0, r.coverageFactor * ucRounded).uncertaintyText).toBe('93')
    expect(roundResult(0, r.expandedUncertainty, { mode: 'up' }).uncertaintyText).toBe('93')
  })

  it('GUM Annex H.1 end gauge from its inputs (values recalled from memory)', () => {
    // u(d): repeatability 5.8 nm (ν 24), random comparator 3.9 nm (ν 5), systematic comparator 6.7 nm (ν 8)
    const d = evaluateBudget([
      { name: 'repeatability', standardUncertainty: 5.8, sensitivity: 1, dof: 24 },
      { name: 'comparator, random', standardUncertainty: 3.9, sensitivity: 1, dof: 5 },
      { name: 'comparator, systematic', standardUncertainty: 6.7, sensitivity: 1, dof: 8 },
    ])
    expect(Math.abs(d.combinedStandardUncertainty - 9.7)).toBeLessThan(0.05)
    expect(Math.abs(d.effectiveDegreesOfFreedom! - 25.6)).toBeLessThan(0.5)
    // main budget, output in nm: l_s from U = 75 nm at k = 3 (ν 18); α_s ±2e-6 K⁻¹ and θ (0.41 K) with
    // c = 0; δα ±1e-6 K⁻¹ rectangular with c = −l_s·θ = 5e6 nm·K (l_s = 50 mm, θ = −0.1 K), ν 50;
    // δθ ±0.05 K rectangular with c = −l_s·α_s = −575 nm/K (α_s = 11.5e-6 K⁻¹), ν 2
    const r = evaluateBudget(
      [
        { name: 'l_s', distribution: 'normal', halfWidth: 75, coverageFactor: 3, sensitivity: 1, dof: 18 },
        { name: 'd', standardUncertainty: d.combinedStandardUncertainty, sensitivity: 1, dof: d.effectiveDegreesOfFreedom },
        { name: 'α_s', distribution: 'rectangular', halfWidth: 2e-6, sensitivity: 0 },
        { name: 'θ', standardUncertainty: 0.41, sensitivity: 0 },
        { name: 'δα', distribution: 'rectangular', halfWidth: 1e-6, sensitivity: 5e6, dof: 50 },
        { name: 'δθ', distribution: 'rectangular', halfWidth: 0.05, sensitivity: -575, dof: 2 },
      ],
      { coverageProbability: 0.99 },
    )
    const byName = Object.fromEntries(r.contributions.map((c) => [c.name, c.contribution]))
    expect(Math.abs(byName['δα']! - 2.9)).toBeLessThan(0.05)
    expect(Math.abs(byName['δθ']! - 16.6)).toBeLessThan(0.05)
    expect(byName['θ']).toBe(0)
    expect(Math.abs(r.combinedStandardUncertainty - 32)).toBeLessThan(0.5)
    expect(r.degreesOfFreedomUsed).toBe(16)
    expect(Math.abs(r.coverageFactor - 2.92)).toBeLessThan(0.005)
    expect(Math.abs(r.expandedUncertainty - 92.5)).toBeLessThan(0.2) // GUM: 2.92 × 32 nm = 93 nm
    expect(roundResult(0, r.expandedUncertainty, { mode: 'up' }).uncertaintyText).toBe('93')
  })

  it('Welch–Satterthwaite on a hand-computed case', () => {
    // GUM eq. (G.2b): two contributions of 1 with ν = 4 and ∞: u_c⁴ = 4, Σ = 1/4 → ν_eff = 16
    const r = evaluateBudget([
      { name: 'a', standardUncertainty: 0.5, sensitivity: 2, dof: 4 },
      { name: 'b', standardUncertainty: 1, sensitivity: -1 },
    ])
    expect(r.combinedStandardUncertainty).toBeCloseTo(Math.SQRT2, 14)
    expect(r.effectiveDegreesOfFreedom).toBeCloseTo(16, 10)
    expect(r.contributions.map((c) => c.percent)).toEqual([50, 50])
    expect(r.contributions[0]!.contribution).toBe(1)
    expect(r.expandedUncertainty).toBeCloseTo(r.coverageFactor * Math.SQRT2, 14)
  })

  it('is JSON-safe: infinite ν becomes null, percentages add to 100', () => {
    const r = evaluateBudget([
      { name: 'reference', distribution: 'normal', halfWidth: 0.05, coverageFactor: 2, sensitivity: 1 },
      { name: 'emissivity', distribution: 'rectangular', halfWidth: 0.01, sensitivity: 64 },
      { name: 'uniformity', distribution: 'rectangular', halfWidth: 0.2, sensitivity: 1 },
      { name: 'resolution', distribution: 'resolution', resolution: 0.1, sensitivity: 1 },
    ])
    expect(r.effectiveDegreesOfFreedom).toBeNull()
    expect(r.degreesOfFreedomUsed).toBeNull()
    expect(Math.abs(r.coverageFactor - 2)).toBeLessThan(1e-4)
    const total = r.contributions.reduce((s, c) => s + c.percent, 0)
    expect(Math.abs(total - 100)).toBeLessThan(1e-12)
    expect(JSON.parse(JSON.stringify(r))).toEqual(r)
    // emissivity dominates a flat-plate budget (domain primer, common practice)
    const top = [...r.contributions].sort((a, b) => b.percent - a.percent)[0]!
    expect(top.name).toBe('emissivity')
  })

  it('a 12-component budget in the API output shape', () => {
    const comps: BudgetComponent[] = Array.from({ length: 12 }, (_, i) => ({
      name: `c${i}`,
      distribution: (['normal', 'rectangular', 'triangular', 'u-shaped'] as const)[i % 4],
      halfWidth: 0.1 * (i + 1),
      ...(i % 4 === 0 ? { coverageFactor: 2 } : {}),
      sensitivity: 1 + i / 10,
      dof: i % 3 === 0 ? undefined : 10 + i,
    }))
    const r = evaluateBudget(comps)
    // |cᵢ|·u(xᵢ) by hand: a/2 (normal, k = 2), a/√3, a/√6, a/√2 (GUM 4.3.7, 4.3.9), times cᵢ = 1 + i/10
    const divisor = [2, Math.sqrt(3), Math.sqrt(6), Math.SQRT2]
    const expected = comps.map((_, i) => ((0.1 * (i + 1)) / divisor[i % 4]!) * (1 + i / 10))
    expect(r.contributions.map(c => c.contribution)).toEqual(expected.map(v => expect.closeTo(v, 14)))
    expect(r.combinedStandardUncertainty).toBeCloseTo(Math.sqrt(expected.reduce((s, v) => s + v * v, 0)), 12)
    expect(Object.keys(r)).toEqual(expect.arrayContaining(['combinedStandardUncertainty', 'effectiveDegreesOfFreedom', 'coverageFactor', 'expandedUncertainty', 'contributions']))
    expect(Object.keys(r.contributions[0]!)).toEqual(expect.arrayContaining(['name', 'standardUncertainty', 'contribution', 'percent']))
  })

  it('rejects bad budgets with field names', () => {
    const field = (f: () => unknown): string => {
      try {
        f()
      } catch (e) {
        expect(e).toBeInstanceOf(EngineInputError)
        return (e as EngineInputError).field
      }
      return 'no error'
    }
    expect(field(() => evaluateBudget([]))).toBe('components')
    expect(field(() => evaluateBudget([{ name: '', standardUncertainty: 1, sensitivity: 1 }]))).toBe('components[0].name')
    expect(field(() => evaluateBudget([{ name: 'a', standardUncertainty: 1, sensitivity: 1 }, { name: 'b', standardUncertainty: 1, sensitivity: Number.NaN }]))).toBe('components[1].sensitivity')
    expect(field(() => evaluateBudget([{ name: 'a', standardUncertainty: 1, sensitivity: 1, dof: 0 }]))).toBe('components[0].dof')
    expect(field(() => evaluateBudget([{ name: 'a', distribution: 'rectangular', halfWidth: -2, sensitivity: 1 }]))).toBe('components[0].halfWidth')
    expect(field(() => evaluateBudget([{ name: 'a', standardUncertainty: 1, sensitivity: 1 }], { coverageProbability: 95 }))).toBe('coverageProbability')
  })
})

describe('rounding a stated result (GUM 7.2.6)', () => {
  it('keeps two significant digits and rounds the value to the same place', () => {
    // GUM 7.2.2 example (from memory): m_s = 100.021 47 g, u_c = 0.35 mg
    expect(roundResult(100.02147, 0.00035)).toMatchObject({ valueText: '100.02147', uncertaintyText: '0.00035', decimals: 5 })
    // GUM H.1 (from memory): l = (50.000 838 ± 0.000 093) mm
    expect(roundResult(50.0008382, 0.0000926)).toMatchObject({ valueText: '50.000838', uncertaintyText: '0.000093' })
    expect(roundResult(373.14961, 0.1234)).toMatchObject({ valueText: '373.15', uncertaintyText: '0.12', value: 373.15, uncertainty: 0.12 })
    expect(roundResult(-0.04449, 0.0123)).toMatchObject({ valueText: '-0.044', uncertaintyText: '0.012' })
    expect(roundResult(1234.5, 99.5)).toMatchObject({ valueText: '1230', uncertaintyText: '100' })
    expect(roundResult(0.123456, 0.0996)).toMatchObject({ valueText: '0.12', uncertaintyText: '0.10' })
    expect(roundResult(12.3, 0.0325)).toMatchObject({ uncertaintyText: '0.033' }) // half away from zero despite binary 0.0325
  })

  it('rounds to nearest by default and up on request (GUM 7.2.6: 10.47 → 11 "rounded up", 28.05 → 28)', () => {
    expect(roundResult(1000, 10.47).uncertaintyText).toBe('10')
    expect(roundResult(1000, 10.47, { mode: 'up' }).uncertaintyText).toBe('11')
    expect(roundResult(1000, 28.05).uncertaintyText).toBe('28')
    expect(roundResult(1000, 0.0991, { mode: 'up' }).uncertaintyText).toBe('0.10')
    expect(roundResult(1000, 0.12, { mode: 'up' }).uncertaintyText).toBe('0.12') // exact already: not raised
    expect(roundResult(1000, 0.123, { significantDigits: 1 }).uncertaintyText).toBe('0.1')
  })

  it('rejects bad inputs', () => {
    expect(() => roundResult(1, 0)).toThrow(EngineInputError)
    expect(() => roundResult(Number.NaN, 1)).toThrow(EngineInputError)
    expect(() => roundResult(1, 1, { significantDigits: 0 })).toThrow(EngineInputError)
  })
})
