// What the register routes return (sources, reference instruments, customers, instruments,
// responsivity tables, uploads). Dates of calibration and due dates are `YYYY-MM-DD`;
// timestamps are ISO 8601 date-times.
import type {
  CertifiedBasis,
  EquipmentStatus,
  EquipmentType,
  InstrumentKind,
  InstrumentStatus,
  RangeUnit,
  ReferenceKind,
  SourceKind,
  UploadPurpose,
  WavelengthMediumName,
} from '../registers/constants'
import type { AccuracySpec } from '../schemas/instrument'
import type { AuditEventDTO, OrganizationDTO } from './index'

export interface EquipmentCalibrationDTO {
  id: number
  equipmentType: EquipmentType
  equipmentId: number
  provider: string
  certificateNumber: string
  calibrationDate: string
  dueDate: string
  results: string | null
  /** The certificate file (GET /api/uploads/[id]), when one was uploaded. */
  uploadId: number | null
  /** As found, before adjustment: `[temperatureK, correctionK]` (true − value used), or null when not recorded. */
  asFoundCorrections: [number, number][] | null
  /** Standard uncertainty of the as-found corrections, K. */
  asFoundUncertaintyK: number | null
  /** The tolerance the laboratory allows the item, K. */
  asFoundToleranceK: number | null
  /** Every |correction| within the tolerance; null without as-found data. */
  asFoundInTolerance: boolean | null
  /** In the answer to recording a calibration: the nonconformity an out-of-tolerance as-found raised. */
  nonconformityId?: number | null
  version: number
  createdAt: string
}

/**
 * What a supplier's digital calibration certificate (DCC) would record on a source or reference
 * instrument (POST …/calibrations/dcc without `commit=true`): the values are read from the file,
 * the results as text exactly as the file states them.
 */
export interface DccCalibrationPreview {
  fileName: string
  /** The DCC schema version the file declares (e.g. `3.1.2`). */
  schemaVersion: string | null
  /** The DCC's unique identifier (`coreData/uniqueIdentifier`). */
  certificateNumber: string
  /** YYYY-MM-DD (`coreData/endPerformanceDate`). */
  calibrationDate: string
  /** The calibration laboratory that issued the DCC. */
  provider: string
  /** The certificate this DCC replaces, when it names one. */
  previousReport: string | null
  /** The calibrated item(s) the DCC describes, to check it is this equipment's. */
  items: { name: string, manufacturer: string | null, model: string | null, serials: string[] }[]
  resultCount: number
  /** The results as the record will keep them (at most 8000 characters). */
  results: string
  /** A recalibration date the DCC gives, to prefill the due date; the user decides. */
  suggestedDueDate: string | null
  /** What to check before recording (another serial, already recorded, a date in the future). */
  warnings: string[]
}

/** Fields every piece of reference equipment carries. */
interface EquipmentCommon {
  id: number
  assetTag: string
  maker: string
  model: string
  serial: string
  status: EquipmentStatus
  /** Why it is out of service or quarantined (e.g. a failed check and its nonconformity); null in service. */
  statusReason: string | null
  notes: string | null
  archived: boolean
  /** Date of the latest external calibration, or null when none is recorded. */
  lastCalibrationDate: string | null
  /** Due date of the latest calibration (the current due date), or null. */
  dueDate: string | null
  /** True when `dueDate` is before today. */
  pastDue: boolean
  version: number
  createdAt: string
  updatedAt: string
}

export interface BlackbodySourceDTO extends EquipmentCommon {
  kind: SourceKind
  apertureMm: number
  minTemperatureK: number
  maxTemperatureK: number
  emissivity: number
  emissivityU: number
  emissivityBandLambda1Um: number | null
  emissivityBandLambda2Um: number | null
  /** Emissivity over wavelength: rows [λ µm, ε, u(ε) k = 1]; null when none is recorded. */
  emissivityTable: [number, number, number][] | null
  uniformityK: number
  stabilityK: number
  /** Certificate's set-point corrections `[setPointK, correctionK]`, set-points increasing. */
  corrections: [number, number][]
  /** What the corrected value is: a cavity, surface or radiance temperature. */
  certifiedBasis: CertifiedBasis
  /** A radiance temperature's band (µm) and medium of its wavelengths; null otherwise. */
  certifiedBandLambda1Um: number | null
  certifiedBandLambda2Um: number | null
  certifiedBandMedium: WavelengthMediumName | null
  /** Surroundings' temperature T_w0 when the radiance temperature was certified, K; null otherwise. */
  certifiedReflectedTemperatureK: number | null
  /** The certificate's expanded uncertainty U (K) and k; null when not recorded. */
  certifiedExpandedUncertaintyK: number | null
  certifiedCoverageFactor: number | null
}

