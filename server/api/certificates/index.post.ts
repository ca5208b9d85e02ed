import { certificateIssueSchema } from '#shared/schemas/certificate'
import { issueCertificate } from '#server/services/certificates/issue'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/**
 * Sign and issue the certificate of an approved run. The quality manager enters their password
 * again (400 naming `password` when wrong, 429 after repeated failures); the number is allocated
 * in the same transaction as the certificate, so numbers have no gaps and never repeat.
 */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'certificate:sign')
  const input = await readValidatedBody(event, parseWith(certificateIssueSchema))
  const cert = await issueCertificate(event, user, input)
  setResponseStatus(event, 201)
  return cert
})
