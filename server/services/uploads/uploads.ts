/**
 * Uploaded files: stored once by the SHA-256 of their content through the file store
 * (server/utils/fileStore.ts: the data directory, `<data dir>/ab/abcdef…`, or the database),
 * never under a name the client chose. The type is detected from the
 * bytes: PDF (`%PDF-`), PNG (its 8-byte signature), JPEG (`FF D8 FF`), or CSV (valid UTF-8 text
 * without NUL bytes that papaparse reads into rows of at least two columns).
 *
 * FILE_STORAGE and BANDLIGHT_DATA_DIR choose where; UPLOAD_MAX_BYTES the size limit (default 10 MB).
 */
import type { Transaction } from 'sequelize'
import Papa from 'papaparse'
import { createError, setResponseHeaders, type H3Event } from 'h3'
import { can } from '#shared/permissions'
import { UPLOAD_TYPES_BY_PURPOSE, type UploadType } from '#shared/registers/constants'
import { fieldErrors } from '#shared/schemas/errors'
import { uploadFieldsSchema } from '#shared/schemas/upload'
import type { SessionUser, UploadDTO } from '#shared/types'
import { Instrument } from '#server/models/Instrument'
import { Upload } from '#server/models/Upload'
import { createAudited } from '#server/utils/audit'
import { forbidden, invalidInput, notFound } from '#server/utils/errors'
import type { FileForm } from '#server/utils/multipart'
import { inTransaction } from '#server/utils/transaction'
import { assertActiveOrganization } from '#server/services/organizations/organizations'
import { uploadDTO } from './dto'
import { config } from '#server/utils/config'
import { contentHash, dataDir, fileStore, storedFilePath } from '#server/utils/fileStore'

export function maxUploadBytes(): number {
  return config().uploadMaxBytes
}

/** Where files are kept when they are kept in a directory (server/utils/fileStore.ts). */
export { dataDir }

/** The file of a content hash in the directory store; refuses anything but 64 lower-case hex digits. */
export function uploadFilePath(sha256: string): string {
  return storedFilePath(sha256)
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

/**
 * Store bytes by their hash (once; a second copy of the same content is not rewritten).
 * @param t - the caller's transaction, if any: the database store writes in it
 */
export async function storeUploadBytes(data: Buffer, t?: Transaction): Promise<string> {
  return fileStore().put(data, t)
}

/**
 * The bytes stored under a content hash, checked against it: 404 when the file is missing; an
 * error when its content no longer has that hash (the store was damaged — never served as if whole).
 */
export async function readStoredBytes(sha256: string): Promise<Buffer> {
  const data = await fileStore().get(sha256)
  if (!data) notFound('file')
  if (contentHash(data) !== sha256) throw new Error(`stored file ${sha256} does not match its hash`)
  return data
}

/** `attachment; filename="…"; filename*=UTF-8''…` for a display name. */
export function attachmentDisposition(name: string): string {
  const ascii = name.replace(/[^\x20-\x7e]/g, '_').replace(/["\\]/g, '_')
  return `attachment; filename="${ascii}"; filename*=UTF-8''${encodeURIComponent(name)}`
}

/**
 * Store an uploaded file of a purpose (multipart fields `purpose`, `organizationId` for instrument
 * photos, and one `file`): type detected from the content, size and purpose checked, bytes stored
 * by hash, an audited `Upload` row. Equipment certificates only for those who manage equipment.
 */
export async function createUpload(actor: SessionUser, form: FileForm): Promise<UploadDTO> {
  const checked = uploadFieldsSchema.safeParse(form.fields)
  if (!checked.success) invalidInput(fieldErrors(checked.error))
  const { purpose, organizationId } = checked.data
  if (purpose === 'equipment-certificate' && !can(actor, 'equipment:edit')) forbidden('Quality and admin manage reference equipment certificates', 'purpose')
  const files = form.files.filter(f => f.name === 'file')
  if (files.length !== 1) invalidInput({ file: 'Send exactly one file in the field "file"' })
  const file = files[0]!
  if (file.data.length === 0) invalidInput({ file: 'The file is empty' })
  const max = maxUploadBytes()
  if (file.data.length > max) {
    const message = `The file is larger than ${Math.round(max / 1024)} KiB`
    throw createError({ statusCode: 413, statusMessage: 'Payload Too Large', message, data: { fields: { file: message } } })
  }
  const mimeType = detectUploadType(file.data)
  const allowed = UPLOAD_TYPES_BY_PURPOSE[purpose]
  if (!mimeType || !allowed.includes(mimeType)) {
    const message = `${mimeType ? `A ${mimeType} file` : 'This content'} is not accepted for ${purpose}; expected ${allowed.join(' or ')} (detected from the content, not the name)`
    throw createError({ statusCode: 415, statusMessage: 'Unsupported Media Type', message, data: { fields: { file: message } } })
  }
  if (organizationId) await assertActiveOrganization(organizationId)
  const sha256 = await storeUploadBytes(file.data)
  const row = await inTransaction(t => createAudited(t, actor, Upload, {
    sha256, size: file.data.length, mimeType, originalName: sanitizeFileName(file.filename), purpose, organizationId: organizationId ?? null, uploadedBy: actor.id,
  }, { entity: 'Upload', action: 'upload' }))
  return uploadDTO(row)
}

/**
 * An upload the user may download: lab staff every file; a customer only photos of its own
 * organization's instruments; anything else 404.
 */
export async function downloadableUpload(user: SessionUser, id: number): Promise<StoredFile> {
  const upload = await Upload.findByPk(id)
  if (!upload) notFound('file')
  if (user.role === 'customer') {
    const own = upload.purpose === 'instrument-photo'
      && upload.organizationId !== null
      && upload.organizationId === user.organizationId
      && (await Instrument.count({ where: { photoUploadId: upload.id, organizationId: upload.organizationId } })) > 0
    if (!own) notFound('file')
  }
  return { sha256: upload.sha256, type: upload.mimeType, size: upload.size, name: upload.originalName }
}

/** A stored file as it is sent: by content hash, with its type, size and the name to save it under. */
export interface StoredFile {
  sha256: string
  type: string
  size: number
  name: string
}

/** Send a stored file as an attachment (never shown inline, never cached); 404 when its bytes are missing. */
export async function sendStoredFile(event: H3Event, file: StoredFile): Promise<Buffer> {
  const bytes = await fileStore().get(file.sha256)
  if (!bytes) notFound('file')
  setResponseHeaders(event, {
    'content-type': file.type,
    'content-length': bytes.length,
    'content-disposition': attachmentDisposition(file.name),
    'x-content-type-options': 'nosniff',
    'cache-control': 'private, no-store',
  })
  return bytes
}
