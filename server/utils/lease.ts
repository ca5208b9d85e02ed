/**
 * Leases on scheduled jobs, in the database (table `task_leases`), so that of several server
 * instances one at a time runs a job. A lease is held until its expiry and renewed while the job
 * runs; a holder that stops (or crashes) stops renewing, and after `ttlMs` another instance may take
 * it. Taking and renewing are single conditional UPDATEs, atomic on both engines. No Nitro
 * auto-imports.
 */
import { Op } from 'sequelize'
import { TaskLease } from '#server/models/TaskLease'
import { serializeWrites } from './db'
import { INSTANCE_ID } from './instance'

/** Take the lease `name` for `ttlMs` if it is free, expired or already ours; true when we hold it. */
export async function acquireLease(name: string, ttlMs: number, holder = INSTANCE_ID, now = new Date()): Promise<boolean> {
  return serializeWrites(async () => {
    await TaskLease.bulkCreate([{ name, holder: '', expiresAt: new Date(0) }], { ignoreDuplicates: true })
    const [taken] = await TaskLease.update(
      { holder, expiresAt: new Date(now.getTime() + ttlMs) },
      { where: { name, [Op.or]: [{ expiresAt: { [Op.lt]: now } }, { holder }] } },
    )
    return taken === 1
  })
}

/** Give the lease back (only if we hold it), so another instance need not wait for it to expire. */
export async function releaseLease(name: string, holder = INSTANCE_ID): Promise<void> {
  await serializeWrites(() => TaskLease.update({ expiresAt: new Date(0) }, { where: { name, holder } }))
}

/** Who holds the lease and until when (null when it was never taken). */
export async function leaseHolder(name: string): Promise<{ holder: string, expiresAt: Date } | null> {
  const row = await TaskLease.findByPk(name)
  return row ? { holder: row.holder, expiresAt: row.expiresAt } : null
}

export interface LeaseOptions {
  /** How long the lease holds without renewal (default 5 minutes); renewed every third of it. */
  ttlMs?: number
  /** Wait up to this long for a held lease (default 0: do not wait). */
  waitMs?: number
  holder?: string
}

/**
 * Run `fn` while holding the lease `name`: `{ ran: true, value }`, or `{ ran: false }` when another
 * instance holds it (after waiting up to `waitMs`). The lease is renewed while `fn` runs and given
 * back when it ends, whether it succeeded or not.
 */
export async function withLease<T>(name: string, fn: () => Promise<T>, opts: LeaseOptions = {}): Promise<{ ran: true, value: T } | { ran: false }> {
  const ttlMs = opts.ttlMs ?? 5 * 60_000
  const holder = opts.holder ?? INSTANCE_ID
  const deadline = Date.now() + (opts.waitMs ?? 0)
  while (!(await acquireLease(name, ttlMs, holder))) {
    if (Date.now() >= deadline) return { ran: false }
    await new Promise(r => setTimeout(r, 200))
  }
  const renew = setInterval(() => {
    acquireLease(name, ttlMs, holder).catch(() => undefined)
  }, Math.max(1000, ttlMs / 3))
  renew.unref()
  try {
    return { ran: true, value: await fn() }
  }
  finally {
    clearInterval(renew)
    await releaseLease(name, holder).catch(() => undefined)
  }
}
