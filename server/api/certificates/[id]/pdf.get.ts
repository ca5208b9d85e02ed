import { idParamSchema } from '#shared/schemas/common'
import { certificatePdfFile } from '#server/services/certificates/certificates'
import { sendStoredFile } from '#server/services/uploads/uploads'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/**
 * The PDF exactly as issued (its SHA-256 is on the certificate): nothing is added or regenerated,
 * also for superseded and withdrawn revisions. Customers get only their organization's.
 */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'certificate:read')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  return sendStoredFile(event, await certificatePdfFile(user, id))
})
