// How a point budget becomes Monte Carlo distributions (JCGM 101:2008 §6), checked against the
// GUM relations between a distribution's half-width and its standard uncertainty.
import { describe, expect, it } from 'vitest'
import { computePoint } from '../../../shared/calibration/compute'
import { lineDistribution, monteCarloPlan } from '../../../shared/calibration/monteCarloPlan'
import type { BudgetLine } from '../../../shared/types/runs'

const line = (over: Partial<BudgetLine>): BudgetLine => ({
  name: 'l', type: 'B', input: 'reading', distribution: 'rectangular', value: 0, unit: 'K', standardUncertainty: 0.1, sensitivity: 1, contributionK: 0.1, percent: 100, dof: null, ...over,
})

describe('lineDistribution', () => {
  it('recovers the half-widths from u: rectangular a = u√3, triangular a = u√6, U-shaped a = u√2 (GUM 4.3.7, 4.3.9)', () => {
    expect(lineDistribution(line({ distribution: 'rectangular' }), 5, 1)).toMatchObject({ distribution: 'rectangular', value: 5, halfWidth: 0.1 * Math.sqrt(3) })
    expect(lineDistribution(line({ distribution: 'triangular' }), 0, 2)).toMatchObject({ distribution: 'triangular', halfWidth: 0.2 * Math.sqrt(6) })
    expect(lineDistribution(line({ distribution: 'u-shaped' }), 0, 1)).toMatchObject({ distribution: 'u-shaped', halfWidth: 0.1 * Math.SQRT2 })
  })
  it('a resolution step δ (u = δ/√12) becomes a rectangle of half-width δ/2 (GUM F.2.2.1)', () => {
    const d = lineDistribution(line({ distribution: 'resolution', standardUncertainty: 0.1 / Math.sqrt(12) }), 0, 1) as { halfWidth: number }
    expect(Math.abs(d.halfWidth - 0.05)).toBeLessThan(1e-15)
  })
  it('a Type A mean with ν = n − 1 becomes a scaled t (JCGM 101 6.4.9); ν = ∞ a Gaussian', () => {
    expect(lineDistribution(line({ type: 'A', distribution: 'standard', dof: 4, standardUncertainty: 0.07 }), 0, 1)).toMatchObject({ distribution: 'student-t', scale: 0.07, dof: 4 })
    expect(lineDistribution(line({ distribution: 'standard', dof: null }), 0, 1)).toMatchObject({ distribution: 'normal', standardUncertainty: 0.1 })
  })
})

describe('monteCarloPlan', () => {
  it('puts the largest line of each model input on that input, others and reading lines on the output', () => {
    const r = computePoint({
      band: { kind: 'rectangular', lambda1Um: 8, lambda2Um: 14 },
      reference: { kind: 'reference-thermometer', referenceReadingK: 373.15 },
      sourceEmissivity: 0.95, reflectedTemperatureK: 296.15, instrumentTemperatureK: 296.15, emissivitySetting: 0.95,
      readingsK: [373.1, 373.2, 373.3], resolutionK: 0.1,
      template: [
        { name: 'ref', type: 'B', distribution: 'normal', value: 0.05, coverageFactor: 2, unit: 'K', input: 'sourceTemperature', dof: null },
        { name: 'uniformity', type: 'B', distribution: 'rectangular', value: 0.2, coverageFactor: null, unit: 'K', input: 'sourceTemperature', dof: null },
      ],
      cmc: [], accuracy: { kind: 'absolute', b: 1 }, rule: 'simple-acceptance', guardBandFactor: null,
    })
    const plan = monteCarloPlan(r)
    // uniformity u = 0.2/√3 = 0.115 K > reference 0.025 K: it is the input's distribution
    expect(plan.inputs.sourceTemperatureK).toMatchObject({ distribution: 'rectangular', value: 373.15 })
    expect(plan.inputs.sourceEmissivity).toMatchObject({ distribution: 'constant', value: 0.95 })
    expect(plan.outputTerms.map(t => t.name)).toEqual(['ref', r.budget.components[2]!.name, r.budget.components[3]!.name])
    expect(plan.notes).toHaveLength(1)
    expect(plan.gum).toEqual({ y: r.expectedReadingK, u: r.budget.combinedStandardUncertaintyK, U: r.budget.expandedUncertaintyK })
  })
})
