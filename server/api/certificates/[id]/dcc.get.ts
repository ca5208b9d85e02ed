import { idParamSchema } from '#shared/schemas/common'
import { certificateDccFile } from '#server/services/certificates/dcc'
import { sendStoredFile } from '#server/services/uploads/uploads'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/**
 * The digital calibration certificate (DCC XML, PTB schema 3.1.2) of a certificate revision, as
 * stored when it was issued (its SHA-256 is on the certificate), with the signed PDF embedded;
 * also for superseded and withdrawn revisions. Customers get only their organization's.
 */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'certificate:read')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  return sendStoredFile(event, await certificateDccFile(user, id))
})
