// Re-evaluation of issued points after a reference is found out of tolerance (ISO/IEC 17025:2017 7.10).
// Expected values are hand-computed from E′ = E − c·δ and the ILAC-G8:09/2019 decision rules as
// implemented in shared/uncertainty/conformity.ts (simple acceptance: |E| ≤ TL; guard band w = r·U:
// |E| ≤ TL − w; non-binary: pass / conditional pass / conditional fail / fail). The first-order shift is
// checked against the full reading model (ASTM E2758/E2847 form, shared/radiometry/reading.ts) solved
// at T_s and T_s + δ.
import { describe, expect, it } from 'vitest'
import { EngineInputError } from '../../../shared/radiometry/errors'
import { expectedReadingK, readingSensitivities } from '../../../shared/radiometry/reading'
import { reevaluatePoint, type ImpactInput } from '../../../shared/quality'

function fieldOf(f: () => unknown): string {
  try {
    f()
  } catch (e) {
    expect(e).toBeInstanceOf(EngineInputError)
    return (e as EngineInputError).field
  }
  return 'no error'
}

describe('re-evaluating a point after a reference correction', () => {
  it('guard band: a shift within U still turns a pass into a fail (E 0.6 → 0.8 against TL − U = 0.7)', () => {
    const r = reevaluatePoint({ error: 0.6, expandedUncertainty: 0.3, tolerance: 1, rule: 'guard-band', verdict: 'pass', referenceCorrection: -0.2, sensitivity: 1 })
    expect(r.errorShift).toBeCloseTo(0.2, 15)
    expect(r.correctedError).toBeCloseTo(0.8, 15)
    expect(r.withinUncertainty).toBe(true)
    expect(r.recomputedVerdict).toBe('pass')
    expect(r.correctedVerdict).toBe('fail')
    expect(r).toMatchObject({ verdictChanged: true, assessment: 'verdict-changed', statedVerdictReproduced: true })
    expect(r.correctedDecision.acceptanceLimit).toBeCloseTo(0.7, 15)
    expect(r.statement).toBe(
      'Reference corrected by δ = -0.2 K with sensitivity c = 1: the error moves by 0.2 K from 0.6 K to 0.8 K, within the stated U = 0.3 K; '
      + 'under ILAC-G8:09/2019, guarded acceptance (w = r·U) the verdict changes from pass to fail.',
    )
  })

  it('sign: a reference that was really hotter (δ > 0) raises the expected reading and lowers E', () => {
    // E′ = 0.5 − 0.9·0.4 = 0.14
    const r = reevaluatePoint({ error: 0.5, expandedUncertainty: 0.2, tolerance: 1, rule: 'simple-acceptance', verdict: 'pass', referenceCorrection: 0.4, sensitivity: 0.9 })
    expect(r.errorShift).toBeCloseTo(-0.36, 15)
    expect(r.correctedError).toBeCloseTo(0.14, 15)
    expect(r.withinUncertainty).toBe(false) // 0.36 > 0.2
    expect(r.assessment).toBe('exceeds-uncertainty')
  })

  it('within uncertainty, verdict unchanged (simple acceptance; E 0.2 → 0.102)', () => {
    const r = reevaluatePoint({ error: 0.2, expandedUncertainty: 0.3, tolerance: 1, rule: 'simple-acceptance', verdict: 'pass', referenceCorrection: 0.1, sensitivity: 0.98 })
    expect(r.correctedError).toBeCloseTo(0.102, 15)
    expect(r).toMatchObject({ withinUncertainty: true, verdictChanged: false, assessment: 'within-uncertainty', correctedVerdict: 'pass' })
  })

  it('non-binary: a conditional pass can become a pass (E 0.85 → 0.35 with w = U = 0.3)', () => {
    const r = reevaluatePoint({ error: 0.85, expandedUncertainty: 0.3, tolerance: 1, rule: 'non-binary', verdict: 'conditional-pass', referenceCorrection: 0.5, sensitivity: 1 })
    expect(r.recomputedVerdict).toBe('conditional-pass')
    expect(r.correctedVerdict).toBe('pass')
    expect(r.assessment).toBe('verdict-changed')
    // … and a fail becomes a conditional fail: E −1.5 → −1.2 with TL + w = 1.3
    const f = reevaluatePoint({ error: -1.5, expandedUncertainty: 0.3, tolerance: 1, rule: 'non-binary', verdict: 'fail', referenceCorrection: -0.3, sensitivity: 1 })
    expect(f.correctedError).toBeCloseTo(-1.2, 15)
    expect(f.correctedVerdict).toBe('conditional-fail')
  })

  it('|Δ| = U counts as within, also when the product is one ulp above (0.1 × 3 = 0.30000000000000004)', () => {
    const base: ImpactInput = { error: 0, expandedUncertainty: 0.3, tolerance: 1, rule: 'simple-acceptance', verdict: 'pass', referenceCorrection: 0.3, sensitivity: 1 }
    expect(reevaluatePoint(base).withinUncertainty).toBe(true)
    const ulp = reevaluatePoint({ ...base, referenceCorrection: 3, sensitivity: 0.1 })
    expect(Math.abs(ulp.errorShift)).toBeGreaterThan(0.3) // guard: the case exercises the allowance
    expect(ulp.withinUncertainty).toBe(true)
    expect(reevaluatePoint({ ...base, referenceCorrection: 0.3001 }).withinUncertainty).toBe(false)
  })

  it('no correction: no effect', () => {
    const r = reevaluatePoint({ error: 0.4, expandedUncertainty: 0.3, tolerance: 1, rule: 'guard-band', verdict: 'pass', referenceCorrection: 0, sensitivity: 0.97 })
    expect(r).toMatchObject({ errorShift: -0, correctedError: 0.4, assessment: 'no-effect', verdictChanged: false })
  })

  it('a stated verdict the rule does not reproduce is reported, and compared as stated', () => {
    // E 0.75 > TL − U = 0.7 under the guard band: the rule says fail, the certificate said pass
    const r = reevaluatePoint({ error: 0.75, expandedUncertainty: 0.3, tolerance: 1, rule: 'guard-band', verdict: 'pass', referenceCorrection: 0.01, sensitivity: 1 })
    expect(r.statedVerdictReproduced).toBe(false)
    expect(r.recomputedVerdict).toBe('fail')
    expect(r.verdictChanged).toBe(true) // stated pass → corrected fail (E′ = 0.74)
    expect(r.statement).toMatch(/Note: the rule applied to the stated error gives fail, not the stated pass\./)
  })

  it('first-order shift agrees with the full reading model (8–14 µm, ε_s = ε_i = 0.95 at 373.15 K, δ = −0.3 K)', () => {
    const model = {
      band: { kind: 'rectangular' as const, lambda1Um: 8, lambda2Um: 14 },
      sourceTemperatureK: 373.15,
      sourceEmissivity: 0.95,
      reflectedTemperatureK: 296.15,
      instrumentTemperatureK: 296.15,
      emissivitySetting: 1,
    }
    const c = readingSensitivities(model).sourceTemperature
    const delta = -0.3
    const exactShift = -(expectedReadingK({ ...model, sourceTemperatureK: 373.15 + delta }) - expectedReadingK(model))
    const r = reevaluatePoint({ error: -3.1, expandedUncertainty: 0.8, tolerance: 4, rule: 'simple-acceptance', verdict: 'pass', referenceCorrection: delta, sensitivity: c })
    expect(c).toBeGreaterThan(0.9)
    expect(c).toBeLessThan(1)
    expect(Math.abs(r.errorShift - exactShift)).toBeLessThan(1e-5) // second-order term: 3.2e-6 K here (c = 0.96579)
  })

  it('rejects bad input with the API field name', () => {
    const ok: ImpactInput = { error: 0.1, expandedUncertainty: 0.3, tolerance: 1, rule: 'guard-band', verdict: 'pass', referenceCorrection: 0.1, sensitivity: 1 }
    expect(fieldOf(() => reevaluatePoint({ ...ok, verdict: 'ok' as never }))).toBe('verdict')
    expect(fieldOf(() => reevaluatePoint({ ...ok, referenceCorrection: Number.NaN }))).toBe('referenceCorrection')
    expect(fieldOf(() => reevaluatePoint({ ...ok, sensitivity: Number.POSITIVE_INFINITY }))).toBe('sensitivity')
    expect(fieldOf(() => reevaluatePoint({ ...ok, error: Number.NaN }))).toBe('error')
    expect(fieldOf(() => reevaluatePoint({ ...ok, expandedUncertainty: -1 }))).toBe('expandedUncertainty')
    expect(fieldOf(() => reevaluatePoint({ ...ok, tolerance: 0 }))).toBe('tolerance')
    expect(fieldOf(() => reevaluatePoint({ ...ok, rule: 'strict' as never }))).toBe('rule')
    expect(fieldOf(() => reevaluatePoint({ ...ok, guardBandFactor: -1 }))).toBe('guardBandFactor')
  })
})
