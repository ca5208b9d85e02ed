// Correlated inputs in the GUM budget (JCGM 100:2008, 5.2.2, eq. (16)), checked by hand arithmetic
// written beside each case and against the GUM's own example.
import { describe, expect, it } from 'vitest'
import { EngineInputError, evaluateBudget, type BudgetComponent, type BudgetCorrelation } from '../../../shared/uncertainty'

describe('budget with correlated inputs (GUM 5.2.2)', () => {
  it('GUM 5.2.2, example of ten resistors calibrated against one standard (r = +1): u_c = Σ u = 1 Ω (from memory)', () => {
    // JCGM 100:2008 5.2.2 Note 1 example (recalled): ten 1000 Ω resistors compared with the same standard of
    // u = 100 mΩ, in series; r(R_i, R_j) = +1, c_i = 1 → u_c(R_ref) = Σ u(R_i) = 1 Ω (uncorrelated: √10 × 0.1 = 0.32 Ω)
    const comps: BudgetComponent[] = Array.from({ length: 10 }, (_, i) => ({ name: `R${i + 1}`, standardUncertainty: 0.1, sensitivity: 1 }))
    const correlations: BudgetCorrelation[] = []
    for (let i = 0; i < 10; i++) for (let j = i + 1; j < 10; j++) correlations.push({ between: [i, j], coefficient: 1 })
    expect(Math.abs(evaluateBudget(comps, { correlations }).combinedStandardUncertainty - 1)).toBeLessThan(1e-12)
    expect(Math.abs(evaluateBudget(comps).combinedStandardUncertainty - Math.sqrt(10) * 0.1)).toBeLessThan(1e-12)
  })

  it('r = +1 between two of three lines, by hand', () => {
    // s_a = c·u = 2 × 0.3 = 0.6 (ν 10), s_b = 1 × 0.4 = 0.4 (ν 10), s_c = 0.5 (ν 20), r(a,b) = 1:
    // u_c² = 0.36 + 0.16 + 0.25 + 2·1·0.6·0.4 = 1.25 → u_c = 1.1180340
    // shares: a 0.6·(0.6 + 0.4)/1.25 = 48 %, b 0.4·(0.4 + 0.6)/1.25 = 32 %, c 0.25/1.25 = 20 %
    // ν_eff: group {a, b} (equal ν = 10) is one component of variance (0.6 + 0.4)² = 1:
    // 1.25² / (1²/10 + 0.25²/20) = 1.5625 / 0.103125 = 15.1515 → 15 used
    const r = evaluateBudget(
      [
        { name: 'a', standardUncertainty: 0.3, sensitivity: 2, dof: 10 },
        { name: 'b', standardUncertainty: 0.4, sensitivity: 1, dof: 10 },
        { name: 'c', standardUncertainty: 0.5, sensitivity: 1, dof: 20 },
      ],
      { correlations: [{ between: [0, 1], coefficient: 1 }] },
    )
    expect(Math.abs(r.combinedStandardUncertainty - Math.sqrt(1.25))).toBeLessThan(1e-14)
    expect(r.contributions.map(c => c.percent).map(v => Math.round(v * 1e9) / 1e9)).toEqual([48, 32, 20])
    expect(Math.abs(r.effectiveDegreesOfFreedom! - 1.5625 / 0.103125)).toBeLessThan(1e-9)
    expect(r.degreesOfFreedomUsed).toBe(15)
    expect(r.correlation).toMatchObject({ covarianceTerm: expect.closeTo(0.48, 14), uncorrelatedVariance: expect.closeTo(0.77, 14), clampedAtZero: false })
    expect(r.correlation!.groups).toEqual([{ components: [0, 1], dof: 10, variance: expect.closeTo(1, 14) }])
    // contributions |c|u stay the uncorrelated ones
    expect(r.contributions.map(c => c.contribution)).toEqual([0.6, 0.4, 0.5])
  })

  it('r = −0.5 between two lines, with a negative sensitivity, by hand', () => {
    // s_a = 2 × 0.3 = 0.6 (ν 4), s_b = −2 × 0.2 = −0.4 (ν ∞), r = −0.5:
    // covariance 2·(−0.5)·0.6·(−0.4) = +0.24 → u_c² = 0.36 + 0.16 + 0.24 = 0.76, u_c = 0.8717798
    // shares: a 0.6·(0.6 + (−0.5)(−0.4))/0.76 = 0.48/0.76 = 63.1579 %, b (−0.4)·(−0.4 + (−0.5)(0.6))/0.76 = 0.28/0.76 = 36.8421 %
    // ν_eff: one group with ν = min(4, ∞) = 4 holding all of u_c² → ν_eff = 4 (conservative choice, noted)
    const comps: BudgetComponent[] = [
      { name: 'a', standardUncertainty: 0.3, sensitivity: 2, dof: 4 },
      { name: 'b', standardUncertainty: 0.2, sensitivity: -2 },
    ]
    const r = evaluateBudget(comps, { correlations: [{ between: [1, 0], coefficient: -0.5 }] })
    expect(Math.abs(r.combinedStandardUncertainty - Math.sqrt(0.76))).toBeLessThan(1e-14)
    expect(Math.abs(r.contributions[0]!.percent - 4800 / 76)).toBeLessThan(1e-10)
    expect(Math.abs(r.contributions[1]!.percent - 2800 / 76)).toBeLessThan(1e-10)
    expect(Math.abs(r.effectiveDegreesOfFreedom! - 4)).toBeLessThan(1e-12)
    expect(r.correlation!.notes.join(' ')).toContain('smallest ν')
    // same magnitudes with both sensitivities positive: covariance −0.24 → u_c² = 0.28;
    // shares 0.6·(0.6 − 0.2)/0.28 = 85.714 %, 0.4·(0.4 − 0.3)/0.28 = 14.286 %
    const s = evaluateBudget([comps[0]!, { ...comps[1]!, sensitivity: 2 }], { correlations: [{ between: [0, 1], coefficient: -0.5 }] })
    expect(Math.abs(s.combinedStandardUncertainty - Math.sqrt(0.28))).toBeLessThan(1e-14)
    expect(Math.abs(s.contributions[0]!.percent - 2400 / 28)).toBeLessThan(1e-10)
    expect(Math.abs(s.contributions[1]!.percent - 400 / 28)).toBeLessThan(1e-10)
  })

  it('r = 0 gives exactly the uncorrelated result', () => {
    const comps: BudgetComponent[] = [
      { name: 'reference', distribution: 'normal', halfWidth: 0.05, coverageFactor: 2, sensitivity: 1, dof: 30 },
      { name: 'emissivity', distribution: 'rectangular', halfWidth: 0.01, sensitivity: -64 },
      { name: 'repeatability', standardUncertainty: 0.04, sensitivity: 1, dof: 4 },
    ]
    const plain = evaluateBudget(comps)
    const { correlation, ...rest } = evaluateBudget(comps, { correlations: [{ between: [0, 1], coefficient: 0 }, { between: [1, 2], coefficient: 0 }] })
    expect(rest).toEqual(plain)
    expect(correlation).toEqual({ uncorrelatedVariance: plain.combinedStandardUncertainty ** 2, covarianceTerm: 0, clampedAtZero: false, groups: [], notes: [] })
    expect(evaluateBudget(comps, { correlations: [] })).toEqual(plain)
  })

  it('r = −1 between two equal and opposite lines: u_c² clamped at 0 and said so', () => {
    // s_a = 7 × 0.12832764378004255 = 0.8982935064602978 and s_b = 0.8982935064602979 (one ulp apart):
    // s_a² + s_b² − 2·s_a·s_b = −2.2e-16 in binary arithmetic (checked with node), truly ≈ 1e-32
    const r = evaluateBudget(
      [
        { name: 'a', standardUncertainty: 0.12832764378004255, sensitivity: 7 },
        { name: 'b', standardUncertainty: 0.8982935064602979, sensitivity: 1 },
      ],
      { correlations: [{ between: [0, 1], coefficient: -1 }] },
    )
    expect(r.correlation!.uncorrelatedVariance + r.correlation!.covarianceTerm).toBeLessThan(0)
    expect(r.correlation!.clampedAtZero).toBe(true)
    expect(r.correlation!.notes.join(' ')).toContain('set to 0')
    expect(r.combinedStandardUncertainty).toBe(0)
    expect(r.expandedUncertainty).toBe(0)
    expect(r.contributions.map(c => c.percent)).toEqual([0, 0])
    expect(r.effectiveDegreesOfFreedom).toBeNull()
    // 3 × 0.1 against 0.3: exactly 0 in binary, also reported as clamped
    const z = evaluateBudget([{ name: 'a', standardUncertainty: 0.1, sensitivity: 3 }, { name: 'b', standardUncertainty: 0.3, sensitivity: 1 }], { correlations: [{ between: [0, 1], coefficient: -1 }] })
    expect(z.combinedStandardUncertainty).toBe(0)
    expect(z.correlation!.clampedAtZero).toBe(true)
  })

  it('rejects bad correlations with their field names', () => {
    const comps: BudgetComponent[] = [
      { name: 'a', standardUncertainty: 0.1, sensitivity: 1 },
      { name: 'b', standardUncertainty: 0.2, sensitivity: 1 },
      { name: 'c', standardUncertainty: 0.3, sensitivity: 1 },
    ]
    const field = (correlations: unknown): string => {
      try {
        evaluateBudget(comps, { correlations: correlations as BudgetCorrelation[] })
      } catch (e) {
        expect(e).toBeInstanceOf(EngineInputError)
        return (e as EngineInputError).field
      }
      return 'no error'
    }
    expect(field([{ between: [0, 0], coefficient: 0.5 }])).toBe('correlations[0].between')
    expect(field([{ between: [0, 3], coefficient: 0.5 }])).toBe('correlations[0].between')
    expect(field([{ between: [-1, 2], coefficient: 0.5 }])).toBe('correlations[0].between')
    expect(field([{ between: [0, 1.5], coefficient: 0.5 }])).toBe('correlations[0].between')
    expect(field([{ between: [0], coefficient: 0.5 }])).toBe('correlations[0].between')
    expect(field([{ between: [0, 1], coefficient: 0.5 }, { between: [1, 0], coefficient: 0.2 }])).toBe('correlations[1].between')
    expect(field([{ between: [0, 1], coefficient: 1.2 }])).toBe('correlations[0].coefficient')
    expect(field([{ between: [0, 1], coefficient: Number.NaN }])).toBe('correlations[0].coefficient')
    expect(field([{ between: [0, 1] }])).toBe('correlations[0].coefficient')
    expect(field({ between: [0, 1], coefficient: 0.5 })).toBe('correlations')
    // r(a,b) = r(a,c) = 0.9 but r(b,c) = −0.9: no such joint distribution (matrix not positive semi-definite)
    expect(field([{ between: [0, 1], coefficient: 0.9 }, { between: [0, 2], coefficient: 0.9 }, { between: [1, 2], coefficient: -0.9 }])).toBe('correlations')
    // r = 1 for all three pairs is singular but valid
    expect(field([{ between: [0, 1], coefficient: 1 }, { between: [0, 2], coefficient: 1 }, { between: [1, 2], coefficient: 1 }])).toBe('no error')
  })
})
