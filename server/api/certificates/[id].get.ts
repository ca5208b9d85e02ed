import { LAB_ROLES } from '../../../shared/roles'
import { idParamSchema } from '../../../shared/schemas/common'
import type { CertificateDetailDTO } from '../../../shared/types'
import { requireRole } from '../../utils/access'
import { certificateDetail } from '../../utils/certificates'
import { parseWith } from '../../utils/validation'

/** A certificate with every revision of its number; another organization's answers 404 to a customer. */
export default defineEventHandler(async (event): Promise<CertificateDetailDTO> => {
  const user = await requireRole(event, ...LAB_ROLES, 'customer')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  return await certificateDetail(user, id)
})
