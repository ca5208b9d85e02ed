// Judging intermediate checks, the combined proficiency verdict, and the as-found correction at a
// temperature. Expected values are computed by hand from the definitions: E_n = d/√(U₁² + U₂²) and its
// criterion |E_n| ≤ 1 (ISO 13528:2015 9.7, clause number from memory); z = (x − X)/σ_pt with |z| ≤ 2
// satisfactory, 2 < |z| < 3 questionable, |z| ≥ 3 unsatisfactory (ISO 13528:2015 9.4); linear
// interpolation between table rows. Decimal inputs are chosen so the binary difference lands a few ulps
// off the limit (273.25 − 273.15 = 0.10000000000002274), which the rounding bound must absorb.
import { describe, expect, it } from 'vitest'
import { EngineInputError } from '../../../shared/radiometry/errors'
import { evaluateCheck, evaluateProficiency, referenceCorrectionAt } from '../../../shared/quality'

function fieldOf(f: () => unknown): string {
  try {
    f()
  } catch (e) {
    expect(e).toBeInstanceOf(EngineInputError)
    return (e as EngineInputError).field
  }
  return 'no error'
}

describe('evaluateCheck', () => {
  it('limit rule: |d| on the limit passes, just beyond fails', () => {
    expect(273.25 - 273.15).toBeGreaterThan(0.1) // guard: the case exercises the rounding bound
    const on = evaluateCheck({ nominalK: 273.15, measuredK: 273.25, acceptance: 'limit', acceptanceLimitK: 0.1 })
    expect(on.verdict).toBe('pass')
    expect(on.deviationK).toBeCloseTo(0.1, 12)
    expect(on.en).toBeNull()
    expect(evaluateCheck({ nominalK: 373.15, measuredK: 372.65, acceptance: 'limit', acceptanceLimitK: 0.5 }).verdict).toBe('pass')
    const beyond = evaluateCheck({ nominalK: 373.15, measuredK: 373.651, acceptance: 'limit', acceptanceLimitK: 0.5 })
    expect(beyond.verdict).toBe('fail')
    expect(beyond.statement).toBe('Deviation +0.501 K exceeds the limit ±0.5 K')
  })

  it('E_n rule: d = 0.5 K with U = 0.4 K and 0.3 K gives E_n = 1 (pass); d = 0.51 K gives 1.02 (fail)', () => {
    const one = evaluateCheck({ nominalK: 373.15, measuredK: 373.65, acceptance: 'en', expandedUncertaintyK: 0.4, nominalUncertaintyK: 0.3 })
    expect(one.en).toBeCloseTo(1, 12)
    expect(one.verdict).toBe('pass')
    const over = evaluateCheck({ nominalK: 373.15, measuredK: 373.66, acceptance: 'en', expandedUncertaintyK: 0.4, nominalUncertaintyK: 0.3 })
    expect(over.en).toBeCloseTo(1.02, 12)
    expect(over.verdict).toBe('fail')
    expect(evaluateCheck({ nominalK: 373.15, measuredK: 372.64, acceptance: 'en', expandedUncertaintyK: 0.4, nominalUncertaintyK: 0.3 }).verdict).toBe('fail')
  })

  it('rejects what it cannot judge, naming the API field', () => {
    expect(fieldOf(() => evaluateCheck({ nominalK: 0, measuredK: 300, acceptance: 'limit', acceptanceLimitK: 1 }))).toBe('nominalK')
    expect(fieldOf(() => evaluateCheck({ nominalK: 300, measuredK: Number.NaN, acceptance: 'limit', acceptanceLimitK: 1 }))).toBe('measuredK')
    expect(fieldOf(() => evaluateCheck({ nominalK: 300, measuredK: 300, acceptance: 'limit', acceptanceLimitK: null }))).toBe('acceptanceLimitK')
    expect(fieldOf(() => evaluateCheck({ nominalK: 300, measuredK: 300, acceptance: 'en', nominalUncertaintyK: 0.1 }))).toBe('expandedUncertaintyK')
    expect(fieldOf(() => evaluateCheck({ nominalK: 300, measuredK: 300, acceptance: 'en', expandedUncertaintyK: 0.1 }))).toBe('nominalUncertaintyK')
    expect(fieldOf(() => evaluateCheck({ nominalK: 300, measuredK: 300, acceptance: 'en', expandedUncertaintyK: 0, nominalUncertaintyK: 0 }))).toBe('expandedUncertaintyK')
    expect(fieldOf(() => evaluateCheck({ nominalK: 300, measuredK: 300, acceptance: 'ratio' as never }))).toBe('acceptance')
  })
})

