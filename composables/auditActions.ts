/**
 * What an audit row's action reads on a page. Most actions read as they are stored ('create',
 * 'update', 'archive'); those the system wrote on its own get words, and their stated reason.
 */
const ACTION_LABELS: Record<string, string> = {
  'migrate-basis': 'certified basis recorded by the upgrade (migration 0010)',
}

/** The action in words ('migrate-basis' → 'certified basis recorded by the upgrade (migration 0010)'). */
export function auditActionLabel(action: string): string {
  return ACTION_LABELS[action] ?? action
}

/** The reason an audit row states in its `after` (a migration says why it changed the record), or null. */
export function auditReason(row: { after: unknown }): string | null {
  const after = row.after as { reason?: unknown } | null
  return after && typeof after === 'object' && typeof after.reason === 'string' ? after.reason : null
}
