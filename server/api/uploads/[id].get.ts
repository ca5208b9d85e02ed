import fs from 'node:fs'
import { idParamSchema } from '../../../shared/schemas/common'
import { Instrument } from '../../models/Instrument'
import { Upload } from '../../models/Upload'
import { notFound, requireRole } from '../../utils/access'
import { attachmentDisposition, uploadFilePath } from '../../utils/uploads'
import { parseWith } from '../../utils/validation'

/**
 * Download an upload as an attachment with its detected type. Laboratory roles get every file;
 * a customer only photos of its own organization's instruments; anything else answers 404.
 */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin', 'technician', 'quality', 'customer')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const upload = await Upload.findByPk(id)
  if (!upload) notFound('file')
  if (user.role === 'customer') {
    const own = upload.purpose === 'instrument-photo'
      && upload.organizationId !== null
      && upload.organizationId === user.organizationId
      && (await Instrument.count({ where: { photoUploadId: upload.id, organizationId: upload.organizationId } })) > 0
    if (!own) notFound('file')
  }
  const file = uploadFilePath(upload.sha256)
  if (!fs.existsSync(file)) notFound('file')
  setResponseHeaders(event, {
    'content-type': upload.mimeType,
    'content-length': upload.size,
    'content-disposition': attachmentDisposition(upload.originalName),
    'x-content-type-options': 'nosniff',
    'cache-control': 'private, no-store',
  })
  return sendStream(event, fs.createReadStream(file))
})
