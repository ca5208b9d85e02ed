/**
 * Certificate numbers and due dates: pure helpers used by the server when it issues a certificate
 * and by pages that show the format a laboratory has chosen.
 */

/** How the laboratory numbers its certificates: `BL-2026-00042` = prefix `BL`, year, five digits. */
export interface CertificateNumberFormat {
  /** Letters, digits and hyphens; may be empty. */
  prefix: string
  /** Put the four-digit year of issue between the prefix and the sequence. */
  includeYear: boolean
  /** Width of the sequence, zero-padded (3–8). */
  sequenceDigits: number
}

/**
 * The counter a certificate's sequence comes from: one per year of issue when the year is part of
 * the number (the sequence starts again at 1 each year), else one counter for ever (year 0).
 */
export function counterYear(format: CertificateNumberFormat, issueYear: number): number {
  return format.includeYear ? issueYear : 0
}

/**
 * The base number of a certificate (revision 0).
 * @example formatCertificateNumber({ prefix: 'BL', includeYear: true, sequenceDigits: 5 }, 2026, 42) === 'BL-2026-00042'
 */
export function formatCertificateNumber(format: CertificateNumberFormat, year: number, sequence: number): string {
  if (!Number.isInteger(sequence) || sequence < 1) throw new RangeError('sequence must be a positive integer')
  if (format.includeYear && (!Number.isInteger(year) || year < 1000 || year > 9999)) throw new RangeError('year must have four digits')
  const parts: string[] = []
  if (format.prefix) parts.push(format.prefix)
  if (format.includeYear) parts.push(String(year))
  parts.push(String(sequence).padStart(format.sequenceDigits, '0'))
  return parts.join('-')
}

/**
 * The number of a revision: the base number for revision 0, then `-R1`, `-R2` …
 * @example revisionNumber('BL-2026-00042', 1) === 'BL-2026-00042-R1'
 */
export function revisionNumber(baseNumber: string, revision: number): string {
  if (!Number.isInteger(revision) || revision < 0) throw new RangeError('revision must be a whole number ≥ 0')
  return revision === 0 ? baseNumber : `${baseNumber}-R${revision}`
}

const ISO_DATE = /^(\d{4})-(\d{2})-(\d{2})$/

function daysInMonth(year: number, month1: number): number {
  return new Date(Date.UTC(year, month1, 0)).getUTCDate()
}

/**
 * A calendar date plus whole months, clamped to the end of the month when the day does not exist
 * there: 2026-01-31 + 1 month = 2026-02-28, 2028-01-31 + 1 = 2028-02-29, 2026-08-31 + 6 = 2027-02-28.
 * Dates are `YYYY-MM-DD`, calendar dates with no time zone.
 */
export function addMonths(date: string, months: number): string {
  const m = ISO_DATE.exec(date)
  if (!m) throw new RangeError(`not a YYYY-MM-DD date: ${date}`)
  if (!Number.isInteger(months)) throw new RangeError('months must be a whole number')
  const y = Number(m[1])
  const mo = Number(m[2])
  const d = Number(m[3])
  if (mo < 1 || mo > 12 || d < 1 || d > daysInMonth(y, mo)) throw new RangeError(`not a calendar date: ${date}`)
  const index = y * 12 + (mo - 1) + months
  const ny = Math.floor(index / 12)
  const nm = index - ny * 12 + 1
  const nd = Math.min(d, daysInMonth(ny, nm))
  return `${String(ny).padStart(4, '0')}-${String(nm).padStart(2, '0')}-${String(nd).padStart(2, '0')}`
}

/** Letters of the verification code: digits and capitals without I, L, O and U (Crockford's base 32). */
export const VERIFICATION_ALPHABET = '0123456789ABCDEFGHJKMNPQRSTVWXYZ'
export const VERIFICATION_CODE_LENGTH = 10

/** Turn random bytes (at least `length`) into a code of `length` base-32 characters. */
export function verificationCodeFrom(bytes: Uint8Array, length = VERIFICATION_CODE_LENGTH): string {
  if (bytes.length < length) throw new RangeError('not enough random bytes')
  let out = ''
  for (let i = 0; i < length; i++) out += VERIFICATION_ALPHABET[bytes[i]! & 31]
  return out
}

/** A code as a person typed it: upper case, without spaces or hyphens; O → 0, I and L → 1. */
export function normalizeVerificationCode(code: string): string {
  return code.toUpperCase().replace(/[\s-]/g, '').replace(/O/g, '0').replace(/[IL]/g, '1')
}
