import fs from 'node:fs'
import { LAB_ROLES } from '../../../../shared/roles'
import { idParamSchema } from '../../../../shared/schemas/common'
import { requireRole } from '../../../utils/access'
import { certificateFile, scopedCertificate } from '../../../utils/certificates'
import { attachmentDisposition } from '../../../utils/uploads'
import { parseWith } from '../../../utils/validation'

/**
 * The PDF exactly as issued (its SHA-256 is on the certificate): nothing is added or regenerated,
 * also for superseded and withdrawn revisions. Customers get only their organization's.
 */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, ...LAB_ROLES, 'customer')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const cert = await scopedCertificate(user, id)
  const file = certificateFile(cert)
  setResponseHeaders(event, {
    'content-type': 'application/pdf',
    'content-length': cert.pdfSize,
    'content-disposition': attachmentDisposition(`${cert.number}.pdf`),
    'x-content-type-options': 'nosniff',
    'cache-control': 'private, no-store',
  })
  return sendStream(event, fs.createReadStream(file))
})
