import { certificateQuerySchema } from '#shared/schemas/certificate'
import type { CertificateDTO, Page } from '#shared/types'
import { requirePermission } from '#server/utils/access'
import { listCertificates } from '#server/services/certificates/certificates'
import { parseWith } from '#server/utils/validation'

/** Certificates, newest first, paged; a customer sees only its organization's, each with its status. */
export default defineEventHandler(async (event): Promise<Page<CertificateDTO>> => {
  const user = await requirePermission(event, 'certificate:read')
  const q = await getValidatedQuery(event, parseWith(certificateQuerySchema))
  return await listCertificates(user, q)
})
