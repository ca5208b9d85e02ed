// The point computation (shared/calibration/compute.ts) against hand calculations written here and
// the GUM formulas; each expected value names its source.
import { describe, expect, it } from 'vitest'
import { computePoint, REPEATABILITY_NAME, RESOLUTION_NAME, SINGLE_READING_NOTE, cmcAt, referenceTemperature, templateStandardUncertainty } from '../../../shared/calibration/compute'
import { EngineInputError } from '../../../shared/radiometry/errors'
import { ENGINE_VERSION } from '../../../shared/engine'
import type { PointComputationInput, TemplateComponent } from '../../../shared/types/runs'

const LWIR = { kind: 'rectangular', lambda1Um: 8, lambda2Um: 14 } as const
// CODATA 2018: c2 = hc/k = 1.438776877e-2 m·K (domain primer §2).
const C2_UM_K = 1.438776877e4

function base(over: Partial<PointComputationInput> = {}): PointComputationInput {
  return {
    band: LWIR,
    reference: { kind: 'reference-thermometer', referenceReadingK: 373.15 },
    sourceEmissivity: 0.95,
    reflectedTemperatureK: 296.15,
    instrumentTemperatureK: 296.15,
    emissivitySetting: 0.95,
    readingsK: [373.0, 373.2, 373.1, 373.3, 372.9],
    resolutionK: 0.1,
    template: [],
    cmc: [],
    accuracy: { kind: 'absolute', b: 1 },
    rule: 'simple-acceptance',
    guardBandFactor: null,
    ...over,
  }
}

const comp = (c: Partial<TemplateComponent>): TemplateComponent => ({
  name: 'c', type: 'B', distribution: 'standard', value: 0, coverageFactor: null, unit: 'K', input: 'reading', dof: null, ...c,
})

describe('expected reading, mean, error (reading model identity; VIM 2.16)', () => {
  it('with ε_i = ε_s and T_d = T_w the instrument should read T_s (ASTM E2758 form of the model)', () => {
    const r = computePoint(base())
    expect(Math.abs(r.expectedReadingK - 373.15)).toBeLessThan(1e-6)
    // Hand calculation: mean of 373.0, 373.2, 373.1, 373.3, 372.9 = 373.1; deviations −0.1, 0.1, 0, 0.2, −0.2,
    // Σd² = 0.1, s = √(0.1/4) = 0.158113883 (GUM 4.2.2, n − 1 in the denominator)
    expect(Math.abs(r.meanReadingK - 373.1)).toBeLessThan(1e-9)
    expect(Math.abs(r.stdDevK - 0.158113883)).toBeLessThan(1e-8)
    expect(r.n).toBe(5)
    expect(Math.abs(r.errorK - (373.1 - 373.15))).toBeLessThan(1e-6)
    expect(Math.abs(r.correctionK + r.errorK)).toBe(0)
    expect(r.engineVersion).toBe(ENGINE_VERSION)
  })

  it('the same identity holds for a tabulated responsivity (ε_i = ε_s, T_d = T_w)', () => {
    const r = computePoint(base({ band: { kind: 'tabulated', points: [[7, 0], [10, 1], [14, 0]] } }))
    expect(Math.abs(r.expectedReadingK - 373.15)).toBeLessThan(1e-6)
  })
})

