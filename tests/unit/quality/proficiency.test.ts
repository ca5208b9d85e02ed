// Proficiency-testing statistics. Formulas and limits: ISO 13528:2015 9.4 (z), 9.5 (z′), 9.6 (ζ),
// 9.7 (E_n) and ISO/IEC 17043:2010 B.4.1.1 — clause numbers from memory. The expected values are
// computed by hand from those formulas (3-4-5 triangles keep the denominators exact).
// The floating-point cases are what IEEE 754 doubles give for those decimal inputs (checked with
// Python's float, the same arithmetic; the printed value is quoted beside each case).
import { describe, expect, it } from 'vitest'
import { EngineInputError } from '../../../shared/radiometry/errors'
import { enNumber, zetaScore, zPrimeScore, zScore } from '../../../shared/quality'

function fieldOf(f: () => unknown): string {
  try {
    f()
  } catch (e) {
    expect(e).toBeInstanceOf(EngineInputError)
    return (e as EngineInputError).field
  }
  return 'no error'
}

describe('E_n number (ISO 13528:2015 9.7, from memory)', () => {
  it('hand-computed: (373.45 − 373.15)/√(0.3² + 0.4²) = 0.3/0.5 = 0.6', () => {
    const r = enNumber({ labValue: 373.45, labExpandedUncertainty: 0.3, referenceValue: 373.15, referenceExpandedUncertainty: 0.4 })
    expect(r.en).toBeCloseTo(0.6, 12)
    expect(r.denominator).toBeCloseTo(0.5, 15)
    expect(r.difference).toBeCloseTo(0.3, 12)
    expect(r.verdict).toBe('satisfactory')
  })

  it('hand-computed: −0.6/0.5 = −1.2 is unsatisfactory (the sign does not matter)', () => {
    const r = enNumber({ labValue: 372.55, labExpandedUncertainty: 0.3, referenceValue: 373.15, referenceExpandedUncertainty: 0.4 })
    expect(r.en).toBeCloseTo(-1.2, 12)
    expect(r.verdict).toBe('unsatisfactory')
  })

  it('one uncertainty zero is allowed: E_n = (x − X)/U', () => {
    expect(enNumber({ labValue: 10.5, labExpandedUncertainty: 0, referenceValue: 10, referenceExpandedUncertainty: 1 }).en).toBe(0.5)
  })

  it('boundary: |E_n| = 1 exactly is satisfactory, 1 + 1e-12 is not', () => {
    const at = (x: number) => enNumber({ labValue: x, labExpandedUncertainty: 0.6, referenceValue: 0, referenceExpandedUncertainty: 0.8 })
    expect(at(1).en).toBe(1) // 1/hypot(0.6, 0.8) = 1/1
    expect(at(1).verdict).toBe('satisfactory')
    expect(at(-1).verdict).toBe('satisfactory')
    expect(at(1 + 1e-12).verdict).toBe('unsatisfactory') // rounding bound here ≈ 7e-15
    expect(at(-1 - 1e-12).verdict).toBe('unsatisfactory')
    expect(at(1 - 1e-12).verdict).toBe('satisfactory')
  })

  it('boundary in kelvin: decimal inputs exactly on |E_n| = 1 whose double is a few ulps off still count as on it', () => {
    // (373.25 − 373.15)/√(0.06² + 0.08²): exactly 0.1/0.1 = 1 in decimal; doubles give 1.0000000000002274
    const up = enNumber({ labValue: 373.25, labExpandedUncertainty: 0.06, referenceValue: 373.15, referenceExpandedUncertainty: 0.08 })
    expect(up.en).toBeGreaterThan(1) // guard: the case really exercises the rounding allowance
    expect(up.verdict).toBe('satisfactory')
    // 1000.1 − 1000 over 0.1: −1.0000000000002274 for 999.9
    const down = enNumber({ labValue: 999.9, labExpandedUncertainty: 0.06, referenceValue: 1000, referenceExpandedUncertainty: 0.08 })
    expect(down.en).toBeLessThan(-1)
    expect(down.verdict).toBe('satisfactory')
    // but 0.1 µK more is a real excess (≈ 1e-6 in E_n, far above the ≈ 2e-11 rounding bound)
    expect(enNumber({ labValue: 373.2500001, labExpandedUncertainty: 0.06, referenceValue: 373.15, referenceExpandedUncertainty: 0.08 }).verdict).toBe('unsatisfactory')
  })

  it('rejects bad input with the API field name', () => {
    const ok = { labValue: 1, labExpandedUncertainty: 0.1, referenceValue: 1, referenceExpandedUncertainty: 0.1 }
    expect(fieldOf(() => enNumber({ ...ok, labExpandedUncertainty: 0, referenceExpandedUncertainty: 0 }))).toBe('labExpandedUncertainty')
    expect(fieldOf(() => enNumber({ ...ok, labValue: Number.NaN }))).toBe('labValue')
    expect(fieldOf(() => enNumber({ ...ok, referenceValue: Number.POSITIVE_INFINITY }))).toBe('referenceValue')
    expect(fieldOf(() => enNumber({ ...ok, labExpandedUncertainty: -0.1 }))).toBe('labExpandedUncertainty')
    expect(fieldOf(() => enNumber({ ...ok, referenceExpandedUncertainty: -0.1 }))).toBe('referenceExpandedUncertainty')
  })
})

