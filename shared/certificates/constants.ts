/** Vocabularies of certificates, with their labels for the UI and the verification page. */

/** valid → superseded (a later revision replaced it) or → withdrawn; never back. */
export const CERTIFICATE_STATUSES = ['valid', 'superseded', 'withdrawn'] as const
export type CertificateStatus = (typeof CERTIFICATE_STATUSES)[number]
export const CERTIFICATE_STATUS_LABELS: Record<CertificateStatus, string> = {
  valid: 'Valid',
  superseded: 'Superseded by a later revision',
  withdrawn: 'Withdrawn',
}

/** What the signature on a certificate means (ISO/IEC 17025 7.8.2.1 o). */
export const SIGNATURE_MEANING = 'authorized for issue'