describe('budget (GUM 4.2.3, 4.3.7, F.2.2.1, 5.1.2, G.4.1, Table G.2)', () => {
  it('Type A s/√n with ν = n − 1, resolution δ/√12, Welch–Satterthwaite and k from Table G.2', () => {
    const r = computePoint(base({ template: [comp({ name: 'Instrument ambient', value: 0.0476 })] }))
    const lines = r.budget.components
    expect(lines.map(l => l.name)).toEqual(['Instrument ambient', REPEATABILITY_NAME, RESOLUTION_NAME])
    // Hand calculation: u_A = s/√5 = 0.158113883/2.236067977 = 0.070710678 K, ν = 4 (GUM 4.2.3)
    const uA = 0.070710678
    expect(Math.abs(lines[1]!.standardUncertainty - uA)).toBeLessThan(1e-8)
    expect(lines[1]!.dof).toBe(4)
    expect(lines[1]!.type).toBe('A')
    // δ/√12 = 0.1/3.464101615 = 0.028867513 K (GUM F.2.2.1)
    expect(Math.abs(lines[2]!.standardUncertainty - 0.028867513)).toBeLessThan(1e-8)
    // u_c² = 0.005 + 0.0476² + 0.01/12 = 0.008099093 (GUM 5.1.2, all c = 1 on the reading)
    const uc2 = 0.005 + 0.0476 ** 2 + 0.01 / 12
    expect(Math.abs(r.budget.combinedStandardUncertaintyK - Math.sqrt(uc2))).toBeLessThan(1e-9)
    // ν_eff = u_c⁴ / (u_A⁴/4) = 10.49 (GUM G.2b); truncated to 10 → k = 2.28 (GUM Table G.2, p = 95.45 %)
    const nuEff = uc2 ** 2 / (uA ** 4 / 4)
    expect(Math.abs(r.budget.effectiveDegreesOfFreedom! - nuEff)).toBeLessThan(1e-3)
    expect(Math.abs(r.budget.coverageFactor - 2.28)).toBeLessThan(0.005)
    expect(r.budget.coverageProbability).toBe(0.9545)
    expect(Math.abs(r.budget.expandedUncertaintyK - r.budget.coverageFactor * Math.sqrt(uc2))).toBeLessThan(1e-12)
    // Percent shares sum to 100
    expect(Math.abs(lines.reduce((a, l) => a + l.percent, 0) - 100)).toBeLessThan(1e-9)
    // GUM 7.2.6: U ≈ 2.2837 × 0.089995 = 0.2055 → 0.21, the error −0.05 to the same place
    expect(r.rounded.uncertaintyText).toBe('0.21')
    expect(r.rounded.errorText).toBe('-0.05')
    expect(r.budget.cmcK).toBeNull()
    expect(r.budget.cmcApplied).toBe(false)
    expect(r.budget.statedUncertaintyK).toBe(r.budget.expandedUncertaintyK)
  })

  it('with one reading the repeatability is omitted and the budget says so', () => {
    const r = computePoint(base({ readingsK: [373.4] }))
    expect(r.stdDevK).toBe(0)
    expect(r.budget.components.map(l => l.name)).toEqual([RESOLUTION_NAME])
    expect(r.budget.notes).toEqual([SINGLE_READING_NOTE])
    // only infinite ν: ν_eff = ∞ (null) and k = 2.00 (GUM Table G.2, ν = ∞, p = 95.45 %)
    expect(r.budget.effectiveDegreesOfFreedom).toBeNull()
    expect(Math.abs(r.budget.coverageFactor - 2)).toBeLessThan(0.001)
  })

  it('emissivity sensitivities equal λT²/(c2·ε_i) in the Wien limit (domain primer §3; narrow band at 0.65 µm, 1000 K)', () => {
    const r = computePoint(base({
      band: { kind: 'rectangular', lambda1Um: 0.649, lambda2Um: 0.651 },
      reference: { kind: 'reference-thermometer', referenceReadingK: 1000 },
      sourceEmissivity: 0.9,
      emissivitySetting: 0.9,
      readingsK: [1000],
      resolutionK: 1,
      template: [
        comp({ name: 'Plate emissivity', distribution: 'rectangular', value: 1, unit: 'percent-of-emissivity', input: 'sourceEmissivity' }),
        comp({ name: 'Setting', distribution: 'rectangular', value: 0.01, unit: 'emissivity', input: 'emissivitySetting' }),
        comp({ name: 'Reference', distribution: 'normal', value: 50, coverageFactor: 2, unit: 'mK', input: 'sourceTemperature' }),
      ],
    }))
    // Wien: S/S' = λT²/c2 → ∂T/∂ε_s = λT²/(c2 ε_i), ∂T/∂ε_i = −λT²/(c2 ε_i); λ = 0.65 µm, T = 1000 K
    const wien = (0.65 * 1000 ** 2) / C2_UM_K / 0.9
    const [emis, setting, ref] = r.budget.components
    expect(Math.abs(emis!.sensitivity / wien - 1)).toBeLessThan(1e-4)
    expect(Math.abs(setting!.sensitivity / -wien - 1)).toBeLessThan(1e-4)
    // 1 % of ε = 0.9 is ±0.009, rectangular → 0.009/√3 (GUM 4.3.7)
    expect(Math.abs(emis!.standardUncertainty - 0.009 / Math.sqrt(3))).toBeLessThan(1e-12)
    expect(Math.abs(setting!.standardUncertainty - 0.01 / Math.sqrt(3))).toBeLessThan(1e-12)
    // 50 mK at k = 2 → 0.025 K; ∂T/∂T_s = ε_s S'(T_s)/(ε_i S'(T_meas)) = 1 when ε_s = ε_i (reading model)
    expect(Math.abs(ref!.standardUncertainty - 0.025)).toBeLessThan(1e-12)
    expect(Math.abs(ref!.sensitivity - 1)).toBeLessThan(1e-9)
    expect(Math.abs(emis!.contributionK - Math.abs(emis!.sensitivity) * emis!.standardUncertainty)).toBeLessThan(1e-12)
  })

  it('triangular a/√6 and U-shaped a/√2 (GUM 4.3.9; arcsine distribution)', () => {
    expect(Math.abs(templateStandardUncertainty(comp({ distribution: 'triangular', value: 0.6 }), 0) - 0.6 / Math.sqrt(6))).toBeLessThan(1e-15)
    expect(Math.abs(templateStandardUncertainty(comp({ distribution: 'u-shaped', value: 0.6 }), 0) - 0.6 / Math.SQRT2)).toBeLessThan(1e-15)
  })
})