export interface ReferenceInstrumentDTO extends EquipmentCommon {
  kind: ReferenceKind
  rangeMin: number
  rangeMax: number
  rangeUnit: RangeUnit
  standardUncertainty: number
  uncertaintyUnit: RangeUnit
}

/** Detail routes: the record, its calibration history (newest first) and its audit trail. */
export type EquipmentDetailDTO<T> = T & {
  calibrations: EquipmentCalibrationDTO[]
  audit: AuditEventDTO[]
}
export type BlackbodySourceDetailDTO = EquipmentDetailDTO<BlackbodySourceDTO>
export type ReferenceInstrumentDetailDTO = EquipmentDetailDTO<ReferenceInstrumentDTO>

export interface CorrectionDTO {
  setPointK: number
  correctionK: number
}

export interface CustomerDTO extends OrganizationDTO {
  addressLines: string | null
  city: string | null
  postcode: string | null
  country: string | null
  /** Active contacts. */
  contactCount: number
}

export interface ContactDTO {
  id: number
  organizationId: number
  name: string
  email: string
  phone: string | null
  receivesReminders: boolean
  active: boolean
  version: number
  createdAt: string
  updatedAt: string
}

export interface CustomerDetailDTO extends CustomerDTO {
  /** All contacts, inactive ones too. */
  contacts: ContactDTO[]
  audit: AuditEventDTO[]
}

export interface InstrumentDTO {
  id: number
  organizationId: number
  organizationName: string | null
  serial: string
  assetTag: string | null
  maker: string
  model: string
  kind: InstrumentKind
  bandLambda1Um: number | null
  bandLambda2Um: number | null
  spectralResponseId: number | null
  spectralResponseName: string | null
  /** A ratio pyrometer's second band (µm) or its responsivity table; null for every other kind. */
  band2Lambda1Um: number | null
  band2Lambda2Um: number | null
  band2SpectralResponseId: number | null
  band2SpectralResponseName: string | null
  /** A ratio pyrometer's emissivity-ratio ("slope") setting k; null for every other kind. */
  emissivityRatioSetting: number | null
  distanceToSpot: number | null
  rangeMinK: number
  rangeMaxK: number
  defaultEmissivity: number
  resolutionK: number
  accuracy: AccuracySpec
  calibrationIntervalMonths: number
  status: InstrumentStatus
  nextDueDate: string | null
  pastDue: boolean
  photoUploadId: number | null
  notes: string | null
  archived: boolean
  version: number
  createdAt: string
  updatedAt: string
}

/** GET /api/instruments/[id]. `audit` is present for laboratory roles only, never for customers. */
export interface InstrumentDetailDTO extends InstrumentDTO {
  spectralResponse: SpectralResponseDTO | null
  /** A ratio pyrometer's band-2 responsivity table, when its second band is one. */
  band2SpectralResponse?: SpectralResponseDTO | null
  audit?: AuditEventDTO[]
}

export interface SpectralResponseDTO {
  id: number
  name: string
  /** SHA-256 (hex) of the canonical table text. */
  sha256: string
  /** Normalized points `[wavelengthUm, relativeResponse]`, peak 1. */
  points: [number, number][]
  pointCount: number
  lambdaMinUm: number
  lambdaMaxUm: number
  createdAt: string
}

export interface UploadDTO {
  id: number
  sha256: string
  size: number
  /** Detected from the content, not from the name or the client. */
  mimeType: string
  originalName: string
  purpose: UploadPurpose
  organizationId: number | null
  uploadedBy: number | null
  createdAt: string
}

/** One CSV row in an import preview: `line` is its line in the file, `errors` maps field → message. */
export interface ImportPreviewRow {
  line: number
  data: Record<string, unknown>
  errors: Record<string, string>
}

export interface ImportPreview {
  rows: ImportPreviewRow[]
  valid: number
  invalid: number
}

export interface ImportResult {
  created: number
}
