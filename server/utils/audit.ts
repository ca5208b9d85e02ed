import type { Transaction } from 'sequelize'
import { AuditEvent } from '../models/AuditEvent'

export interface AuditEntry {
  userId: number | null
  /** Verb in kebab case: `create`, `update`, `deactivate`, `reset-password`, `sign-in` … */
  action: string
  /** Model name: `User`, `Organization` … */
  entity: string
  entityId: number | null
  before?: unknown
  after?: unknown
}

/**
 * Write the audit row for a change. It takes the change's transaction, so the change
 * and its audit row commit or roll back together: a change without its row cannot happen.
 */
export async function recordAudit(transaction: Transaction, entry: AuditEntry): Promise<void> {
  await AuditEvent.create(
    {
      at: new Date(),
      userId: entry.userId,
      action: entry.action,
      entity: entry.entity,
      entityId: entry.entityId,
      before: entry.before ?? null,
      after: entry.after ?? null,
    },
    { transaction },
  )
}

/** A plain copy of a record's attributes for the audit trail, without secret fields. */
export function snapshot(record: { get: (o: { plain: true }) => object }, omit: readonly string[] = ['passwordHash']): Record<string, unknown> {
  return Object.fromEntries(
    Object.entries(record.get({ plain: true }))
      .filter(([k]) => !omit.includes(k))
      .map(([k, v]) => [k, v instanceof Date ? v.toISOString() : v]),
  )
}
