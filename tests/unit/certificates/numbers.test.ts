// Certificate numbering, due dates and verification codes (shared/certificates/numbers.ts).
import { describe, expect, it } from 'vitest'
import { addMonths, counterYear, formatCertificateNumber, normalizeVerificationCode, revisionNumber, VERIFICATION_ALPHABET, verificationCodeFrom } from '../../../shared/certificates/numbers'

const BL = { prefix: 'BL', includeYear: true, sequenceDigits: 5 }

describe('certificate numbers', () => {
  it('prefix, year and a zero-padded sequence', () => {
    expect(formatCertificateNumber(BL, 2026, 42)).toBe('BL-2026-00042')
    expect(formatCertificateNumber(BL, 2026, 123456)).toBe('BL-2026-123456')
    expect(formatCertificateNumber({ prefix: 'HRC', includeYear: false, sequenceDigits: 4 }, 2026, 7)).toBe('HRC-0007')
    expect(formatCertificateNumber({ prefix: '', includeYear: true, sequenceDigits: 3 }, 2027, 1)).toBe('2027-001')
  })
  it('one counter per year with the year in the number, one for ever without', () => {
    expect(counterYear(BL, 2026)).toBe(2026)
    expect(counterYear({ ...BL, includeYear: false }, 2026)).toBe(0)
  })
  it('refuses sequences below 1 and years without four digits', () => {
    expect(() => formatCertificateNumber(BL, 2026, 0)).toThrow(RangeError)
    expect(() => formatCertificateNumber(BL, 2026, 1.5)).toThrow(RangeError)
    expect(() => formatCertificateNumber(BL, 26, 1)).toThrow(RangeError)
  })
  it('revisions carry -R1, -R2 …; revision 0 is the base number', () => {
    expect(revisionNumber('BL-2026-00042', 0)).toBe('BL-2026-00042')
    expect(revisionNumber('BL-2026-00042', 1)).toBe('BL-2026-00042-R1')
    expect(revisionNumber('BL-2026-00042', 12)).toBe('BL-2026-00042-R12')
    expect(() => revisionNumber('BL-2026-00042', -1)).toThrow(RangeError)
  })
})

describe('due dates: calendar months, clamped to the month end', () => {
  // Expected values are plain Gregorian calendar facts (February has 29 days in 2028, a leap year).
  it.each([
    ['2026-01-31', 1, '2026-02-28'],
    ['2028-01-31', 1, '2028-02-29'],
    ['2026-08-31', 6, '2027-02-28'],
    ['2026-03-31', 1, '2026-04-30'],
    ['2026-11-25', 12, '2027-11-25'],
    ['2026-12-15', 1, '2027-01-15'],
    ['2026-05-31', 24, '2028-05-31'],
    ['2028-02-29', 12, '2029-02-28'],
    ['2026-03-31', -1, '2026-02-28'],
  ] as const)('%s + %i months = %s', (date, months, expected) => {
    expect(addMonths(date, months)).toBe(expected)
  })
  it('refuses what is not a calendar date', () => {
    expect(() => addMonths('2026-02-30', 1)).toThrow(RangeError)
    expect(() => addMonths('26-01-01', 1)).toThrow(RangeError)
    expect(() => addMonths('2026-01-01', 1.5)).toThrow(RangeError)
  })
})

describe('verification codes', () => {
  it('ten characters of the 32-letter alphabet without I, L, O, U', () => {
    const code = verificationCodeFrom(new Uint8Array([0, 1, 31, 32, 255, 10, 17, 18, 20, 27]))
    expect(code).toBe('01Z0ZAHJMV')
    expect(VERIFICATION_ALPHABET).toHaveLength(32)
    expect(VERIFICATION_ALPHABET).not.toMatch(/[ILOU]/)
    expect(() => verificationCodeFrom(new Uint8Array(3))).toThrow(RangeError)
  })
  it('reads a typed code the way a person means it', () => {
    expect(normalizeVerificationCode('7k2m9 qxp4r')).toBe('7K2M9QXP4R')
    expect(normalizeVerificationCode('O1-IL')).toBe('0111')
  })
})
