/** Public verification of a certificate: by number and code, or by the exact bytes of its PDF. It tells the number, issue date, serial and status, nothing else. */
import { createError } from 'h3'
import crypto from 'node:crypto'
import { normalizeVerificationCode } from '#shared/certificates/numbers'
import type { CertificateVerificationDTO } from '#shared/types'
import { Certificate } from '#server/models/Certificate'

const NOT_VERIFIED = 'No certificate matches this number and verification code'

function verification(c: Certificate): CertificateVerificationDTO {
  return { number: c.number, issueDate: c.issueDate, instrumentSerial: c.instrumentSerial, status: c.status }
}

/** Number + code → the four public facts, or null (unknown number or wrong code alike). */
export async function verifyCertificate(number: string, code: string): Promise<CertificateVerificationDTO | null> {
  const cert = await Certificate.findOne({ where: { number: number.trim() }, attributes: ['id', 'number', 'issueDate', 'instrumentSerial', 'status', 'verificationCode'] })
  const given = Buffer.from(normalizeVerificationCode(code))
  const stored = Buffer.from(cert?.verificationCode ?? '0000000000')
  const same = given.length === stored.length && crypto.timingSafeEqual(given, stored)
  return cert && same ? verification(cert) : null
}

/** The bytes of a PDF → the certificate whose stored PDF has exactly this SHA-256, or null. */
export async function verifyCertificateFile(bytes: Buffer): Promise<CertificateVerificationDTO | null> {
  const sha256 = crypto.createHash('sha256').update(bytes).digest('hex')
  const cert = await Certificate.findOne({ where: { pdfSha256: sha256 }, attributes: ['id', 'number', 'issueDate', 'instrumentSerial', 'status'], order: [['id', 'DESC']] })
  return cert ? verification(cert) : null
}

export function notVerified(): never {
  throw createError({ statusCode: 404, statusMessage: 'Not Found', message: NOT_VERIFIED })
}
