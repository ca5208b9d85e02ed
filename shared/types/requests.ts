import type { AccuracySpec } from '../schemas/instrument'
import type { AgreementMethod, RequestStatus, RequestTermsInput } from '../schemas/request'

/** The laboratory's capability check of the terms, per instrument and point. */
export interface CapabilityFinding {
  instrumentId: number | null
  pointK: number | null
  ok: boolean
  message: string
}

/** The terms the laboratory offered, with its capability check and who reviewed. */
export interface RequestTerms extends RequestTermsInput {
  procedureName: string
  procedureVersionNumber: number
  capability: CapabilityFinding[]
}

export interface CalibrationRequestDTO {
  id: number
  organizationId: number
  organizationName: string | null
  requestedBy: number
  requestedByName: string | null
  instruments: { id: number, serial: string, maker: string, model: string }[]
  preferredDate: string | null
  requirements: string | null
  /** The specification the customer named when asking. */
  specification: AccuracySpec | null
  notes: string | null
  status: RequestStatus
  terms: RequestTerms | null
  termsVersion: number
  reviewedByName: string | null
  reviewedAt: string | null
  agreedTermsVersion: number | null
  agreedAt: string | null
  agreedByName: string | null
  agreementMethod: AgreementMethod | null
  agreementNote: string | null
  handledByName: string | null
  handledAt: string | null
  response: string | null
  runIds: number[]
  version: number
  createdAt: string
}
