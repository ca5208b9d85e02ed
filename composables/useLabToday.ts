import { addMonths } from '#shared/registers/dates'
import type { LabTodayDTO } from '#shared/types'

/**
 * The laboratory's date today in its own time zone (GET /api/settings/today), for the dates forms
 * suggest and the "due soon" marks — never the browser's clock, which may be in another zone or
 * past midnight when the lab's day has not turned. Fetched once and shared (key `lab-today`).
 */
export async function useLabToday() {
  const { data } = await useFetch<LabTodayDTO>('/api/settings/today', { key: 'lab-today', dedupe: 'defer' })
  const today = computed(() => data.value?.today ?? '')
  return { today, timeZone: computed(() => data.value?.timeZone ?? '') }
}

/** The lab's today as already fetched (by the layout or a page), for components that cannot wait; '' before. */
export function useLabTodayNow() {
  const { data } = useNuxtData<LabTodayDTO>('lab-today')
  return computed(() => data.value?.today ?? '')
}

/** `YYYY-MM-DD` plus whole days (calendar arithmetic, no time zone involved). */
export function addDays(date: string, days: number): string {
  const [y, m, d] = date.split('-').map(Number) as [number, number, number]
  const t = new Date(Date.UTC(y, m - 1, d + days))
  return `${String(t.getUTCFullYear()).padStart(4, '0')}-${String(t.getUTCMonth() + 1).padStart(2, '0')}-${String(t.getUTCDate()).padStart(2, '0')}`
}

/** `YYYY-MM-DD` plus calendar months (the day clamped to a shorter month's end). */
export function addMonthsTo(date: string, months: number): string {
  return addMonths(date, months)
}

/** Whole days from `from` to `to` (both `YYYY-MM-DD`). */
export function daysBetween(from: string, to: string): number {
  return Math.round((Date.parse(`${to}T00:00:00Z`) - Date.parse(`${from}T00:00:00Z`)) / 86_400_000)
}
