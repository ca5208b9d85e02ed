// The Monte Carlo plan of a point per JCGM 101:2008: Type B lines from their stated distributions, only a
// Type A mean as a scaled t (6.4.9), correlations carried over (6.4.8), and the §8 validation of the GUM
// result on a budget whose only non-normal line is a rectangular Type B with ν = 12.
import { describe, expect, it } from 'vitest'
import { computePoint } from '../../../shared/calibration/compute'
import { lineDistribution, monteCarloPlan, monteCarloPlanInputs, planModel } from '../../../shared/calibration/monteCarloPlan'
import { readingModel } from '../../../shared/radiometry/reading'
import { compileInputs, runMonteCarlo, validateGumResult } from '../../../shared/uncertainty/montecarlo'
import type { BudgetLine, PointComputationInput, TemplateComponent } from '../../../shared/types/runs'

const line = (over: Partial<BudgetLine>): BudgetLine => ({
  name: 'l', type: 'B', input: 'reading', distribution: 'standard', value: 0, unit: 'K', standardUncertainty: 0.1, sensitivity: 1, contributionK: 0.1, percent: 100, dof: null, ...over,
})
const comp = (c: Partial<TemplateComponent>): TemplateComponent => ({
  name: 'c', type: 'B', distribution: 'standard', value: 0, coverageFactor: null, unit: 'K', input: 'reading', dof: null, ...c,
})
const LW = { kind: 'rectangular', lambda1Um: 8, lambda2Um: 14 } as const
const point = (over: Partial<PointComputationInput>): PointComputationInput => ({
  band: LW,
  reference: { kind: 'reference-thermometer', referenceReadingK: 373.15 },
  sourceEmissivity: 0.95, reflectedTemperatureK: 296.15, instrumentTemperatureK: 296.15, emissivitySetting: 0.95,
  readingsK: [373.2], resolutionK: 0.001,
  template: [], cmc: [], accuracy: { kind: 'absolute', b: 1 }, rule: 'simple-acceptance', guardBandFactor: null,
  ...over,
})

describe('distributions of budget lines (JCGM 101 6.4)', () => {
  it('a Type B line keeps its stated distribution whatever its ν; degrees of freedom never make it a t', () => {
    // JCGM 101 6.4.7: a quantity known by its estimate and standard uncertainty is Gaussian; ν belongs to the GUM's W–S
    expect(lineDistribution(line({ type: 'B', distribution: 'standard', dof: 12, standardUncertainty: 0.03 }), 0, 1)).toEqual({ name: 'l', distribution: 'normal', value: 0, standardUncertainty: 0.03 })
    expect(lineDistribution(line({ type: 'B', distribution: 'rectangular', dof: 12, standardUncertainty: 0.1 }), 2, 1)).toMatchObject({ distribution: 'rectangular', value: 2, halfWidth: 0.1 * Math.sqrt(3) })
    expect(lineDistribution(line({ type: 'B', distribution: 'normal', dof: 5 }), 0, 1)).toMatchObject({ distribution: 'normal' })
    // JCGM 101 6.4.9: a Type A mean of n indications is a scaled and shifted t with ν = n − 1
    expect(lineDistribution(line({ type: 'A', distribution: 'standard', dof: 4, standardUncertainty: 0.07 }), 0, 1)).toMatchObject({ distribution: 'student-t', scale: 0.07, dof: 4 })
  })

  it("the point's repeatability line (Type A, ν = n − 1) is the only t of a plan", () => {
    const r = computePoint(point({
      readingsK: [373.1, 373.2, 373.3, 373.2],
      template: [
        comp({ name: 'ambient', value: 0.03, dof: 12 }),
        comp({ name: 'uniformity', distribution: 'rectangular', value: 0.1, input: 'sourceTemperature', dof: 12 }),
      ],
    }))
    const plan = monteCarloPlan(r)
    const all = monteCarloPlanInputs(plan).inputs
    expect(all.filter(d => d.distribution === 'student-t').map(d => [d.name, (d as { dof: number }).dof])).toEqual([['Repeatability of the readings (s/√n)', 3]])
    expect(plan.outputTerms.find(t => t.name === 'ambient')).toMatchObject({ distribution: 'normal' })
    expect(plan.inputs.sourceTemperatureK).toMatchObject({ distribution: 'rectangular', value: 373.15 })
  })
})

