import { verifyQuerySchema } from '../../../shared/schemas/certificate'
import type { CertificateVerificationDTO } from '../../../shared/types'
import { notVerified, verifyCertificate } from '../../utils/certificates'
import { verifyFailed, verifyThrottle } from '../../utils/certificateThrottle'
import { parseWith } from '../../utils/validation'

/**
 * Public verification (no sign-in; listed in OPEN_API_ROUTES): number + verification code → the
 * number, issue date, instrument serial and status, nothing else. Unknown number or wrong code
 * answer the same 404. Throttled by client address.
 */
export default defineEventHandler(async (event): Promise<CertificateVerificationDTO> => {
  const address = getRequestIP(event, { xForwardedFor: process.env.TRUST_PROXY === '1' }) ?? 'unknown'
  const wait = verifyThrottle(address)
  if (wait > 0) {
    setResponseHeader(event, 'Retry-After', wait)
    throw createError({ statusCode: 429, statusMessage: 'Too Many Requests', message: `Too many verification requests. Try again in ${Math.ceil(wait / 60)} min.` })
  }
  const { number, code } = await getValidatedQuery(event, parseWith(verifyQuerySchema))
  const found = await verifyCertificate(number, code)
  if (!found) {
    verifyFailed(address)
    notVerified()
  }
  setResponseHeader(event, 'cache-control', 'no-store')
  return found
})
