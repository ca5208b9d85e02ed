import { verifyQuerySchema } from '#shared/schemas/certificate'
import type { CertificateVerificationDTO } from '#shared/types'
import { notVerified, verifyCertificate } from '#server/services/certificates/verification'
import { tooManyRequests, waitInWords } from '#server/utils/errors'
import { clientAddress } from '#server/utils/request'
import { verifyFailed, verifyThrottle } from '#server/utils/throttle'
import { parseWith } from '#server/utils/validation'

/**
 * Public verification (no sign-in; listed in OPEN_API_ROUTES): number + verification code → the
 * number, issue date, instrument serial and status, nothing else. Unknown number or wrong code
 * answer the same 404. Throttled by client address.
 */
export default defineEventHandler(async (event): Promise<CertificateVerificationDTO> => {
  const address = clientAddress(event)
  const wait = await verifyThrottle(address)
  if (wait > 0) tooManyRequests(event, wait, `Too many verification requests. Try again in ${waitInWords(wait)}.`)
  const { number, code } = await getValidatedQuery(event, parseWith(verifyQuerySchema))
  const found = await verifyCertificate(number, code)
  if (!found) {
    await verifyFailed(address)
    notVerified()
  }
  setResponseHeader(event, 'cache-control', 'no-store')
  return found
})
