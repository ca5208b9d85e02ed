/**
 * Public verification of a certificate: by number and code, or by the exact bytes of its PDF.
 * It tells the number, issue date, serial and status — and, for a certificate that is no longer
 * valid, when and why it was withdrawn or which revision replaces it — nothing else.
 */
import { createError } from 'h3'
import crypto from 'node:crypto'
import { normalizeVerificationCode } from '#shared/certificates/numbers'
import type { CertificateVerificationDTO } from '#shared/types'
import { Certificate } from '#server/models/Certificate'
import { labToday } from '#server/services/settings/today'

const NOT_VERIFIED = 'No certificate matches this number and verification code'
const FILE_NOT_VERIFIED = 'This file matches no certificate the laboratory issued: it is not an issued certificate, or it was changed after issue'
const ATTRIBUTES = ['id', 'number', 'issueDate', 'instrumentSerial', 'status', 'withdrawnAt', 'withdrawalReason', 'supersededById']

async function verification(c: Certificate): Promise<CertificateVerificationDTO> {
  const successor = c.supersededById ? await Certificate.findByPk(c.supersededById, { attributes: ['number', 'revision'] }) : null
  return {
    number: c.number,
    issueDate: c.issueDate,
    instrumentSerial: c.instrumentSerial,
    status: c.status,
    withdrawnOn: c.status === 'withdrawn' && c.withdrawnAt ? await labToday(c.withdrawnAt) : null,
    withdrawalReason: c.status === 'withdrawn' ? c.withdrawalReason : null,
    supersededBy: successor?.number ?? null,
  }
}

/** Number + code → the public facts, or null (unknown number or wrong code alike). */
export async function verifyCertificate(number: string, code: string): Promise<CertificateVerificationDTO | null> {
  const cert = await Certificate.findOne({ where: { number: number.trim() }, attributes: [...ATTRIBUTES, 'verificationCode'] })
  const given = Buffer.from(normalizeVerificationCode(code))
  const stored = Buffer.from(cert?.verificationCode ?? '0000000000')
  const same = given.length === stored.length && crypto.timingSafeEqual(given, stored)
  return cert && same ? verification(cert) : null
}

/** The bytes of a PDF → the certificate whose stored PDF has exactly this SHA-256, or null. */
export async function verifyCertificateFile(bytes: Buffer): Promise<CertificateVerificationDTO | null> {
  const sha256 = crypto.createHash('sha256').update(bytes).digest('hex')
  const cert = await Certificate.findOne({ where: { pdfSha256: sha256 }, attributes: ATTRIBUTES, order: [['id', 'DESC']] })
  return cert ? verification(cert) : null
}

/** 404 for a number and code that match nothing. */
export function notVerified(): never {
  throw createError({ statusCode: 404, statusMessage: 'Not Found', message: NOT_VERIFIED })
}

/** 404 for a file whose bytes match no issued certificate (tampered, or never issued). */
export function fileNotVerified(): never {
  throw createError({ statusCode: 404, statusMessage: 'Not Found', message: FILE_NOT_VERIFIED })
}
