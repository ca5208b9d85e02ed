import { idParamSchema } from '../../../../shared/schemas/common'
import { certificateAmendSchema } from '../../../../shared/schemas/certificate'
import type { CertificateDetailDTO } from '../../../../shared/types'
import { requireRole } from '../../../utils/access'
import { amendCertificateIn, certificateDetail, verifySigningPassword } from '../../../utils/certificates'
import { inTransaction } from '../../../utils/transaction'
import { parseWith } from '../../../utils/validation'

/** Issue a new revision of the same number (`-R1` …) with the reason; the earlier one becomes superseded. */
export default defineEventHandler(async (event): Promise<CertificateDetailDTO> => {
  const user = await requireRole(event, 'quality')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(certificateAmendSchema))
  const signer = await verifySigningPassword(event, user, input.password)
  const cert = await inTransaction(t => amendCertificateIn(t, { user: signer, signatoryFunction: input.signatoryFunction }, id, input.reason))
  setResponseStatus(event, 201)
  return await certificateDetail(user, cert.id)
})