describe('evaluateProficiency', () => {
  const base = { labValue: 373.45, labExpandedUncertainty: 0.3, referenceValue: 373.15, referenceExpandedUncertainty: 0.4 }
  it('E_n only when the scheme gives no σ_pt: E_n = 0.3/0.5 = 0.6, satisfactory', () => {
    const r = evaluateProficiency(base)
    expect(r.en.en).toBeCloseTo(0.6, 12)
    expect(r.z).toBeNull()
    expect(r.verdict).toBe('satisfactory')
  })
  it('the worse of E_n and z: z = 0.3/0.12 = 2.5 is questionable while E_n is satisfactory', () => {
    const r = evaluateProficiency({ ...base, standardDeviationForProficiency: 0.12 })
    expect(r.z!.z).toBeCloseTo(2.5, 12)
    expect(r.verdict).toBe('questionable')
  })
  it('an unsatisfactory E_n is not hidden by a satisfactory z: E_n = 0.3/0.1 = 3, z = 0.3/0.2 = 1.5', () => {
    const r = evaluateProficiency({ labValue: 373.45, labExpandedUncertainty: 0.06, referenceValue: 373.15, referenceExpandedUncertainty: 0.08, standardDeviationForProficiency: 0.2 })
    expect(r.en.en).toBeCloseTo(3, 12)
    expect(r.z!.verdict).toBe('satisfactory')
    expect(r.verdict).toBe('unsatisfactory')
  })
})

describe('referenceCorrectionAt', () => {
  const rows: [number, number][] = [[373.15, -0.3], [323.15, -0.1]]
  it('interpolates linearly inside the rows, any order: halfway between −0.1 and −0.3 is −0.2', () => {
    expect(referenceCorrectionAt(rows, 348.15)).toBeCloseTo(-0.2, 12)
    expect(referenceCorrectionAt(rows, 323.15)).toBe(-0.1)
    expect(referenceCorrectionAt(rows, 373.15)).toBe(-0.3)
  })
  it('uses the nearest row within the margin outside the data, and says nothing farther out', () => {
    expect(referenceCorrectionAt(rows, 374.15)).toBe(-0.3)
    expect(referenceCorrectionAt(rows, 374.16)).toBeNull()
    expect(referenceCorrectionAt(rows, 322.65, 0.5)).toBe(-0.1)
    expect(referenceCorrectionAt(rows, 322.64, 0.5)).toBeNull()
    expect(referenceCorrectionAt([], 300)).toBeNull()
  })
  it('a single row applies within ±margin; rows at the same temperature are averaged', () => {
    expect(referenceCorrectionAt([[473.15, 0.8]], 473.65)).toBe(0.8)
    expect(referenceCorrectionAt([[473.15, 0.8]], 475.15)).toBeNull()
    expect(referenceCorrectionAt([[300, 0.2], [300, 0.4]], 300)).toBeCloseTo(0.3, 14)
  })
  it('rejects bad input, naming it', () => {
    expect(fieldOf(() => referenceCorrectionAt(rows, 0))).toBe('temperatureK')
    expect(fieldOf(() => referenceCorrectionAt(rows, 300, -1))).toBe('marginK')
    expect(fieldOf(() => referenceCorrectionAt([[300, Number.NaN]], 300))).toBe('rows[0]')
  })
})
