/**
 * Whether a piece of reference equipment may be used for a calibration on a given date
 * (ISO/IEC 17025:2017 6.4.4 and 6.4.7: equipment is checked before use and kept within its
 * calibration programme). Pure: the server passes the record and its calibration history.
 */
import { isDateOnly } from './dates'

export interface UsabilityInput {
  /** 'in-service' | 'out-of-service' | 'quarantined' */
  status: string
  /** Why it is out of service or quarantined (e.g. the failed check and its nonconformity), when recorded. */
  statusReason?: string | null
  archived: boolean
  /** Each external calibration: its date and the date it falls due, `YYYY-MM-DD`. */
  calibrations: readonly { calibrationDate: string, dueDate: string }[]
}

/**
 * The reason the equipment may not be used on `dateISO`, or `null` when it may.
 * It may when it is not archived, is in service, and its latest calibration on or before that
 * date falls due on or after it.
 *
 * @example usabilityReason({ status: 'in-service', archived: false, calibrations: [{ calibrationDate: '2026-01-10', dueDate: '2027-01-10' }] }, '2026-12-01') // null
 */
export function usabilityReason(equipment: UsabilityInput, dateISO: string): string | null {
  if (!isDateOnly(dateISO)) return `Not a YYYY-MM-DD date: ${dateISO}`
  if (equipment.archived) return 'The equipment is archived'
  if (equipment.status !== 'in-service') return `The equipment is ${equipment.status.replace(/-/g, ' ')}${equipment.statusReason ? `: ${equipment.statusReason}` : ''}`
  const before = equipment.calibrations
    .filter(c => c.calibrationDate <= dateISO)
    .sort((a, b) => (a.calibrationDate < b.calibrationDate ? 1 : a.calibrationDate > b.calibrationDate ? -1 : a.dueDate < b.dueDate ? 1 : -1))
  const latest = before[0]
  if (!latest) return `The equipment has no calibration dated on or before ${dateISO}`
  if (latest.dueDate < dateISO) return `Its calibration fell due on ${latest.dueDate}, before ${dateISO}`
  return null
}