describe('z score (ISO 13528:2015 9.4, from memory)', () => {
  const z = (labValue: number, assignedValue = 0, sd = 1) => zScore({ labValue, assignedValue, standardDeviationForProficiency: sd })

  it('hand-computed: (373.45 − 373.15)/0.12 = 2.5, questionable', () => {
    const r = z(373.45, 373.15, 0.12)
    expect(r.z).toBeCloseTo(2.5, 10)
    expect(r.score).toBe(r.z)
    expect(r.verdict).toBe('questionable')
  })

  it('the three classes away from the limits', () => {
    expect(z(0).verdict).toBe('satisfactory')
    expect(z(1.5).verdict).toBe('satisfactory')
    expect(z(-2.5).verdict).toBe('questionable')
    expect(z(3.5).verdict).toBe('unsatisfactory')
    expect(z(-4).verdict).toBe('unsatisfactory')
  })

  it('boundary at 2: |z| = 2 is satisfactory, 2 ± 1e-12 falls on either side', () => {
    expect(z(2).verdict).toBe('satisfactory')
    expect(z(-2).verdict).toBe('satisfactory')
    expect(z(2 - 1e-12).verdict).toBe('satisfactory')
    expect(z(2 + 1e-12).verdict).toBe('questionable') // rounding bound ≈ 7e-15
    expect(z(-2 - 1e-12).verdict).toBe('questionable')
  })

  it('boundary at 3: |z| = 3 is unsatisfactory, 3 − 1e-12 is still questionable', () => {
    expect(z(3).verdict).toBe('unsatisfactory')
    expect(z(-3).verdict).toBe('unsatisfactory')
    expect(z(3 - 1e-12).verdict).toBe('questionable')
    expect(z(-3 + 1e-12).verdict).toBe('questionable')
    expect(z(3 + 1e-12).verdict).toBe('unsatisfactory')
  })

  it('decimal inputs exactly on a limit count as on it although the double is off (IEEE 754 values quoted)', () => {
    // (273.25 − 273.15)/0.05 → 2.0000000000004547: decimal 2, satisfactory
    const a = z(273.25, 273.15, 0.05)
    expect(a.z).toBeGreaterThan(2)
    expect(a.verdict).toBe('satisfactory')
    // (10.3 − 10)/0.15 → 2.000000000000005
    expect(z(10.3, 10, 0.15).z).toBeGreaterThan(2)
    expect(z(10.3, 10, 0.15).verdict).toBe('satisfactory')
    // (12.1 − 10)/0.7 → 2.9999999999999996: decimal 3, unsatisfactory
    const b = z(12.1, 10, 0.7)
    expect(b.z).toBeLessThan(3)
    expect(b.verdict).toBe('unsatisfactory')
    // (1000.3 − 1000)/0.1 → 2.9999999999995453
    expect(z(1000.3, 1000, 0.1).z).toBeLessThan(3)
    expect(z(1000.3, 1000, 0.1).verdict).toBe('unsatisfactory')
    // a real excess of 1 µK over σ_pt = 0.05 K (z excess 2e-5) is questionable
    expect(z(273.250001, 273.15, 0.05).verdict).toBe('questionable')
  })

  it('rejects bad input with the API field name', () => {
    expect(fieldOf(() => zScore({ labValue: 1, assignedValue: 1, standardDeviationForProficiency: 0 }))).toBe('standardDeviationForProficiency')
    expect(fieldOf(() => zScore({ labValue: 1, assignedValue: 1, standardDeviationForProficiency: -1 }))).toBe('standardDeviationForProficiency')
    expect(fieldOf(() => zScore({ labValue: Number.NaN, assignedValue: 1, standardDeviationForProficiency: 1 }))).toBe('labValue')
    expect(fieldOf(() => zScore({ labValue: 1, assignedValue: '1' as never, standardDeviationForProficiency: 1 }))).toBe('assignedValue')
  })
})

