/**
 * Change counters: cached figures that stay right across several server instances.
 *
 * The table `change_counters` (migration 0015) holds one row per kind of change; database triggers
 * move a row's value in the same transaction as the change (an instrument inserted, archived,
 * re-dated …; a session revoked, a user's role changed …). A figure computed after reading value v
 * therefore includes every change that moved the counter up to v: it may be cached with v and served
 * for as long as the counter still reads v — on any instance, because the counter lives in the shared
 * database and is read on every use (one primary-key read). A write anywhere moves the counter, and
 * the next read on every instance misses the cache. Why the order matters: the counter is read
 * *before* the figure is computed, so the cached figure can only be newer than its counter value,
 * never older.
 *
 * No Nuxt or Nitro imports (the benchmark and scripts use this module too).
 */
import { QueryTypes, type Transaction } from 'sequelize'
import { sequelize } from './db'

/** The counters migration 0015 creates. */
export type ChangeCounter = 'instruments' | 'sessions'

/**
 * The counter's current value (moves with every counted change; never goes back).
 * @param name - the counter
 * @param transaction - read inside this transaction (optional)
 * @returns the value; -1 when the row is missing (then nothing is cached against it)
 */
export async function changeCounter(name: ChangeCounter, transaction?: Transaction): Promise<number> {
  const row = await sequelize.query<{ value: number | string }>('SELECT value FROM change_counters WHERE name = ?', {
    replacements: [name],
    type: QueryTypes.SELECT,
    plain: true,
    transaction,
  })
  return row ? Number(row.value) : -1
}

/**
 * Figures (list totals) cached per key against a change counter, in this process, least recently
 * used dropped first. `get(key, compute)` reads the counter, answers the cached figure when it was
 * computed at the same counter value, and otherwise computes it (after the counter was read) and
 * keeps it; `getAt` takes a counter value the caller read itself.
 */
export class CountCache {
  private readonly entries = new Map<string, { version: number, value: number }>()
  private hitCount = 0
  private missCount = 0

  /**
   * @param counter - the change counter the figures depend on
   * @param maxEntries - how many keys are kept (filters differ by search text, so keep it bounded)
   */
  constructor(readonly counter: ChangeCounter, private readonly maxEntries = 1000) {}

  /**
   * The figure for `key`: cached when the counter has not moved since it was computed.
   * @param key - everything the figure depends on besides the counted table (the filter, a scope)
   * @param compute - computes the figure from the database
   */
  async get(key: string, compute: () => Promise<number>): Promise<number> {
    return this.getAt(await changeCounter(this.counter), key, compute)
  }

  /**
   * {@link get} with the counter already read by the caller (in the same statement as the rows the
   * figure goes with, say). `version` must have been read before `compute` runs.
   * @param version - the counter's value as read; below 0 nothing is cached
   */
  async getAt(version: number, key: string, compute: () => Promise<number>): Promise<number> {
    const hit = this.entries.get(key)
    if (hit && hit.version === version && version >= 0) {
      this.hitCount++
      // most recently used last
      this.entries.delete(key)
      this.entries.set(key, hit)
      return hit.value
    }
    this.missCount++
    const value = await compute()
    if (version >= 0) {
      const now = this.entries.get(key)
      if (!now || now.version <= version) {
        this.entries.delete(key)
        this.entries.set(key, { version, value })
        if (this.entries.size > this.maxEntries) this.entries.delete(this.entries.keys().next().value!)
      }
    }
    return value
  }

  /** Hits and misses so far (for the benchmark and tests of this module). */
  stats(): { hits: number, misses: number, size: number } {
    return { hits: this.hitCount, misses: this.missCount, size: this.entries.size }
  }

  /** Forget every cached figure. */
  clear(): void {
    this.entries.clear()
  }
}
