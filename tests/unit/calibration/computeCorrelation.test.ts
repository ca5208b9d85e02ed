// A point's correlated template components (GUM 5.2.2) and its probability of conformity
// (JCGM 106:2012, 7.4), against hand arithmetic and an independent erf (mathjs).
import { erf } from 'mathjs'
import { describe, expect, it } from 'vitest'
import { computePoint, pointInputFromStored } from '../../../shared/calibration/compute'
import { EngineInputError } from '../../../shared/radiometry/errors'
import type { PointComputationInput, TemplateComponent } from '../../../shared/types/runs'

const LWIR = { kind: 'rectangular', lambda1Um: 8, lambda2Um: 14 } as const
function base(over: Partial<PointComputationInput> = {}): PointComputationInput {
  return {
    band: LWIR,
    reference: { kind: 'reference-thermometer', referenceReadingK: 373.15 },
    sourceEmissivity: 0.95, reflectedTemperatureK: 296.15, instrumentTemperatureK: 296.15, emissivitySetting: 0.95,
    readingsK: [373.0, 373.2, 373.1, 373.3, 372.9],
    resolutionK: 0.1,
    template: [], cmc: [], accuracy: { kind: 'absolute', b: 1 }, rule: 'simple-acceptance', guardBandFactor: null,
    ...over,
  }
}
const comp = (c: Partial<TemplateComponent>): TemplateComponent => ({
  name: 'c', type: 'B', distribution: 'standard', value: 0, coverageFactor: null, unit: 'K', input: 'reading', dof: null, ...c,
})
// Φ from mathjs erf (independent of the engine's erfc): Φ(z) = ½(1 + erf(z/√2))
const phi = (z: number): number => 0.5 * (1 + (erf(z / Math.SQRT2) as number))

describe('correlated template components (GUM 5.2.2)', () => {
  it('r = 1 between two reading lines: u_c² = (u_a + u_b)² + s²/n + δ²/12, by hand', () => {
    // readings 373.0 … 372.9: s = √(0.1/4) = 0.158113883, s/√5 = 0.0707107 (GUM 4.2.3); δ/√12 = 0.0288675
    // u_c² = (0.03 + 0.04)² + 0.1/4/5 + 0.01/12 = 0.0049 + 0.005 + 0.000833333 = 0.010733333
    const r = computePoint(base({
      template: [comp({ name: 'a', value: 0.03 }), comp({ name: 'b', value: 0.04 })],
      correlations: [{ between: [0, 1], coefficient: 1 }],
    }))
    expect(Math.abs(r.budget.combinedStandardUncertaintyK - Math.sqrt(0.0049 + 0.005 + 0.01 / 12))).toBeLessThan(1e-12)
    expect(Math.abs(r.budget.covarianceK2! - 2 * 0.03 * 0.04)).toBeLessThan(1e-15)
    expect(Math.abs(r.budget.components.reduce((s, l) => s + l.percent, 0) - 100)).toBeLessThan(1e-10)
    // without the pair: 0.0009 + 0.0016 + … (the stored inputs carry the pair, so a recomputation agrees)
    const plain = computePoint(base({ template: [comp({ name: 'a', value: 0.03 }), comp({ name: 'b', value: 0.04 })] }))
    expect(Math.abs(plain.budget.combinedStandardUncertaintyK - Math.sqrt(0.0025 + 0.005 + 0.01 / 12))).toBeLessThan(1e-12)
    expect(plain.budget.covarianceK2).toBeUndefined()
    expect(computePoint(pointInputFromStored(r.inputs)).budget.combinedStandardUncertaintyK).toBe(r.budget.combinedStandardUncertaintyK)
  })

  it('rejects correlations that do not name two template components', () => {
    const field = (correlations: unknown): string => {
      try {
        computePoint(base({ template: [comp({ name: 'a', value: 0.03 }), comp({ name: 'b', value: 0.04 })], correlations: correlations as never }))
      } catch (e) {
        expect(e).toBeInstanceOf(EngineInputError)
        return (e as EngineInputError).field
      }
      return 'no error'
    }
    // index 2 would be the repeatability line, which is not a template component
    expect(field([{ between: [0, 2], coefficient: 0.5 }])).toBe('correlations[0].between')
    expect(field([{ between: [1, 1], coefficient: 0.5 }])).toBe('correlations[0].between')
    expect(field([{ between: [0, 1], coefficient: 2 }])).toBe('correlations[0].coefficient')
    expect(field([])).toBe('no error')
  })
})

describe('probability of conformity of a point (JCGM 106:2012, 7.4)', () => {
  it('u = U/k from the budget: p = Φ((TL − E)/u) − Φ((−TL − E)/u)', () => {
    const r = computePoint(base({ readingsK: [373.9, 374.0, 374.1], accuracy: { kind: 'absolute', b: 1 } }))
    const u = r.budget.expandedUncertaintyK / r.budget.coverageFactor
    expect(Math.abs(u - r.budget.combinedStandardUncertaintyK)).toBeLessThan(1e-15)
    const E = r.errorK
    const p = phi((1 - E) / u) - phi((-1 - E) / u)
    expect(p).toBeGreaterThan(0.01)
    expect(p).toBeLessThan(0.99)
    expect(Math.abs(r.conformity.probabilityOfConformity! - p)).toBeLessThan(1e-12)
  })

  it('with the CMC stated, u = CMC/2 (a CMC is an expanded uncertainty at k = 2)', () => {
    const r = computePoint(base({ readingsK: [373.9, 374.0, 374.1], cmc: [{ minK: 300, maxK: 400, expandedUncertaintyK: 0.6 }] }))
    expect(r.budget.cmcApplied).toBe(true)
    const E = r.errorK
    const p = phi((1 - E) / 0.3) - phi((-1 - E) / 0.3)
    expect(Math.abs(r.conformity.probabilityOfConformity! - p)).toBeLessThan(1e-12)
  })
})
