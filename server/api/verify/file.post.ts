import type { CertificateVerificationDTO } from '#shared/types'
import { fileNotVerified, verifyCertificateFile } from '#server/services/certificates/verification'
import { tooManyRequests, waitInWords, invalidInput } from '#server/utils/errors'
import { clientAddress } from '#server/utils/request'
import { verifyFailed, verifyThrottle } from '#server/utils/throttle'

/**
 * Public verification of a PDF file (no sign-in): the body is the PDF's bytes, or a multipart form
 * with one file, at most the size in OPEN_BODY_LIMITS (server/utils/bodyLimits.ts), refused with 413
 * while it streams in. Its SHA-256 is matched against the stored certificates' → the same four
 * facts as GET /api/verify, or 404 when the file is not exactly one the laboratory issued.
 */
export default defineEventHandler(async (event): Promise<CertificateVerificationDTO> => {
  const address = clientAddress(event)
  const wait = await verifyThrottle(address)
  if (wait > 0) tooManyRequests(event, wait, `Too many verification requests. Try again in ${waitInWords(wait)}.`)
  const type = getRequestHeader(event, 'content-type') ?? ''
  let bytes: Buffer | undefined
  if (type.startsWith('multipart/form-data')) {
    let parts: Awaited<ReturnType<typeof readMultipartFormData>>
    try {
      parts = await readMultipartFormData(event)
    }
    catch {
      invalidInput({ file: 'The multipart form could not be read' })
    }
    const file = parts?.find(p => p.filename !== undefined) ?? parts?.[0]
    bytes = file?.data
  }
  else {
    const raw = await readRawBody(event, false)
    bytes = raw ? Buffer.from(raw) : undefined
  }
  if (!bytes || !bytes.length) invalidInput({ file: 'Send the PDF file of the certificate' })
  if (bytes.subarray(0, 5).toString('latin1') !== '%PDF-') invalidInput({ file: 'Not a PDF file' })
  const found = await verifyCertificateFile(bytes)
  if (!found) {
    await verifyFailed(address)
    fileNotVerified()
  }
  return found
})
