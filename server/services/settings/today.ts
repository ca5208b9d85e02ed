/**
 * The laboratory's "today": the date in the lab's own time zone (lab settings), used for past-due
 * flags, reminders and the dates forms suggest — one day boundary for everything, wherever the
 * server or the browser is. The time zone is read from the settings at most every few seconds.
 */
import type { Transaction } from 'sequelize'
import { labLocalDate } from '#shared/mail/milestones'
import type { LabTodayDTO } from '#shared/types'
import { LabSettings } from '#server/models/LabSettings'

/** Used before an administrator has entered the laboratory's settings. */
export const DEFAULT_LAB_TIME_ZONE = 'Europe/London'
const CACHE_MS = 5_000
let cached: { tz: string, at: number } | null = null

/** The laboratory's IANA time zone. */
export async function labTimeZone(transaction?: Transaction): Promise<string> {
  if (!transaction && cached && Date.now() - cached.at < CACHE_MS) return cached.tz
  const row = await LabSettings.findOne({ order: [['id', 'ASC']], attributes: ['timeZone'], transaction })
  const tz = row?.timeZone || DEFAULT_LAB_TIME_ZONE
  cached = { tz, at: Date.now() }
  return tz
}

/** Forget the cached time zone (after the settings change). */
export function forgetLabTimeZone(): void {
  cached = null
}

/** The laboratory's date at `now`, `YYYY-MM-DD`. */
export async function labToday(now: Date = new Date(), transaction?: Transaction): Promise<string> {
  return labLocalDate(now, await labTimeZone(transaction))
}

export async function labTodayDTO(): Promise<LabTodayDTO> {
  const timeZone = await labTimeZone()
  return { today: labLocalDate(new Date(), timeZone), timeZone }
}
