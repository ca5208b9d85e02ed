import { describe, expect, it } from 'vitest'
import { decideConformity, EngineInputError, evaluateConformity, toleranceLimit, type DecisionRule } from '../../../shared/uncertainty'

describe('tolerance limit of an accuracy specification', () => {
  it('"±1 % of reading or ±1 °C, whichever is greater" on the reading in °C (common practice)', () => {
    const spec = { kind: 'greaterOf', a: 1, b: 1 } as const
    expect(toleranceLimit(spec, 773.15)).toBeCloseTo(5, 12) // 500 °C → 5 °C
    expect(toleranceLimit(spec, 373.15)).toBeCloseTo(1, 12) // 100 °C → 1 % = 1 °C
    expect(toleranceLimit(spec, 273.15)).toBe(1) // 0 °C → 1 °C floor
    expect(toleranceLimit(spec, 233.15)).toBe(1) // −40 °C → 0.4 °C < 1 °C
    expect(toleranceLimit(spec, 1273.15)).toBeCloseTo(10, 12)
  })

  it('other forms and the kelvin basis', () => {
    expect(toleranceLimit({ kind: 'absolute', b: 2 }, 500)).toBe(2)
    expect(toleranceLimit({ kind: 'percentOfReading', a: 1 }, 773.15)).toBeCloseTo(5, 12)
    expect(toleranceLimit({ kind: 'percentOfReading', a: 1 }, 773.15, 'kelvin')).toBeCloseTo(7.7315, 12)
    expect(toleranceLimit({ kind: 'percentOfReading', a: 2 }, 233.15)).toBeCloseTo(0.8, 12) // |−40 °C|
    expect(toleranceLimit({ kind: 'percentPlus', a: 0.5, b: 1 }, 473.15)).toBeCloseTo(2, 12) // 0.5 % of 200 °C + 1
  })

  it('rejects bad specifications', () => {
    const field = (f: () => unknown): string => {
      try {
        f()
      } catch (e) {
        expect(e).toBeInstanceOf(EngineInputError)
        return (e as EngineInputError).field
      }
      return 'no error'
    }
    expect(field(() => toleranceLimit({ kind: 'ppm' } as never, 300))).toBe('spec.kind')
    expect(field(() => toleranceLimit({ kind: 'greaterOf', a: -1, b: 1 }, 300))).toBe('spec.a')
    expect(field(() => toleranceLimit({ kind: 'absolute', b: Number.NaN }, 300))).toBe('spec.b')
    expect(field(() => toleranceLimit({ kind: 'absolute', b: 1 }, 0))).toBe('readingK')
    expect(field(() => toleranceLimit({ kind: 'absolute', b: 1 }, 300, 'rankine' as never))).toBe('percentBasis')
    expect(field(() => evaluateConformity({ spec: { kind: 'percentOfReading', a: 1 }, readingK: 273.15, error: 0, expandedUncertainty: 0.1, rule: 'simple-acceptance' }))).toBe('spec')
  })
})

