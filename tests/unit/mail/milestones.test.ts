// Reminder milestones. Calendar facts are from the Gregorian calendar (2028 is a leap year,
// 2027 is not); zone offsets from the IANA time zone database as shipped with Node's ICU:
// Europe/London BST (UTC+1) from 2026-03-29 to 2026-10-25, Pacific/Auckland NZDT (UTC+13) in
// January, America/Los_Angeles PST (UTC−8) in February.
import { describe, expect, it } from 'vitest'
import {
  addDays,
  daysBetween,
  dueInWords,
  equipmentMilestoneOn,
  isIsoDate,
  isValidTimeZone,
  labLocalDate,
  labLocalHour,
  milestoneOn,
  reminderHorizon,
} from '../../../shared/mail/milestones'

const rules = { leadTimes: [60, 30, 7], overdueWeekly: true }
const key = (due: string, today: string, r = rules) => milestoneOn(due, today, r)?.key ?? null

describe('calendar arithmetic', () => {
  it('crosses month ends and leap days', () => {
    expect(addDays('2027-01-31', 30)).toBe('2027-03-02')
    expect(addDays('2028-01-31', 30)).toBe('2028-03-01')
    expect(addDays('2028-02-28', 1)).toBe('2028-02-29')
    expect(addDays('2027-02-28', 1)).toBe('2027-03-01')
    expect(addDays('2026-12-31', 1)).toBe('2027-01-01')
    expect(daysBetween('2028-02-01', '2028-03-01')).toBe(29)
    expect(daysBetween('2027-02-01', '2027-03-01')).toBe(28)
    expect(daysBetween('2026-12-01', '2026-11-30')).toBe(-1)
  })
  it('rejects dates that do not exist', () => {
    expect(isIsoDate('2027-02-29')).toBe(false)
    expect(isIsoDate('2028-02-29')).toBe(true)
    expect(isIsoDate('2026-13-01')).toBe(false)
    expect(isIsoDate('26-1-1')).toBe(false)
    expect(() => addDays('2027-04-31', 1)).toThrow(RangeError)
  })
})

describe('lab-local date and hour', () => {
  it('takes the date in the lab time zone, not in UTC', () => {
    expect(labLocalDate(new Date('2026-06-30T23:30:00Z'), 'Europe/London')).toBe('2026-07-01')
    expect(labLocalDate(new Date('2026-12-31T23:30:00Z'), 'Europe/London')).toBe('2026-12-31')
    expect(labLocalDate(new Date('2026-12-31T11:30:00Z'), 'Pacific/Auckland')).toBe('2027-01-01')
    expect(labLocalDate(new Date('2026-12-31T10:59:00Z'), 'Pacific/Auckland')).toBe('2026-12-31')
    expect(labLocalDate(new Date('2027-03-01T07:00:00Z'), 'America/Los_Angeles')).toBe('2027-02-28')
    expect(labLocalDate(new Date('2027-03-01T08:00:00Z'), 'America/Los_Angeles')).toBe('2027-03-01')
  })

  it('keeps each zone its own when zones alternate (one formatter per zone), and refuses an unknown zone every time', () => {
    // offsets from the IANA tz database: Auckland UTC+13 in December (NZDT), Los Angeles UTC−8 (PST)
    const at = new Date('2026-12-31T11:30:00Z')
    for (let i = 0; i < 3; i++) {
      expect(labLocalDate(at, 'Pacific/Auckland')).toBe('2027-01-01')
      expect(labLocalDate(at, 'America/Los_Angeles')).toBe('2026-12-31')
      expect(labLocalHour(at, 'Pacific/Auckland')).toBe(0)
      expect(labLocalHour(at, 'America/Los_Angeles')).toBe(3)
      expect(() => labLocalDate(at, 'Mars/Olympus_Mons')).toThrow(RangeError)
    }
  })
  it('takes the hour in the lab time zone, across daylight saving', () => {
    expect(labLocalHour(new Date('2026-01-15T06:05:00Z'), 'Europe/London')).toBe(6)
    expect(labLocalHour(new Date('2026-07-15T05:05:00Z'), 'Europe/London')).toBe(6)
    expect(labLocalHour(new Date('2026-07-15T00:05:00Z'), 'Europe/London')).toBe(1)
    expect(labLocalHour(new Date('2026-07-14T23:05:00Z'), 'Europe/London')).toBe(0)
    expect(labLocalHour(new Date('2027-01-10T17:05:00Z'), 'Pacific/Auckland')).toBe(6)
  })
  it('knows real zones only', () => {
    expect(isValidTimeZone('Europe/London')).toBe(true)
    expect(isValidTimeZone('UTC')).toBe(true)
    expect(isValidTimeZone('Europe/Atlantis')).toBe(false)
    expect(isValidTimeZone('')).toBe(false)
  })
})