describe('JCGM 101 §8 validation of the GUM result', () => {
  it('a budget whose only non-normal line is a rectangular Type B with ν = 12 is validated (δ from two digits of u_c)', () => {
    // reference 0.10 K (k = 2), plate emissivity 0.004 (k = 2), ambient 0.03 K Type B ν = 12 (normal),
    // uniformity ±0.1 K rectangular ν = 12; one reading (no Type A line); display resolution 0.001 K
    // (u = 0.3 mK, negligible); 8–14 µm, ε_s = ε_i = 0.95 at 100 °C
    const r = computePoint(point({
      template: [
        comp({ name: 'reference', distribution: 'normal', value: 0.1, coverageFactor: 2, input: 'sourceTemperature' }),
        comp({ name: 'plate emissivity', distribution: 'normal', value: 0.004, coverageFactor: 2, unit: 'emissivity', input: 'sourceEmissivity' }),
        comp({ name: 'ambient', value: 0.03, dof: 12 }),
        comp({ name: 'uniformity', distribution: 'rectangular', value: 0.1, input: 'sourceTemperature', dof: 12 }),
      ],
    }))
    const plan = monteCarloPlan(r)
    const { inputs, correlations } = monteCarloPlanInputs(plan)
    expect(inputs.filter(d => !['normal', 'constant'].includes(d.distribution)).map(d => d.distribution)).toEqual(['rectangular', 'rectangular'])
    // the second rectangle is the 0.001 K display resolution
    expect(inputs.find(d => d.name.startsWith('Display'))).toMatchObject({ distribution: 'rectangular', halfWidth: expect.closeTo(0.0005, 15) })
    // ν_eff by Welch–Satterthwaite (GUM G.2b) from the budget's own lines: u_c⁴ / Σ (|cᵢ|u(xᵢ))⁴/νᵢ over
    // the two ν = 12 lines (ambient, uniformity); the others have ν = ∞
    const finite = r.budget.components.filter(l => l.dof !== null)
    expect(finite.map(l => l.name)).toEqual(['ambient', 'uniformity'])
    const ws = r.budget.combinedStandardUncertaintyK ** 4 / finite.reduce((s, l) => s + l.contributionK ** 4 / l.dof!, 0)
    expect(r.budget.effectiveDegreesOfFreedom).toBeCloseTo(ws, 6)
    const mc = runMonteCarlo(planModel(readingModel(LW)), inputs, { trials: 400_000, seed: 2024, coverageProbability: r.budget.coverageProbability, correlations })
    const v = validateGumResult(plan.gum, mc.coverageInterval)
    expect(v.validated).toBe(true)
    expect(v.tolerance).toBe(0.005) // u_c ≈ 0.15 K → 15 × 10⁻² K, δ = ½ × 10⁻² K (JCGM 101 7.9.2, 8.2)
    expect(Math.abs(mc.standardUncertainty - r.budget.combinedStandardUncertaintyK)).toBeLessThan(v.tolerance)
  })
})

describe('correlations in the plan', () => {
  it('map template pairs to the joint list, with the sign of an output term that entered as |c|·δ', () => {
    const r = computePoint(point({
      readingsK: [373.1, 373.2, 373.3],
      resolutionK: 0.1,
      template: [
        comp({ name: 'reference', distribution: 'normal', value: 0.1, coverageFactor: 2, input: 'sourceTemperature' }), // slot 0
        comp({ name: 'uniformity', distribution: 'rectangular', value: 0.05, input: 'sourceTemperature' }), // output term 0 → slot 5
        comp({ name: 'ambient', value: 0.03 }), // reading line → slot 7
        comp({ name: 'setting', distribution: 'normal', value: 0.004, coverageFactor: 2, unit: 'emissivity', input: 'emissivitySetting' }), // slot 4
        comp({ name: 'setting drift', distribution: 'rectangular', value: 0.001, unit: 'emissivity', input: 'emissivitySetting' }), // output term 1 → slot 6, c < 0
      ],
      correlations: [{ between: [0, 2], coefficient: 0.5 }, { between: [4, 2], coefficient: 0.3 }],
    }))
    expect(r.budget.components[4]!.sensitivity).toBeLessThan(0)
    const plan = monteCarloPlan(r)
    expect(plan.outputTerms.map(t => t.name).slice(0, 3)).toEqual(['uniformity', 'setting drift', 'ambient'])
    // output term "setting drift" enters as |c|·δ with c < 0: its correlation with "ambient" changes sign
    expect(plan.correlations).toEqual([{ between: [0, 7], coefficient: 0.5 }, { between: [6, 7], coefficient: -0.3 }])
    const { inputs, correlations } = monteCarloPlanInputs(plan)
    expect(compileInputs(inputs, correlations).copula!.groups.map(g => Array.from(g.members))).toEqual([[0, 6, 7]])
    expect(plan.notes.filter(n => n.includes('sampled jointly'))).toHaveLength(2)
  })
})
