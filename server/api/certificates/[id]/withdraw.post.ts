import { idParamSchema } from '../../../../shared/schemas/common'
import { certificateWithdrawSchema } from '../../../../shared/schemas/certificate'
import type { CertificateDetailDTO } from '../../../../shared/types'
import { requireRole } from '../../../utils/access'
import { certificateDetail, verifySigningPassword, withdrawCertificateIn } from '../../../utils/certificates'
import { inTransaction } from '../../../utils/transaction'
import { parseWith } from '../../../utils/validation'

/** Withdraw the valid revision of a certificate, with the reason; it stays on record as withdrawn. */
export default defineEventHandler(async (event): Promise<CertificateDetailDTO> => {
  const user = await requireRole(event, 'quality')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(certificateWithdrawSchema))
  const signer = await verifySigningPassword(event, user, input.password)
  await inTransaction(t => withdrawCertificateIn(t, signer, id, input.reason))
  return await certificateDetail(user, id)
})
