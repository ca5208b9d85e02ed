/**
 * Calendar dates as the registers keep them: date-only strings `YYYY-MM-DD` (ISO 8601 calendar
 * dates, no time zone). Comparing two such strings as text compares the dates.
 */

const DATE_ONLY = /^(\d{4})-(\d{2})-(\d{2})$/

/** True for a real calendar date written `YYYY-MM-DD` (`2026-02-30` is false). */
export function isDateOnly(value: string): boolean {
  const m = DATE_ONLY.exec(value)
  if (!m) return false
  const d = new Date(Date.UTC(Number(m[1]), Number(m[2]) - 1, Number(m[3])))
  return d.getUTCFullYear() === Number(m[1]) && d.getUTCMonth() === Number(m[2]) - 1 && d.getUTCDate() === Number(m[3])
}

/** Today's date in UTC as `YYYY-MM-DD`. */
export function todayISO(now: Date = new Date()): string {
  return now.toISOString().slice(0, 10)
}

/**
 * True when a due date has passed: the item is past due from the day after its due date.
 * A missing due date is not past due (nothing is known to be due).
 *
 * @example isPastDue('2026-11-30', '2026-12-01') // true
 * @example isPastDue('2026-12-01', '2026-12-01') // false — due today is still within its date
 */
export function isPastDue(dueDate: string | null | undefined, today: string = todayISO()): boolean {
  return !!dueDate && dueDate < today
}

/**
 * `YYYY-MM-DD` plus a number of calendar months; the day is clamped to the end of a shorter month.
 *
 * @example addMonths('2026-01-31', 1) // '2026-02-28'
 */
export function addMonths(date: string, months: number): string {
  if (!isDateOnly(date)) throw new RangeError(`Not a YYYY-MM-DD date: ${date}`)
  const [y, m, d] = date.split('-').map(Number) as [number, number, number]
  const total = y * 12 + (m - 1) + months
  const year = Math.floor(total / 12)
  const month = total - year * 12
  const lastDay = new Date(Date.UTC(year, month + 1, 0)).getUTCDate()
  const day = Math.min(d, lastDay)
  return `${String(year).padStart(4, '0')}-${String(month + 1).padStart(2, '0')}-${String(day).padStart(2, '0')}`
}
