// Set-point correction tables: linear interpolation inside the table, refusal outside it.
// Expected values are hand calculations of linear interpolation on the invented tables below.
import { describe, expect, it } from 'vitest'
import { CorrectionRangeError, correctionAt, tableProblems } from '../../../shared/registers/correction'

const table: [number, number][] = [[323.15, 0.12], [373.15, 0.2], [473.15, -0.1]]

describe('correctionAt', () => {
  it('returns the tabulated value at a tabulated set-point, including both ends', () => {
    expect(correctionAt(table, 323.15)).toBe(0.12)
    expect(correctionAt(table, 373.15)).toBe(0.2)
    expect(correctionAt(table, 473.15)).toBe(-0.1)
  })
  it('interpolates linearly between neighbours', () => {
    // half-way between 0.12 and 0.20 K
    expect(Math.abs(correctionAt(table, 348.15) - 0.16)).toBeLessThan(1e-12)
    // a quarter of the way from 373.15 K (0.20 K) to 473.15 K (−0.10 K): 0.20 − 0.25·0.30 = 0.125
    expect(Math.abs(correctionAt(table, 398.15) - 0.125)).toBeLessThan(1e-12)
  })
  it('refuses to extrapolate below or above the table', () => {
    expect(() => correctionAt(table, 323.14)).toThrow(CorrectionRangeError)
    expect(() => correctionAt(table, 473.16)).toThrow(/not extrapolated/)
  })
  it('a one-row table answers only at its set-point', () => {
    expect(correctionAt([[500, 0.3]], 500)).toBe(0.3)
    expect(() => correctionAt([[500, 0.3]], 501)).toThrow(CorrectionRangeError)
  })
  it('refuses empty or unordered tables and non-finite set-points', () => {
    expect(() => correctionAt([], 300)).toThrow(/no rows/)
    expect(() => correctionAt([[400, 0], [300, 0]], 350)).toThrow(/increase/)
    expect(() => correctionAt(table, Number.NaN)).toThrow(CorrectionRangeError)
    expect(() => correctionAt(table, Number.POSITIVE_INFINITY)).toThrow(CorrectionRangeError)
  })
})

describe('tableProblems', () => {
  it('accepts an increasing table and names the row at fault otherwise', () => {
    expect(tableProblems(table)).toEqual([])
    expect(tableProblems([[300, 0], [300, 0.1]])[0]).toMatch(/row 2/)
    expect(tableProblems([[-1, 0]])[0]).toMatch(/above 0 K/)
  })
})
