/**
 * Words and tones of the quality records' states on screen (the vocabularies themselves, and the
 * labels of kinds and choices, live in shared/quality/constants.ts).
 */
import type { ComplaintStatus } from '#shared/quality/constants'
import type { CheckPlanDTO, CorrectiveActionDTO } from '#shared/types/quality'

type Tone = 'calm' | 'due' | 'late' | 'quiet'

/** A check plan's due state: next check within 14 days, after its date, or no longer run. */
export const DUE_STATE: Record<CheckPlanDTO['dueState'], { label: string, tone: Tone }> = {
  ok: { label: 'On schedule', tone: 'calm' },
  due: { label: 'Due', tone: 'due' },
  overdue: { label: 'Overdue', tone: 'late' },
  inactive: { label: 'Inactive', tone: 'quiet' },
}

export const COMPLAINT_TONE: Record<ComplaintStatus, Tone> = {
  'received': 'due',
  'investigating': 'due',
  'outcome-proposed': 'due',
  'closed': 'quiet',
}

/** Where a corrective action stands, in a word. */
export function actionState(a: CorrectiveActionDTO): { label: string, tone: Tone } {
  if (a.status === 'closed') return { label: 'Closed', tone: 'quiet' }
  if (a.overdue) return { label: 'Overdue', tone: 'late' }
  if (a.awaitingEffectiveness) return { label: 'Awaiting effectiveness check', tone: 'due' }
  if (a.effective === false) return { label: 'Not effective', tone: 'late' }
  if (a.effective === true) return { label: 'Effective, to close', tone: 'calm' }
  return { label: 'Open', tone: 'calm' }
}

/** "source 12" → its page. */
export function equipmentLink(type: 'source' | 'reference', id: number): string {
  return type === 'source' ? `/sources/${id}` : `/reference-instruments/${id}`
}
