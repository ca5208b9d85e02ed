/**
 * The one place that opens the database.
 *
 * `DATABASE_URL` names an SQLite file: `sqlite:./data/bandlight.sqlite` (the default; a
 * relative path is resolved from the working directory and its folder is created),
 * `sqlite:/absolute/path.sqlite`, `sqlite:///absolute/path.sqlite`, or `sqlite::memory:`.
 *
 * Every connection runs with foreign keys on, WAL journal mode and a busy timeout, and
 * every transaction is `BEGIN IMMEDIATE`, so writers queue instead of failing.
 * This file imports nothing from Nuxt or Nitro: scripts (migrate, demo, bench) use it too.
 */
import fs from 'node:fs'
import path from 'node:path'
import sqlite3 from 'sqlite3'
import { Sequelize, Transaction } from 'sequelize'

export const DEFAULT_DATABASE_URL = 'sqlite:./data/bandlight.sqlite'

/** Resolve a `DATABASE_URL` to a file path (or `:memory:`). Throws on anything but sqlite. */
export function databasePath(url: string = process.env.DATABASE_URL || DEFAULT_DATABASE_URL): string {
  const m = /^sqlite:(.*)$/.exec(url.trim())
  if (!m) throw new Error(`DATABASE_URL must start with "sqlite:" (got "${url}")`)
  let p = m[1]!
  if (p === ':memory:') return p
  if (p.startsWith('//')) p = p.slice(2)
  if (!p) throw new Error('DATABASE_URL names no file')
  return path.resolve(process.cwd(), p)
}

const BUSY_TIMEOUT_MS = 15_000

/**
 * sqlite3 with every new connection tuned before first use. Sequelize opens one
 * connection for ordinary queries and one per transaction, so the tuning must
 * live in the constructor rather than in a one-off query.
 */
class TunedDatabase extends sqlite3.Database {
  constructor(filename: string, mode?: number, callback?: (err: Error | null) => void) {
    super(filename, mode, callback)
    // Queued by sqlite3 until the file is open.
    this.configure('busyTimeout', BUSY_TIMEOUT_MS)
    this.run('PRAGMA journal_mode = WAL')
    this.run('PRAGMA synchronous = NORMAL')
  }
}
const dialectModule = { ...sqlite3, Database: TunedDatabase }

function open(): Sequelize {
  const storage = databasePath()
  if (storage !== ':memory:') fs.mkdirSync(path.dirname(storage), { recursive: true })
  return new Sequelize({
    dialect: 'sqlite',
    dialectModule,
    storage,
    logging: process.env.DB_LOG === '1' ? console.log : false,
    transactionType: Transaction.TYPES.IMMEDIATE,
    retry: { max: 3, match: [/SQLITE_BUSY/] },
    define: { underscored: false, freezeTableName: true },
  })
}

/** The application's Sequelize instance (opened on first import). */
export const sequelize: Sequelize = open()

/** Close the database (scripts and tests). */
export async function closeDatabase(): Promise<void> {
  await sequelize.close()
}
