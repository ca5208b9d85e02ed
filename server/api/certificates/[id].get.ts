import { idParamSchema } from '#shared/schemas/common'
import type { CertificateDetailDTO } from '#shared/types'
import { requirePermission } from '#server/utils/access'
import { certificateDetail } from '#server/services/certificates/certificates'
import { parseWith } from '#server/utils/validation'

/** A certificate with every revision of its number; another organization's answers 404 to a customer. */
export default defineEventHandler(async (event): Promise<CertificateDetailDTO> => {
  const user = await requirePermission(event, 'certificate:read')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  return await certificateDetail(user, id)
})
