/**
 * Reminder milestones: pure date logic for recalibration reminders, shared by the server's
 * reminder scan, its preview and the unit tests. No framework imports.
 *
 * Dates are calendar dates `YYYY-MM-DD` in the laboratory's time zone ("lab-local"). Day
 * arithmetic is done on the proleptic Gregorian calendar in UTC, so month ends, leap days and
 * daylight-saving changes never shift a date: `addDays('2028-02-28', 1)` is `'2028-02-29'`.
 * The lab-local date of an instant comes from `Intl.DateTimeFormat` with the IANA zone
 * (ECMA-402), so an instant late on 30 June in UTC is already 1 July in Europe/London (BST).
 *
 * Milestones of one due date, in the order they are reached:
 *   `lead-60`, `lead-30`, `lead-7` (one per configured lead time, in days before the due date),
 *   `due` (on the due date), then `overdue-1w`, `overdue-2w`, … (each whole week after it, when
 *   weekly overdue reminders are on).
 * An instrument is "at" the latest milestone whose date has been reached. Only that one is sent:
 * a day the job missed is caught up the next run, and an instrument added 10 days before its due
 * date gets the 30-day reminder, not the 60-day one as well.
 */

/** Calendar date `YYYY-MM-DD`. */
export type IsoDate = string

export interface MilestoneRules {
  /** Days before the due date at which a reminder goes out, e.g. `[60, 30, 7]` (any order, positive). */
  leadTimes: readonly number[]
  /** Remind every whole week after the due date while the instrument stays overdue. */
  overdueWeekly: boolean
}

export interface Milestone {
  /** Stable key stored in the reminder log: `lead-30`, `due`, `overdue-2w`. */
  key: string
  kind: 'lead' | 'due' | 'overdue'
  /** Lab-local date on which the milestone is reached. */
  date: IsoDate
  /** Days from the given date to the due date: positive before, 0 on, negative after. */
  daysToDue: number
}

const DATE_RE = /^(\d{4})-(\d{2})-(\d{2})$/
const DAY_MS = 86_400_000

/**
 * Days since 1970-01-01 of a calendar date, or throws on anything but a real `YYYY-MM-DD`.
 * @example dayNumber('1970-01-02') // 1
 */
export function dayNumber(date: IsoDate): number {
  const m = DATE_RE.exec(date)
  if (!m) throw new RangeError(`Not a date (YYYY-MM-DD): ${date}`)
  const [y, mo, d] = [Number(m[1]), Number(m[2]), Number(m[3])]
  const ms = Date.UTC(y, mo - 1, d)
  const back = new Date(ms)
  if (back.getUTCFullYear() !== y || back.getUTCMonth() !== mo - 1 || back.getUTCDate() !== d) {
    throw new RangeError(`No such calendar date: ${date}`)
  }
  return Math.round(ms / DAY_MS)
}

/** True for a real calendar date `YYYY-MM-DD` (2027-02-29 is not). */
export function isIsoDate(date: string): boolean {
  try {
    dayNumber(date)
    return true
  }
  catch {
    return false
  }
}

/** @example addDays('2027-01-31', 30) // '2027-03-02' */
export function addDays(date: IsoDate, days: number): IsoDate {
  return new Date((dayNumber(date) + days) * DAY_MS).toISOString().slice(0, 10)
}

/** Whole days from `from` to `to` (negative when `to` is earlier). @example daysBetween('2026-12-01', '2026-12-31') // 30 */
export function daysBetween(from: IsoDate, to: IsoDate): number {
  return dayNumber(to) - dayNumber(from)
}

/** True when `timeZone` is an IANA zone name the runtime knows (`Europe/London`, `UTC`). */
export function isValidTimeZone(timeZone: string): boolean {
  if (!timeZone || typeof timeZone !== 'string') return false
  try {
    new Intl.DateTimeFormat('en-GB', { timeZone }).format(0)
    return true
  }
  catch {
    return false
  }
}

// A formatter per time zone, made once: making one costs far more than using it (every list page asks
// for the lab's date). An unknown zone throws when made and is not kept.
const formatters = new Map<string, Intl.DateTimeFormat>()

