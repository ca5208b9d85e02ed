/**
 * Where stored files (uploads, certificate PDFs) keep their bytes: one interface, two places,
 * content-addressed in both (a file is named by the SHA-256 of its bytes, written once, never
 * changed).
 * - `directory`: `<data dir>/ab/abcdef…` (BANDLIGHT_DATA_DIR; default `files/` beside the SQLite file,
 *   `data/files` on PostgreSQL). The default on SQLite: one machine, one disk.
 * - `database`: the table `file_contents` (model FileContent). The default on PostgreSQL, so every
 *   server instance reads what any other stored.
 * FILE_STORAGE chooses one explicitly (README, "Configuration"). No Nitro auto-imports.
 */
import crypto from 'node:crypto'
import fs from 'node:fs'
import os from 'node:os'
import path from 'node:path'
import type { Transaction } from 'sequelize'
import { FileContent } from '#server/models/FileContent'
import { config } from './config'
import { databaseDialect, databasePath } from './db'

export interface FileStore {
  readonly kind: 'directory' | 'database'
  /**
   * Store bytes under their SHA-256 (once: the same content again is not rewritten).
   * @param t - the caller's transaction, when there is one (the database store writes in it)
   * @returns the SHA-256, 64 lower-case hex digits
   */
  put(data: Buffer, t?: Transaction): Promise<string>
  /** The bytes of a hash, or null when none are stored. */
  get(sha256: string): Promise<Buffer | null>
}

/** The SHA-256 of bytes, as files are named. */
export function contentHash(data: Buffer): string {
  return crypto.createHash('sha256').update(data).digest('hex')
}

function assertHash(sha256: string): void {
  if (!/^[0-9a-f]{64}$/.test(sha256)) throw new Error('not a SHA-256 hex digest')
}

/** The directory of the `directory` store. */
export function dataDir(): string {
  const configured = config().dataDir
  if (configured) return path.resolve(configured)
  if (databaseDialect() === 'postgres') return path.resolve('data', 'files')
  const db = databasePath()
  if (db === ':memory:') return path.join(os.tmpdir(), 'bandlight-files')
  return path.join(path.dirname(db), 'files')
}

/** The file of a content hash in the `directory` store; refuses anything but 64 lower-case hex digits. */
export function storedFilePath(sha256: string): string {
  assertHash(sha256)
  return path.join(dataDir(), sha256.slice(0, 2), sha256)
}

const directoryStore: FileStore = {
  kind: 'directory',
  async put(data) {
    const sha256 = contentHash(data)
    const file = storedFilePath(sha256)
    if (fs.existsSync(file)) return sha256
    await fs.promises.mkdir(path.dirname(file), { recursive: true })
    // Written aside and renamed, so a reader never sees half a file.
    const tmp = `${file}.${process.pid}.${crypto.randomBytes(6).toString('hex')}.tmp`
    await fs.promises.writeFile(tmp, data, { flag: 'wx' })
    await fs.promises.rename(tmp, file)
    return sha256
  },
  async get(sha256) {
    try {
      return await fs.promises.readFile(storedFilePath(sha256))
    }
    catch (err) {
      if ((err as NodeJS.ErrnoException).code === 'ENOENT') return null
      throw err
    }
  },
}

const databaseStore: FileStore = {
  kind: 'database',
  async put(data, t) {
    const sha256 = contentHash(data)
    // INSERT … ON CONFLICT DO NOTHING (PostgreSQL) / INSERT OR IGNORE (SQLite): two instances
    // storing the same bytes at once both succeed, and one row is kept.
    await FileContent.bulkCreate([{ sha256, size: data.length, data }], { ignoreDuplicates: true, transaction: t })
    return sha256
  },
  async get(sha256) {
    assertHash(sha256)
    const row = await FileContent.findByPk(sha256, { attributes: ['data'] })
    return row ? Buffer.from(row.data) : null
  },
}

/** The store FILE_STORAGE names (default: `directory` on SQLite, `database` on PostgreSQL). */
export function fileStore(): FileStore {
  const kind = config().fileStorage ?? (databaseDialect() === 'postgres' ? 'database' : 'directory')
  return kind === 'database' ? databaseStore : directoryStore
}