describe('customer milestones', () => {
  it('is nothing further out than the longest lead time', () => {
    expect(key('2027-03-31', '2027-01-29')).toBe(null) // 61 days
    expect(reminderHorizon('2027-01-29', [7, 60, 30])).toBe('2027-03-30')
  })
  it('reaches each lead time on its day, and stays there until the next', () => {
    expect(key('2027-03-31', '2027-01-30')).toBe('lead-60') // 60 days
    expect(key('2027-03-31', '2027-02-28')).toBe('lead-60') // 31 days
    expect(key('2027-03-31', '2027-03-01')).toBe('lead-30') // 30 days, across February
    expect(key('2027-03-31', '2027-03-23')).toBe('lead-30') // 8 days
    expect(key('2027-03-31', '2027-03-24')).toBe('lead-7')
    expect(key('2027-03-31', '2027-03-30')).toBe('lead-7')
  })
  it('counts lead times across a leap day', () => {
    // 2028-03-01 minus 30 days is 2028-01-31 (February 2028 has 29 days).
    expect(milestoneOn('2028-03-01', '2028-01-31', rules)).toMatchObject({ key: 'lead-30', date: '2028-01-31', daysToDue: 30 })
    expect(key('2028-03-01', '2028-01-30')).toBe('lead-60')
    expect(key('2028-03-01', '2028-02-23')).toBe('lead-7')
    expect(key('2028-03-01', '2028-02-22')).toBe('lead-30')
  })
  it('is due on the due date, then weekly while overdue', () => {
    expect(key('2026-11-30', '2026-11-30')).toBe('due')
    expect(key('2026-11-30', '2026-12-06')).toBe('due')
    expect(milestoneOn('2026-11-30', '2026-12-07', rules)).toMatchObject({ key: 'overdue-1w', date: '2026-12-07', daysToDue: -7 })
    expect(key('2026-11-30', '2026-12-13')).toBe('overdue-1w')
    expect(key('2026-11-30', '2026-12-14')).toBe('overdue-2w')
    expect(key('2026-01-31', '2027-01-30')).toBe('overdue-52w')
  })
  it('stays at due when weekly overdue reminders are off', () => {
    expect(key('2026-11-30', '2027-02-01', { leadTimes: [30], overdueWeekly: false })).toBe('due')
  })
  it('takes lead times in any order and ignores nonsense', () => {
    expect(key('2027-03-31', '2027-03-20', { leadTimes: [7, 30, 30, 0, -4, 2.5], overdueWeekly: true })).toBe('lead-30')
    expect(key('2027-03-31', '2027-03-20', { leadTimes: [], overdueWeekly: true })).toBe(null)
  })
  it('says when in words', () => {
    expect(dueInWords(0)).toBe('due today')
    expect(dueInWords(1)).toBe('due in 1 day')
    expect(dueInWords(-9)).toBe('overdue by 9 days')
  })
})

describe('reference equipment milestones', () => {
  it('is due-soon within 30 days and overdue the day after the due date', () => {
    expect(equipmentMilestoneOn('2027-01-01', '2026-12-01')).toBe(null) // 31 days
    expect(equipmentMilestoneOn('2026-12-31', '2026-12-01')?.key).toBe('due-soon')
    expect(equipmentMilestoneOn('2026-12-01', '2026-12-01')?.key).toBe('due-soon')
    expect(equipmentMilestoneOn('2026-11-30', '2026-12-01')?.key).toBe('overdue')
  })
})