describe('CMC floor', () => {
  it('states the CMC when it is above the computed U, and flags it', () => {
    const r = computePoint(base({ template: [comp({ value: 50, unit: 'mK' })], cmc: [{ minK: 300, maxK: 400, expandedUncertaintyK: 1 }] }))
    expect(r.budget.expandedUncertaintyK).toBeLessThan(1)
    expect(r.budget.cmcK).toBe(1)
    expect(r.budget.statedUncertaintyK).toBe(1)
    expect(r.budget.cmcApplied).toBe(true)
    expect(r.rounded.uncertaintyText).toBe('1.0')
  })
  it('keeps the computed U when it is above the CMC, and ignores ranges that do not hold T_s', () => {
    const r = computePoint(base({ template: [comp({ value: 2 })], cmc: [{ minK: 300, maxK: 400, expandedUncertaintyK: 0.5 }] }))
    expect(r.budget.cmcApplied).toBe(false)
    expect(r.budget.statedUncertaintyK).toBe(r.budget.expandedUncertaintyK)
    expect(cmcAt([{ minK: 400, maxK: 500, expandedUncertaintyK: 0.5 }], 373.15)).toBeNull()
    expect(cmcAt([{ minK: 300, maxK: 400, expandedUncertaintyK: 0.5 }, { minK: 373.15, maxK: 500, expandedUncertaintyK: 0.7 }], 373.15)).toBe(0.7)
  })
})