describe('decision rules (ILAC-G8:09/2019)', () => {
  const d = (error: number, rule: DecisionRule, extra: { U?: number; TL?: number; r?: number } = {}) =>
    decideConformity({ error, expandedUncertainty: extra.U ?? 0.25, tolerance: extra.TL ?? 1, rule, ...(extra.r !== undefined ? { guardBandFactor: extra.r } : {}) })

  it('simple acceptance: pass up to and at the limit, fail beyond (w = 0)', () => {
    expect(d(0, 'simple-acceptance').verdict).toBe('pass')
    expect(d(1, 'simple-acceptance').verdict).toBe('pass')
    expect(d(-1, 'simple-acceptance').verdict).toBe('pass')
    expect(d(1.001, 'simple-acceptance').verdict).toBe('fail')
    expect(d(-1.001, 'simple-acceptance').verdict).toBe('fail')
    expect(d(0.9, 'simple-acceptance', { U: 5 }).verdict).toBe('pass') // U plays no part
    expect(d(0.5, 'simple-acceptance').guardBand).toBe(0)
  })

  it('guard band w = r·U: accept only within TL − w', () => {
    const r = d(0.75, 'guard-band')
    expect(r.guardBand).toBe(0.25)
    expect(r.acceptanceLimit).toBe(0.75)
    expect(r.verdict).toBe('pass')
    expect(d(-0.75, 'guard-band').verdict).toBe('pass')
    expect(d(0.76, 'guard-band').verdict).toBe('fail')
    expect(d(0.95, 'guard-band').verdict).toBe('fail') // inside TL but inside the guard band
    expect(d(0.6, 'guard-band', { r: 2 }).verdict).toBe('fail') // w = 0.5
    expect(d(0.5, 'guard-band', { r: 2 }).verdict).toBe('pass')
    expect(d(0, 'guard-band', { U: 1.2 }).verdict).toBe('fail') // U > TL: nothing can pass
  })

  it('non-binary: pass, conditional pass, conditional fail, fail', () => {
    const v = (e: number): string => d(e, 'non-binary').verdict
    expect(v(0.7)).toBe('pass')
    expect(v(0.75)).toBe('pass')
    expect(v(0.8)).toBe('conditional-pass')
    expect(v(1)).toBe('conditional-pass')
    expect(v(1.1)).toBe('conditional-fail')
    expect(v(1.25)).toBe('conditional-fail')
    expect(v(1.3)).toBe('fail')
    expect(v(-1.1)).toBe('conditional-fail')
    expect(v(-0.2)).toBe('pass')
    expect(d(0, 'non-binary', { U: 1.2 }).verdict).toBe('conditional-pass')
  })

  it('absorbs binary rounding at a limit computed from a specification', () => {
    // 1.5 % of 60 °C is 0.9 K, but (333.15 − 273.15)·1.5/100 is 0.8999999999999999 in binary:
    // an error of exactly 0.9 K is on the limit and passes
    expect(toleranceLimit({ kind: 'percentOfReading', a: 1.5 }, 333.15)).toBeLessThan(0.9)
    const r = evaluateConformity({ spec: { kind: 'percentOfReading', a: 1.5 }, readingK: 333.15, error: 0.9, expandedUncertainty: 0.2, rule: 'simple-acceptance' })
    expect(r.verdict).toBe('pass')
    expect(r.percentBasis).toBe('celsius')
    expect(evaluateConformity({ spec: { kind: 'percentOfReading', a: 1.5 }, readingK: 333.15, error: 0.9000001, expandedUncertainty: 0.2, rule: 'simple-acceptance' }).verdict).toBe('fail')
  })

  it('names the rule, tolerance, guard band and verdict in the result', () => {
    const r = evaluateConformity({ spec: { kind: 'greaterOf', a: 1, b: 1 }, readingK: 373.15, error: -0.6, expandedUncertainty: 0.5, rule: 'guard-band' })
    expect(r.rule).toBe('guard-band')
    expect(r.ruleReference).toMatch(/ILAC-G8:09\/2019/)
    expect(r.tolerance).toBeCloseTo(1, 12)
    expect(r.guardBand).toBe(0.5)
    expect(r.verdict).toBe('fail')
    expect(r.statement).toMatch(/^Fail/)
  })

  it('rejects bad decision inputs', () => {
    expect(() => decideConformity({ error: 0, expandedUncertainty: 0.1, tolerance: 1, rule: 'shared-risk' as never })).toThrow(EngineInputError)
    expect(() => decideConformity({ error: Number.NaN, expandedUncertainty: 0.1, tolerance: 1, rule: 'guard-band' })).toThrow(EngineInputError)
    expect(() => decideConformity({ error: 0, expandedUncertainty: -0.1, tolerance: 1, rule: 'guard-band' })).toThrow(EngineInputError)
    expect(() => decideConformity({ error: 0, expandedUncertainty: 0.1, tolerance: 0, rule: 'guard-band' })).toThrow(EngineInputError)
    expect(() => decideConformity({ error: 0, expandedUncertainty: 0.1, tolerance: 1, rule: 'guard-band', guardBandFactor: -1 })).toThrow(EngineInputError)
  })
})
