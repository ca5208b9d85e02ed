import { LAB_ROLES } from '../../../shared/roles'
import { certificateQuerySchema } from '../../../shared/schemas/certificate'
import type { CertificateDTO, Page } from '../../../shared/types'
import { requireRole } from '../../utils/access'
import { listCertificates } from '../../utils/certificates'
import { parseWith } from '../../utils/validation'

/** Certificates, newest first, paged; a customer sees only its organization's, each with its status. */
export default defineEventHandler(async (event): Promise<Page<CertificateDTO>> => {
  const user = await requireRole(event, ...LAB_ROLES, 'customer')
  const q = await getValidatedQuery(event, parseWith(certificateQuerySchema))
  return await listCertificates(user, q)
})