describe('conformity (ILAC-G8:09/2019 rules, tolerance ±1 K, stated U = CMC 0.5 K)', () => {
  // One reading 374.0 K on T_s = 373.15 K: E = +0.85 K; U from the CMC floor, 0.5 K.
  const at = (reading: number, rule: PointComputationInput['rule'], r: number | null = null) =>
    computePoint(base({ readingsK: [reading], cmc: [{ minK: 300, maxK: 400, expandedUncertaintyK: 0.5 }], rule, guardBandFactor: r })).conformity
  it('simple acceptance: |E| = 0.85 ≤ TL = 1 → pass', () => {
    const c = at(374.0, 'simple-acceptance')
    expect(c.verdict).toBe('pass')
    expect(c.guardBand).toBe(0)
    expect(c.tolerance).toBe(1)
  })
  it('guard band w = U = 0.5: acceptance limit 0.5 < 0.85 → fail; with r = 0.2, w = 0.1 → pass', () => {
    const c = at(374.0, 'guard-band', 1)
    expect(c.verdict).toBe('fail')
    expect(Math.abs(c.acceptanceLimit - 0.5)).toBeLessThan(1e-12)
    expect(at(374.0, 'guard-band', 0.2).verdict).toBe('pass')
  })
  it('non-binary: 0.85 → conditional pass, 1.25 → conditional fail, 2.15 → fail, 0.35 → pass', () => {
    expect(at(374.0, 'non-binary', 1).verdict).toBe('conditional-pass')
    expect(at(374.4, 'non-binary', 1).verdict).toBe('conditional-fail')
    expect(at(375.3, 'non-binary', 1).verdict).toBe('fail')
    expect(at(373.5, 'non-binary', 1).verdict).toBe('pass')
    expect(at(374.0, 'non-binary', 1).statement).toMatch(/Conditional pass/)
  })
  it('takes "% of reading" at the mean reading in °C (makers’ convention): 1 % of 100 °C = 1 K', () => {
    const c = computePoint(base({ accuracy: { kind: 'percentOfReading', a: 1 }, readingsK: [373.15] })).conformity
    expect(Math.abs(c.tolerance - 1)).toBeLessThan(1e-9)
  })
})

describe('reference temperature from the source certificate (linear interpolation, no extrapolation)', () => {
  const corrections: [number, number][] = [[323.15, 0.12], [373.15, 0.2]]
  it('interpolates: half-way between 0.12 and 0.20 K is 0.16 K', () => {
    const r = referenceTemperature({ kind: 'source-correction', sourceIndicatedK: 348.15, corrections })
    expect(Math.abs(r.sourceCorrectionK! - 0.16)).toBeLessThan(1e-12)
    expect(Math.abs(r.referenceTemperatureK - 348.31)).toBeLessThan(1e-9)
    const p = computePoint(base({ reference: { kind: 'source-correction', sourceIndicatedK: 348.15, corrections } }))
    expect(Math.abs(p.expectedReadingK - 348.31)).toBeLessThan(1e-6)
  })
  it('refuses a set-point outside the table, naming sourceIndicatedK', () => {
    const outside = () => computePoint(base({ reference: { kind: 'source-correction', sourceIndicatedK: 400, corrections } }))
    expect(outside).toThrow(EngineInputError)
    expect(outside).toThrow(expect.objectContaining({ field: 'sourceIndicatedK' }))
  })
})

describe('bad input names the field', () => {
  const fieldOf = (over: Partial<PointComputationInput>) => {
    try {
      computePoint(base(over))
      return null
    }
    catch (e) {
      return e instanceof EngineInputError ? e.field : 'not an EngineInputError'
    }
  }
  it('readings, resolution, template units, the model', () => {
    expect(fieldOf({ readingsK: [] })).toBe('readingsK')
    expect(fieldOf({ readingsK: [373, Number.NaN] })).toBe('readingsK[1]')
    expect(fieldOf({ resolutionK: 0 })).toBe('resolutionK')
    expect(fieldOf({ template: [comp({ unit: 'K', input: 'sourceEmissivity' })] })).toBe('template[0].unit')
    expect(fieldOf({ template: [comp({ distribution: 'normal', value: 1 })] })).toBe('template[0].coverageFactor')
    // A cold plate read with a low emissivity setting from a hot instrument: no reading satisfies the model
    expect(fieldOf({ reference: { kind: 'reference-thermometer', referenceReadingK: 250 }, sourceEmissivity: 0.5, emissivitySetting: 0.1, instrumentTemperatureK: 320, reflectedTemperatureK: 250 })).toBe('instrumentTemperatureK')
  })
})

describe('reproducibility', () => {
  it('computing again from the stored inputs gives the same result', () => {
    const r = computePoint(base({ template: [comp({ name: 'x', distribution: 'rectangular', value: 0.2, input: 'sourceTemperature' })] }))
    const again = computePoint(JSON.parse(JSON.stringify(r.inputs)))
    expect(JSON.parse(JSON.stringify(again))).toEqual(JSON.parse(JSON.stringify(r)))
  })
})
