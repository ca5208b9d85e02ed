import type { CertificateVerificationDTO } from '../../../shared/types'
import { notVerified, verifyCertificateFile } from '../../utils/certificates'
import { verifyFailed, verifyThrottle } from '../../utils/certificateThrottle'
import { invalidInput } from '../../utils/registers'
import { maxUploadBytes } from '../../utils/uploads'

/**
 * Public verification of a PDF file (no sign-in): the body is the PDF's bytes, or a multipart form
 * with one file. Its SHA-256 is matched against the stored certificates' → the same four facts as
 * GET /api/verify, or 404 when the file is not exactly one the laboratory issued.
 */
export default defineEventHandler(async (event): Promise<CertificateVerificationDTO> => {
  const address = getRequestIP(event, { xForwardedFor: process.env.TRUST_PROXY === '1' }) ?? 'unknown'
  const wait = verifyThrottle(address)
  if (wait > 0) {
    setResponseHeader(event, 'Retry-After', wait)
    throw createError({ statusCode: 429, statusMessage: 'Too Many Requests', message: `Too many verification requests. Try again in ${Math.ceil(wait / 60)} min.` })
  }
  const type = getRequestHeader(event, 'content-type') ?? ''
  let bytes: Buffer | undefined
  if (type.startsWith('multipart/form-data')) {
    const parts = await readMultipartFormData(event)
    const file = parts?.find(p => p.filename !== undefined) ?? parts?.[0]
    bytes = file?.data
  }
  else {
    const raw = await readRawBody(event, false)
    bytes = raw ? Buffer.from(raw) : undefined
  }
  if (!bytes || !bytes.length) invalidInput({ file: 'Send the PDF file of the certificate' })
  if (bytes.length > maxUploadBytes()) invalidInput({ file: 'The file is larger than any certificate' })
  if (bytes.subarray(0, 5).toString('latin1') !== '%PDF-') invalidInput({ file: 'Not a PDF file' })
  const found = await verifyCertificateFile(bytes)
  if (!found) {
    verifyFailed(address)
    notVerified()
  }
  return found
})
