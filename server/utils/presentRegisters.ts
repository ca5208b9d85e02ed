/** Plain JSON for the register records (the DTOs in shared/types/registers.ts). */
import { isPastDue, todayISO } from '../../shared/registers/dates'
import type {
  BlackbodySourceDTO,
  ContactDTO,
  CustomerDTO,
  EquipmentCalibrationDTO,
  InstrumentDTO,
  ReferenceInstrumentDTO,
  SpectralResponseDTO,
  UploadDTO,
} from '../../shared/types'
import type { BlackbodySource } from '../models/BlackbodySource'
import type { Contact } from '../models/Contact'
import type { EquipmentCalibration } from '../models/EquipmentCalibration'
import type { Instrument } from '../models/Instrument'
import type { Organization } from '../models/Organization'
import type { ReferenceInstrument } from '../models/ReferenceInstrument'
import type { SpectralResponse } from '../models/SpectralResponse'
import type { Upload } from '../models/Upload'
import { organizationDTO } from './present'

export function calibrationDTO(c: EquipmentCalibration): EquipmentCalibrationDTO {
  return {
    id: c.id,
    equipmentType: c.equipmentType,
    equipmentId: c.equipmentId,
    provider: c.provider,
    certificateNumber: c.certificateNumber,
    calibrationDate: c.calibrationDate,
    dueDate: c.dueDate,
    results: c.results ?? null,
    uploadId: c.uploadId ?? null,
    version: c.version,
    createdAt: c.createdAt.toISOString(),
  }
}

function equipmentCommon(e: BlackbodySource | ReferenceInstrument, latest: EquipmentCalibration | undefined, today: string) {
  const dueDate = latest?.dueDate ?? null
  return {
    id: e.id,
    assetTag: e.assetTag,
    maker: e.maker,
    model: e.model,
    serial: e.serial,
    status: e.status,
    notes: e.notes ?? null,
    archived: !!e.archived,
    lastCalibrationDate: latest?.calibrationDate ?? null,
    dueDate,
    pastDue: isPastDue(dueDate, today),
    version: e.version,
    createdAt: e.createdAt.toISOString(),
    updatedAt: e.updatedAt.toISOString(),
  }
}

/** A source with its current due date, from its latest calibration (`latest`, if any). */
export function sourceDTO(s: BlackbodySource, latest?: EquipmentCalibration, today = todayISO()): BlackbodySourceDTO {
  return {
    ...equipmentCommon(s, latest, today),
    kind: s.kind,
    apertureMm: s.apertureMm,
    minTemperatureK: s.minTemperatureK,
    maxTemperatureK: s.maxTemperatureK,
    emissivity: s.emissivity,
    emissivityU: s.emissivityU,
    emissivityBandLambda1Um: s.emissivityBandLambda1Um ?? null,
    emissivityBandLambda2Um: s.emissivityBandLambda2Um ?? null,
    uniformityK: s.uniformityK,
    stabilityK: s.stabilityK,
    corrections: s.corrections ?? [],
  }
}

export function referenceInstrumentDTO(r: ReferenceInstrument, latest?: EquipmentCalibration, today = todayISO()): ReferenceInstrumentDTO {
  return {
    ...equipmentCommon(r, latest, today),
    kind: r.kind,
    rangeMin: r.rangeMin,
    rangeMax: r.rangeMax,
    rangeUnit: r.rangeUnit,
    standardUncertainty: r.standardUncertainty,
    uncertaintyUnit: r.uncertaintyUnit,
  }
}

export function customerDTO(o: Organization, contactCount: number): CustomerDTO {
  return {
    ...organizationDTO(o),
    addressLines: o.addressLines ?? null,
    city: o.city ?? null,
    postcode: o.postcode ?? null,
    country: o.country ?? null,
    contactCount,
  }
}

export function contactDTO(c: Contact): ContactDTO {
  return {
    id: c.id,
    organizationId: c.organizationId,
    name: c.name,
    email: c.email,
    phone: c.phone ?? null,
    receivesReminders: !!c.receivesReminders,
    active: !!c.active,
    version: c.version,
    createdAt: c.createdAt.toISOString(),
    updatedAt: c.updatedAt.toISOString(),
  }
}

export function instrumentDTO(i: Instrument, names: { organization?: string | null, spectralResponse?: string | null } = {}, today = todayISO()): InstrumentDTO {
  return {
    id: i.id,
    organizationId: i.organizationId,
    organizationName: names.organization ?? i.organization?.name ?? null,
    serial: i.serial,
    assetTag: i.assetTag ?? null,
    maker: i.maker,
    model: i.model,
    kind: i.kind,
    bandLambda1Um: i.bandLambda1Um ?? null,
    bandLambda2Um: i.bandLambda2Um ?? null,
    spectralResponseId: i.spectralResponseId ?? null,
    spectralResponseName: names.spectralResponse ?? i.spectralResponse?.name ?? null,
    distanceToSpot: i.distanceToSpot ?? null,
    rangeMinK: i.rangeMinK,
    rangeMaxK: i.rangeMaxK,
    defaultEmissivity: i.defaultEmissivity,
    resolutionK: i.resolutionK,
    accuracy: i.accuracy,
    calibrationIntervalMonths: i.calibrationIntervalMonths,
    status: i.status,
    nextDueDate: i.nextDueDate ?? null,
    pastDue: isPastDue(i.nextDueDate, today),
    photoUploadId: i.photoUploadId ?? null,
    notes: i.notes ?? null,
    archived: !!i.archived,
    version: i.version,
    createdAt: i.createdAt.toISOString(),
    updatedAt: i.updatedAt.toISOString(),
  }
}

export function spectralResponseDTO(s: SpectralResponse): SpectralResponseDTO {
  const points = s.points ?? []
  return {
    id: s.id,
    name: s.name,
    sha256: s.sha256,
    points,
    pointCount: points.length,
    lambdaMinUm: points[0]?.[0] ?? 0,
    lambdaMaxUm: points[points.length - 1]?.[0] ?? 0,
    createdAt: s.createdAt.toISOString(),
  }
}

export function uploadDTO(u: Upload): UploadDTO {
  return {
    id: u.id,
    sha256: u.sha256,
    size: u.size,
    mimeType: u.mimeType,
    originalName: u.originalName,
    purpose: u.purpose,
    organizationId: u.organizationId ?? null,
    uploadedBy: u.uploadedBy ?? null,
    createdAt: u.createdAt.toISOString(),
  }
}
