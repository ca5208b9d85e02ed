import { idParamSchema } from '../../../../shared/schemas/common'
import { certificateWithdrawSchema } from '../../../../shared/schemas/certificate'
import type { CertificateDetailDTO } from '../../../../shared/types'
import { requireRole } from '../../../utils/access'
import { certificateDetail, oneAtATime, verifySigningPassword, withdrawCertificateIn } from '../../../utils/certificates'
import { inTransaction } from '../../../utils/transaction'
import { parseWith } from '../../../utils/validation'

/** Withdraw the valid revision of a certificate, with the reason; it stays on record as withdrawn. */
export default defineEventHandler(async (event): Promise<CertificateDetailDTO> => {
  const user = await requireRole(event, 'quality')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(certificateWithdrawSchema))
  const address = getRequestIP(event, { xForwardedFor: process.env.TRUST_PROXY === '1' }) ?? 'unknown'
  const signer = await verifySigningPassword(user, input.password, address)
  await oneAtATime(() => inTransaction(t => withdrawCertificateIn(t, signer, id, input.reason)))
  return await certificateDetail(user, id)
})