describe('z′ score (ISO 13528:2015 9.5, from memory)', () => {
  it('hand-computed: 0.5/√(0.3² + 0.4²) = 1; with u(X) = 0 it equals z', () => {
    const r = zPrimeScore({ labValue: 10.5, assignedValue: 10, standardDeviationForProficiency: 0.3, assignedStandardUncertainty: 0.4 })
    expect(r.zPrime).toBeCloseTo(1, 14)
    expect(r.verdict).toBe('satisfactory')
    const same = zPrimeScore({ labValue: 12.5, assignedValue: 10, standardDeviationForProficiency: 1, assignedStandardUncertainty: 0 })
    expect(same.zPrime).toBe(zScore({ labValue: 12.5, assignedValue: 10, standardDeviationForProficiency: 1 }).z)
    expect(same.verdict).toBe('questionable')
  })
  it('rejects a negative u(X)', () => {
    expect(fieldOf(() => zPrimeScore({ labValue: 1, assignedValue: 1, standardDeviationForProficiency: 1, assignedStandardUncertainty: -1 }))).toBe('assignedStandardUncertainty')
  })
})

describe('ζ score (ISO 13528:2015 9.6, from memory)', () => {
  it('hand-computed: 0.3/√(0.15² + 0.2²) = 0.3/0.25 = 1.2; with k = 2 on both sides ζ = 2·E_n', () => {
    const r = zetaScore({ labValue: 373.45, labStandardUncertainty: 0.15, assignedValue: 373.15, assignedStandardUncertainty: 0.2 })
    expect(r.zeta).toBeCloseTo(1.2, 10)
    expect(r.verdict).toBe('satisfactory')
    const en = enNumber({ labValue: 373.45, labExpandedUncertainty: 0.3, referenceValue: 373.15, referenceExpandedUncertainty: 0.4 }).en
    expect(r.zeta).toBeCloseTo(2 * en, 12)
  })
  it('classes as z, with the same boundaries', () => {
    const at = (x: number) => zetaScore({ labValue: x, labStandardUncertainty: 0.6, assignedValue: 0, assignedStandardUncertainty: 0.8 }).verdict
    expect(at(2)).toBe('satisfactory')
    expect(at(2 + 1e-12)).toBe('questionable')
    expect(at(3 - 1e-12)).toBe('questionable')
    expect(at(-3)).toBe('unsatisfactory')
  })
  it('rejects both uncertainties zero', () => {
    expect(fieldOf(() => zetaScore({ labValue: 1, labStandardUncertainty: 0, assignedValue: 1, assignedStandardUncertainty: 0 }))).toBe('labStandardUncertainty')
    expect(fieldOf(() => zetaScore({ labValue: 1, labStandardUncertainty: 0.1, assignedValue: 1, assignedStandardUncertainty: -0.1 }))).toBe('assignedStandardUncertainty')
  })
})
