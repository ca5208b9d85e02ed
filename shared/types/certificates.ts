/**
 * DTOs of the laboratory settings, certificates and the public verification
 * (server/api/settings/lab, server/api/certificates, server/api/verify).
 */
import type { CertificateStatus } from '../certificates/constants'

export interface LabSettingsDTO {
  name: string
  /** Street lines separated by newlines. */
  addressLines: string
  city: string
  postcode: string | null
  country: string
  email: string | null
  phone: string | null
  accreditationBody: string
  accreditationNumber: string
  numberPrefix: string
  numberIncludesYear: boolean
  numberDigits: number
  /** An example of the next number in this format (sequence 42 of the current year). */
  numberExample: string
  signatoryFunctions: string[]
  traceabilityStatement: string
  decisionRuleStatement: string
  itemsStatement: string
  reproductionStatement: string | null
  /** IANA time zone of the laboratory (its "today"). */
  timeZone: string
  version: number
  updatedAt: string
}

/** The laboratory's date today, in its own time zone (GET /api/settings/today). */
export interface LabTodayDTO {
  today: string
  timeZone: string
}

export interface CertificateDTO {
  id: number
  /** The number printed on the certificate, with its revision suffix (`BL-2026-00042-R1`). */
  number: string
  baseNumber: string
  revision: number
  status: CertificateStatus
  runId: number
  instrumentId: number
  instrumentSerial: string | null
  instrumentLabel: string | null
  organizationId: number
  organizationName: string | null
  calibrationDate: string
  /** Date of issue, YYYY-MM-DD. */
  issueDate: string
  issuedAt: string
  signedById: number
  signatoryName: string
  signatoryFunction: string
  signatureMeaning: string
  pdfSha256: string
  pdfSize: number
  /**
   * SHA-256 and size of the stored digital calibration certificate (DCC XML, GET
   * /api/certificates/[id]/dcc). Null for a revision issued before DCCs existed until its DCC is
   * first downloaded (it is then built from what the revision states and stored).
   */
  dccSha256: string | null
  dccSize: number | null
  /** The revision this one replaced, and why. */
  amendsId: number | null
  amendmentReason: string | null
  /** What the amendment changed, as the certificate states it. */
  amendmentChanges: string[]
  supersededById: number | null
  supersededAt: string | null
  withdrawnAt: string | null
  withdrawnByName: string | null
  withdrawalReason: string | null
  version: number
}

export interface CertificateDetailDTO extends CertificateDTO {
  /** Every revision of the same number, oldest first (this one included). */
  revisions: CertificateDTO[]
  /** The verification code and address printed on the certificate (its QR code points there). */
  verificationCode: string
  verificationUrl: string
}

/** The only answer of the public verification. */
export interface CertificateVerificationDTO {
  number: string
  issueDate: string
  instrumentSerial: string
  status: CertificateStatus
  /** When and why it was withdrawn (withdrawn certificates only). */
  withdrawnOn: string | null
  withdrawalReason: string | null
  /** The revision that replaces it (superseded certificates only). */
  supersededBy: string | null
}

/** GET /api/instruments/[id]/history: each certified calibration (valid certificates) with its points, and what is no longer valid. */
export interface InstrumentHistoryDTO {
  instrumentId: number
  calibrations: {
    certificateId: number
    number: string
    calibrationDate: string
    /** As the certificate states them; tolerance and verdict only where it states conformity (an agreement was on record). */
    points: { stage: 'as-found' | 'as-left', referenceTemperatureK: number, errorK: number, uncertaintyK: number, toleranceK: number | null, verdict: string | null }[]
  }[]
  /** Certificates of the instrument that are no longer valid: withdrawn (on, why) or superseded (by which revision). Newest first. */
  notices: { certificateId: number, number: string, status: 'withdrawn' | 'superseded', on: string | null, reason: string | null, supersededBy: string | null }[]
}
