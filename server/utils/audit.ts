import type { Attributes, CreationAttributes, Model, ModelStatic, Transaction } from 'sequelize'
import { AuditEvent } from '#server/models/AuditEvent'

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

export interface AuditedChange<R> {
  /** Model name for the audit row: `Instrument`, `User` … */
  entity: string
  /** Audit action (default `update`), or a function of the record before and after. */
  action?: string | ((before: Record<string, unknown>, after: Record<string, unknown>) => string)
  /** Attributes never written to the audit trail (default: the password hash). */
  omit?: readonly string[]
  /** Extra facts recorded with the new state (a reason, a number of sessions ended …). */
  extra?: Record<string, unknown> | ((record: R) => Record<string, unknown>)
}

/**
 * Change a record and write its audit row, in the caller's transaction: snapshot, set, save (only
 * when something changed), audit with before and after. One place for the sequence every change
 * follows.
 * @returns true when the record changed (and a row was written), false when nothing did
 */
export async function updateAudited<R extends Model>(t: Transaction, actor: { id: number } | null, record: R, changes: Partial<Attributes<R>>, opts: AuditedChange<R>): Promise<boolean> {
  const omit = opts.omit ?? ['passwordHash']
  const before = snapshot(record, omit)
  record.set(changes)
  if (!(record.changed() || []).length) return false
  await record.save({ transaction: t })
  const after = snapshot(record, omit)
  const extra = typeof opts.extra === 'function' ? opts.extra(record) : opts.extra
  await recordAudit(t, {
    userId: actor?.id ?? null,
    action: typeof opts.action === 'function' ? opts.action(before, after) : opts.action ?? 'update',
    entity: opts.entity,
    entityId: (record.get('id') as number | undefined) ?? null,
    before,
    after: extra ? { ...after, ...extra } : after,
  })
  return true
}

/** Create a record and write its audit row, in the caller's transaction. */
export async function createAudited<R extends Model>(t: Transaction, actor: { id: number } | null, model: ModelStatic<R>, values: CreationAttributes<R>, opts: Omit<AuditedChange<R>, 'action'> & { action?: string }): Promise<R> {
  const created = await model.create(values, { transaction: t })
  const after = snapshot(created, opts.omit ?? ['passwordHash'])
  const extra = typeof opts.extra === 'function' ? opts.extra(created) : opts.extra
  await recordAudit(t, { userId: actor?.id ?? null, action: opts.action ?? 'create', entity: opts.entity, entityId: (created.get('id') as number | undefined) ?? null, after: extra ? { ...after, ...extra } : after })
  return created
}
