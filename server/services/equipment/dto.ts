/** Plain JSON for blackbody sources, reference instruments and their calibrations (shared/types/registers.ts). */
import { isPastDue } from '#shared/registers/dates'
import type { BlackbodySourceDTO, EquipmentCalibrationDTO, ReferenceInstrumentDTO } from '#shared/types'
import type { BlackbodySource } from '#server/models/BlackbodySource'
import type { EquipmentCalibration } from '#server/models/EquipmentCalibration'
import type { ReferenceInstrument } from '#server/models/ReferenceInstrument'

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
    asFoundCorrections: c.asFoundCorrections ?? null,
    asFoundUncertaintyK: c.asFoundUncertaintyK ?? null,
    asFoundToleranceK: c.asFoundToleranceK ?? null,
    asFoundInTolerance: c.asFoundInTolerance ?? null,
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
    statusReason: e.statusReason ?? null,
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
export function sourceDTO(s: BlackbodySource, latest: EquipmentCalibration | undefined, today: string): BlackbodySourceDTO {
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
    emissivityTable: s.emissivityTable ?? null,
    uniformityK: s.uniformityK,
    stabilityK: s.stabilityK,
    corrections: s.corrections ?? [],
    certifiedBasis: s.certifiedBasis,
    certifiedBandLambda1Um: s.certifiedBandLambda1Um ?? null,
    certifiedBandLambda2Um: s.certifiedBandLambda2Um ?? null,
    certifiedBandMedium: s.certifiedBandMedium ?? null,
    certifiedReflectedTemperatureK: s.certifiedReflectedTemperatureK ?? null,
    certifiedExpandedUncertaintyK: s.certifiedExpandedUncertaintyK ?? null,
    certifiedCoverageFactor: s.certifiedCoverageFactor ?? null,
  }
}

export function referenceInstrumentDTO(r: ReferenceInstrument, latest: EquipmentCalibration | undefined, today: string): ReferenceInstrumentDTO {
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