function zonedParts(instant: Date, timeZone: string): Record<string, string> {
  let format = formatters.get(timeZone)
  if (!format) {
    format = new Intl.DateTimeFormat('en-GB', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit', hour: '2-digit', hourCycle: 'h23' })
    formatters.set(timeZone, format)
  }
  return Object.fromEntries(format.formatToParts(instant).map(p => [p.type, p.value]))
}

/**
 * The calendar date at `instant` in `timeZone`.
 * @example labLocalDate(new Date('2026-06-30T23:30:00Z'), 'Europe/London') // '2026-07-01' (BST, UTC+1)
 */
export function labLocalDate(instant: Date, timeZone: string): IsoDate {
  const p = zonedParts(instant, timeZone)
  return `${p.year}-${p.month}-${p.day}`
}

/**
 * The hour (0–23) at `instant` in `timeZone`.
 * @example labLocalHour(new Date('2026-01-15T06:05:00Z'), 'Europe/London') // 6 (GMT)
 */
export function labLocalHour(instant: Date, timeZone: string): number {
  return Number(zonedParts(instant, timeZone).hour) % 24
}

/** Lead times as the scan uses them: distinct positive whole days, largest first. */
export function normalizedLeadTimes(leadTimes: readonly number[]): number[] {
  return [...new Set(leadTimes.filter(n => Number.isInteger(n) && n > 0))].sort((a, b) => b - a)
}

/**
 * The milestone an item due on `dueDate` is at on the lab-local date `today`, or null when the
 * first reminder is not yet due (further away than the longest lead time).
 *
 * @param dueDate recalibration due date, `YYYY-MM-DD`
 * @param today lab-local date of the run, `YYYY-MM-DD`
 * @example milestoneOn('2027-03-31', '2027-03-01', { leadTimes: [60, 30, 7], overdueWeekly: true }).key // 'lead-30'
 * @example milestoneOn('2026-12-01', '2026-12-15', { leadTimes: [60, 30, 7], overdueWeekly: true }).key // 'overdue-2w'
 */
export function milestoneOn(dueDate: IsoDate, today: IsoDate, rules: MilestoneRules): Milestone | null {
  return milestonesOn(today, rules)(dueDate)
}

/**
 * `milestoneOn` for many due dates on one day: the lead times and the day number of `today`
 * are worked out once (the reminder scan calls it for every instrument in the register).
 * @example milestonesOn('2027-03-01', { leadTimes: [60, 30, 7], overdueWeekly: true })('2027-03-31')?.key // 'lead-30'
 */
export function milestonesOn(today: IsoDate, rules: MilestoneRules): (dueDate: IsoDate) => Milestone | null {
  const todayN = dayNumber(today)
  // Ascending: the first lead time not shorter than the days left is the latest lead reached.
  const leads = normalizedLeadTimes(rules.leadTimes).reverse()
  return (dueDate) => {
    const dueN = dayNumber(dueDate)
    const daysToDue = dueN - todayN
    if (daysToDue > 0) {
      const lead = leads.find(l => l >= daysToDue)
      if (lead === undefined) return null
      return { key: `lead-${lead}`, kind: 'lead', date: addDays(dueDate, -lead), daysToDue }
    }
    const weeks = Math.floor(-daysToDue / 7)
    if (weeks >= 1 && rules.overdueWeekly) {
      return { key: `overdue-${weeks}w`, kind: 'overdue', date: addDays(dueDate, 7 * weeks), daysToDue }
    }
    return { key: 'due', kind: 'due', date: dueDate, daysToDue }
  }
}

/** The latest date (inclusive) an item may be due and still be at some milestone on `today`. */
export function reminderHorizon(today: IsoDate, leadTimes: readonly number[]): IsoDate {
  return addDays(today, Math.max(0, ...normalizedLeadTimes(leadTimes)))
}

/**
 * Words for a due date seen from `today`, as reminder messages print them.
 * @example dueInWords(-9) // 'overdue by 9 days'
 */
export function dueInWords(daysToDue: number): string {
  if (daysToDue === 0) return 'due today'
  const n = Math.abs(daysToDue)
  const days = `${n} day${n === 1 ? '' : 's'}`
  return daysToDue > 0 ? `due in ${days}` : `overdue by ${days}`
}

/** Reference-equipment alert milestone: due within `windowDays` (`due-soon`) or past due (`overdue`). */
export function equipmentMilestoneOn(dueDate: IsoDate, today: IsoDate, windowDays = 30): Milestone | null {
  const daysToDue = daysBetween(today, dueDate)
  if (daysToDue < 0) return { key: 'overdue', kind: 'overdue', date: addDays(dueDate, 1), daysToDue }
  if (daysToDue <= windowDays) return { key: 'due-soon', kind: 'lead', date: addDays(dueDate, -windowDays), daysToDue }
  return null
}
