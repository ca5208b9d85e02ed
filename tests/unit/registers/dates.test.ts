// Date-only strings, the past-due rule and equipment usability on a date.
// Calendar facts (2026 is not a leap year, 2028 is) are from the Gregorian calendar rules.
import { describe, expect, it } from 'vitest'
import { addMonths, isDateOnly, isPastDue, todayISO } from '../../../shared/registers/dates'
import { usabilityReason } from '../../../shared/registers/usability'

describe('date-only strings', () => {
  it('accepts real dates only', () => {
    expect(isDateOnly('2026-12-01')).toBe(true)
    expect(isDateOnly('2028-02-29')).toBe(true)
    expect(isDateOnly('2026-02-29')).toBe(false)
    expect(isDateOnly('2026-13-01')).toBe(false)
    expect(isDateOnly('2026-1-01')).toBe(false)
    expect(isDateOnly('01/12/2026')).toBe(false)
  })
  it('today is the UTC date', () => {
    expect(todayISO(new Date('2026-12-01T23:59:59Z'))).toBe('2026-12-01')
  })
  it('adds months, clamping to the end of a shorter month', () => {
    expect(addMonths('2026-01-31', 1)).toBe('2026-02-28')
    expect(addMonths('2027-11-30', 3)).toBe('2028-02-29')
    expect(addMonths('2026-12-01', 12)).toBe('2027-12-01')
    expect(() => addMonths('nope', 1)).toThrow(RangeError)
  })
})

describe('past due', () => {
  it('is past due from the day after the due date', () => {
    expect(isPastDue('2026-11-30', '2026-12-01')).toBe(true)
    expect(isPastDue('2026-12-01', '2026-12-01')).toBe(false)
    expect(isPastDue('2027-01-01', '2026-12-01')).toBe(false)
    expect(isPastDue(null, '2026-12-01')).toBe(false)
  })
})

describe('usability of reference equipment on a date', () => {
  const cal = [{ calibrationDate: '2025-10-15', dueDate: '2026-10-15' }, { calibrationDate: '2026-10-20', dueDate: '2027-10-20' }]
  const ok = { status: 'in-service', archived: false, calibrations: cal }
  it('is usable within the calibration current on that date', () => {
    expect(usabilityReason(ok, '2026-12-01')).toBeNull()
    expect(usabilityReason(ok, '2026-10-15')).toBeNull()
  })
  it('is refused in the gap between a due date and the next calibration', () => {
    expect(usabilityReason(ok, '2026-10-17')).toMatch(/fell due on 2026-10-15/)
  })
  it('is refused before any calibration, when out of service, quarantined or archived', () => {
    expect(usabilityReason(ok, '2025-01-01')).toMatch(/no calibration/)
    expect(usabilityReason({ ...ok, status: 'quarantined' }, '2026-12-01')).toMatch(/quarantined/)
    expect(usabilityReason({ ...ok, status: 'out-of-service' }, '2026-12-01')).toMatch(/out of service/)
    expect(usabilityReason({ ...ok, archived: true }, '2026-12-01')).toMatch(/archived/)
    expect(usabilityReason(ok, '2026-02-30')).toMatch(/YYYY-MM-DD/)
  })
})
