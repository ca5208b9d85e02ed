/**
 * Uploaded files: stored once under the data directory by the SHA-256 of their content
 * (`<data dir>/ab/abcdef…`), never under a name the client chose. The type is detected from the
 * bytes: PDF (`%PDF-`), PNG (its 8-byte signature), JPEG (`FF D8 FF`), or CSV (valid UTF-8 text
 * without NUL bytes that papaparse reads into rows of at least two columns).
 *
 * BANDLIGHT_DATA_DIR names the directory (default: `files/` beside the SQLite file);
 * UPLOAD_MAX_BYTES the size limit (default 10 MB).
 */
import crypto from 'node:crypto'
import fs from 'node:fs'
import os from 'node:os'
import path from 'node:path'
import Papa from 'papaparse'
import type { UploadType } from '../../shared/registers/constants'
import { config } from './config'
import { databasePath } from './db'

export function maxUploadBytes(): number {
  return config().uploadMaxBytes
}

/** Where files are kept. */
export function dataDir(): string {
  const configured = config().dataDir
  if (configured) return path.resolve(configured)
  const db = databasePath()
  if (db === ':memory:') return path.join(os.tmpdir(), 'bandlight-files')
  return path.join(path.dirname(db), 'files')
}

/** The file of a content hash; refuses anything but 64 lower-case hex digits. */
export function uploadFilePath(sha256: string): string {
  if (!/^[0-9a-f]{64}$/.test(sha256)) throw new Error('not a SHA-256 hex digest')
  return path.join(dataDir(), sha256.slice(0, 2), sha256)
}

const PNG = Buffer.from([0x89, 0x50, 0x4E, 0x47, 0x0D, 0x0A, 0x1A, 0x0A])

/** The content type of the bytes, or null when they are none of PDF, PNG, JPEG, CSV. */
export function detectUploadType(data: Buffer): UploadType | null {
  if (data.length >= 5 && data.subarray(0, 5).toString('latin1') === '%PDF-') return 'application/pdf'
  if (data.length >= 8 && data.subarray(0, 8).equals(PNG)) return 'image/png'
  if (data.length >= 3 && data[0] === 0xFF && data[1] === 0xD8 && data[2] === 0xFF) return 'image/jpeg'
  if (data.includes(0)) return null
  let text: string
  try {
    text = new TextDecoder('utf-8', { fatal: true }).decode(data)
  }
  catch {
    return null
  }
  const parsed = Papa.parse<string[]>(text.replace(/^\uFEFF/, ''), { skipEmptyLines: 'greedy', preview: 200 })
  const rows = parsed.data
  if (!rows.length || parsed.errors.some(e => e.type === 'Quotes')) return null
  if (!rows.every(r => r.length >= 2)) return null
  return 'text/csv'
}

/**
 * A display name: no path, no control characters, no bidirectional-text controls (which can make
 * `invoice‮fdp.exe` show as `invoiceexe.pdf`), at most 200 characters. Never used as a path.
 */
export function sanitizeFileName(name: string | undefined): string {
  const base = (name ?? '').split(/[\\/]/).pop() ?? ''
  // eslint-disable-next-line no-control-regex
  const clean = base.replace(/[\u0000-\u001f\u007f-\u009f"<>|:*?\u061c\u200e\u200f\u202a-\u202e\u2066-\u2069]/g, '').replace(/\s+/g, ' ').trim().slice(0, 200)
  return clean || 'file'
}

/** Store bytes by their hash (once; a second copy of the same content is not rewritten). */
export async function storeUploadBytes(data: Buffer): Promise<string> {
  const sha256 = crypto.createHash('sha256').update(data).digest('hex')
  const file = uploadFilePath(sha256)
  if (fs.existsSync(file)) return sha256
  await fs.promises.mkdir(path.dirname(file), { recursive: true })
  const tmp = `${file}.${process.pid}.${crypto.randomBytes(6).toString('hex')}.tmp`
  await fs.promises.writeFile(tmp, data, { flag: 'wx' })
  await fs.promises.rename(tmp, file)
  return sha256
}

/** `attachment; filename="…"; filename*=UTF-8''…` for a display name. */
export function attachmentDisposition(name: string): string {
  const ascii = name.replace(/[^\x20-\x7e]/g, '_').replace(/["\\]/g, '_')
  return `attachment; filename="${ascii}"; filename*=UTF-8''${encodeURIComponent(name)}`
}
