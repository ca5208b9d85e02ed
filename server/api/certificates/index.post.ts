import { certificateIssueSchema } from '../../../shared/schemas/certificate'
import type { CertificateDetailDTO } from '../../../shared/types'
import { requireRole } from '../../utils/access'
import { certificateDetail, issueCertificateIn, verifySigningPassword } from '../../utils/certificates'
import { inTransaction } from '../../utils/transaction'
import { parseWith } from '../../utils/validation'

/**
 * Sign and issue the certificate of an approved run. The quality manager enters their password
 * again (400 naming `password` when wrong, 429 after repeated failures); the number is allocated
 * in the same transaction as the certificate, so numbers have no gaps and never repeat.
 */
export default defineEventHandler(async (event): Promise<CertificateDetailDTO> => {
  const user = await requireRole(event, 'quality')
  const input = await readValidatedBody(event, parseWith(certificateIssueSchema))
  const signer = await verifySigningPassword(event, user, input.password)
  const cert = await inTransaction(t => issueCertificateIn(t, { user: signer, signatoryFunction: input.signatoryFunction }, input.runId))
  setResponseStatus(event, 201)
  return await certificateDetail(user, cert.id)
})
