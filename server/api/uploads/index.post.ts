import { LAB_ROLES } from '../../../shared/roles'
import { UPLOAD_TYPES_BY_PURPOSE } from '../../../shared/registers/constants'
import { fieldErrors } from '../../../shared/schemas/errors'
import { uploadFieldsSchema } from '../../../shared/schemas/upload'
import { Upload } from '../../models/Upload'
import { requireRole } from '../../utils/access'
import { recordAudit, snapshot } from '../../utils/audit'
import { assertActiveOrganization } from '../../utils/organizations'
import { uploadDTO } from '../../utils/presentRegisters'
import { invalidInput } from '../../utils/registers'
import { inTransaction } from '../../utils/transaction'
import { detectUploadType, maxUploadBytes, sanitizeFileName, storeUploadBytes } from '../../utils/uploads'

function tooLarge(max: number): never {
  const message = `The file is larger than ${Math.round(max / 1024)} KiB`
  throw createError({ statusCode: 413, statusMessage: 'Payload Too Large', message, data: { fields: { file: message } } })
}

/**
 * Upload a file (multipart form: `file`, `purpose`, and `organizationId` for instrument photos).
 * The type is detected from the content; equipment certificates may be uploaded by quality and
 * admin only, responsivity tables and instrument photos by every laboratory role.
 */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, ...LAB_ROLES)
  const max = maxUploadBytes()

  let parts: Awaited<ReturnType<typeof readMultipartFormData>>
  try {
    parts = await readMultipartFormData(event)
  }
  catch {
    invalidInput({ file: 'The multipart form could not be read' })
  }
  if (!parts) invalidInput({ file: 'Send a multipart form with the file in the field "file"' })

  const fields: Record<string, string> = {}
  for (const p of parts) if (p.name && p.name !== 'file' && p.filename === undefined) fields[p.name] = p.data.toString('utf8')
  const checked = uploadFieldsSchema.safeParse(fields)
  if (!checked.success) invalidInput(fieldErrors(checked.error))
  const { purpose, organizationId } = checked.data
  if (purpose === 'equipment-certificate' && user.role === 'technician') {
    throw createError({ statusCode: 403, statusMessage: 'Forbidden', message: 'Quality and admin manage reference equipment certificates' })
  }

  const files = parts.filter(p => p.name === 'file')
  if (files.length !== 1 || files[0]!.filename === undefined) invalidInput({ file: 'Send exactly one file in the field "file"' })
  const file = files[0]!
  if (file.data.length === 0) invalidInput({ file: 'The file is empty' })
  if (file.data.length > max) tooLarge(max)

  const mimeType = detectUploadType(file.data)
  const allowed = UPLOAD_TYPES_BY_PURPOSE[purpose]
  if (!mimeType || !allowed.includes(mimeType)) {
    const message = `${mimeType ? `A ${mimeType} file` : 'This content'} is not accepted for ${purpose}; expected ${allowed.join(' or ')} (detected from the content, not the name)`
    throw createError({ statusCode: 415, statusMessage: 'Unsupported Media Type', message, data: { fields: { file: message } } })
  }
  if (organizationId) await assertActiveOrganization(organizationId)

  const sha256 = await storeUploadBytes(file.data)
  const row = await inTransaction(async (t) => {
    const created = await Upload.create(
      { sha256, size: file.data.length, mimeType, originalName: sanitizeFileName(file.filename), purpose, organizationId: organizationId ?? null, uploadedBy: user.id },
      { transaction: t },
    )
    await recordAudit(t, { userId: user.id, action: 'upload', entity: 'Upload', entityId: created.id, after: snapshot(created) })
    return created
  })
  setResponseStatus(event, 201)
  return uploadDTO(row)
})
