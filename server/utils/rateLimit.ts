/**
 * Rate limits over sliding time windows, counted in the database (table `throttle_hits`) so that
 * they hold across restarts and across server instances. A limit is a key (`login:pair:…`,
 * `verify:fail:10.0.0.1`) with a maximum number of hits in a window; past it, the caller waits
 * until the oldest counted hit leaves the window.
 *
 * Every function takes `now` (ms since the epoch) so tests can move time. No Nitro auto-imports.
 */
import { Op } from 'sequelize'
import { ThrottleHit } from '#server/models/ThrottleHit'
import { serializeWrites } from './db'

/** The longest window any limit uses; older hits are deleted as new ones arrive. */
const KEEP_MS = 24 * 60 * 60_000

/**
 * Seconds until a key with these hits (ms, any order) has fewer than `max` in the window ending at
 * `now`; 0 when it already has.
 */
export function waitSecondsFor(hits: readonly number[], max: number, windowMs: number, now: number): number {
  const recent = hits.filter(t => now - t < windowMs).sort((a, b) => a - b)
  if (recent.length < max) return 0
  return Math.max(1, Math.ceil((recent[recent.length - max]! + windowMs - now) / 1000))
}

/** The key's hits within the last `windowMs` (ms since the epoch, oldest first). */
export async function recentHits(key: string, windowMs: number, now = Date.now()): Promise<number[]> {
  const rows = await ThrottleHit.findAll({ where: { key, at: { [Op.gt]: now - windowMs } }, attributes: ['at'], order: [['at', 'ASC']], raw: true })
  return rows.map(r => Number(r.at))
}

/** How many hits the key has within the window. */
export async function countHits(key: string, windowMs: number, now = Date.now()): Promise<number> {
  return ThrottleHit.count({ where: { key, at: { [Op.gt]: now - windowMs } } })
}

/** Seconds the caller must wait before the key may be hit again (0 = now). */
export async function waitSeconds(key: string, max: number, windowMs: number, now = Date.now()): Promise<number> {
  return waitSecondsFor(await recentHits(key, windowMs, now), max, windowMs, now)
}

/** Count one hit on each key, forgetting its hits older than `keepMs` (default a day). */
export async function recordHits(keys: readonly string[], now = Date.now(), keepMs = KEEP_MS): Promise<void> {
  if (!keys.length) return
  await serializeWrites(async () => {
    await ThrottleHit.destroy({ where: { key: [...keys], at: { [Op.lt]: now - keepMs } } })
    await ThrottleHit.bulkCreate(keys.map(key => ({ key, at: now })))
  })
}

/** Forget every hit of a key (a successful sign-in clears its failures). */
export async function forgetHits(key: string): Promise<void> {
  await serializeWrites(() => ThrottleHit.destroy({ where: { key } }))
}

/** Delete hits older than a day on every key (run by the hourly task). */
export async function pruneHits(now = Date.now()): Promise<number> {
  return serializeWrites(() => ThrottleHit.destroy({ where: { at: { [Op.lt]: now - KEEP_MS } } }))
}
