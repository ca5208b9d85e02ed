/** Plain JSON for customers' instruments (shared/types/registers.ts). */
import { isPastDue } from '#shared/registers/dates'
import type { InstrumentDTO } from '#shared/types'
import type { Instrument } from '#server/models/Instrument'
import type { InstrumentListRow } from './query'

export function instrumentDTO(i: Instrument, names: { organization?: string | null, spectralResponse?: string | null, band2SpectralResponse?: string | null } = {}, today: string): InstrumentDTO {
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
    band2Lambda1Um: i.band2Lambda1Um ?? null,
    band2Lambda2Um: i.band2Lambda2Um ?? null,
    band2SpectralResponseId: i.band2SpectralResponseId ?? null,
    band2SpectralResponseName: names.band2SpectralResponse ?? null,
    emissivityRatioSetting: i.emissivityRatioSetting ?? null,
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

/** The list's plain row (./query.ts) as JSON: the row plus its past-due flag. */
export function instrumentListDTO(r: InstrumentListRow, today: string): InstrumentDTO {
  return {
    id: r.id,
    organizationId: r.organizationId,
    organizationName: r.organizationName ?? null,
    serial: r.serial,
    assetTag: r.assetTag ?? null,
    maker: r.maker,
    model: r.model,
    kind: r.kind,
    bandLambda1Um: r.bandLambda1Um ?? null,
    bandLambda2Um: r.bandLambda2Um ?? null,
    spectralResponseId: r.spectralResponseId ?? null,
    spectralResponseName: r.spectralResponseName ?? null,
    band2Lambda1Um: r.band2Lambda1Um ?? null,
    band2Lambda2Um: r.band2Lambda2Um ?? null,
    band2SpectralResponseId: r.band2SpectralResponseId ?? null,
    band2SpectralResponseName: r.band2SpectralResponseName ?? null,
    emissivityRatioSetting: r.emissivityRatioSetting ?? null,
    distanceToSpot: r.distanceToSpot ?? null,
    rangeMinK: r.rangeMinK,
    rangeMaxK: r.rangeMaxK,
    defaultEmissivity: r.defaultEmissivity,
    resolutionK: r.resolutionK,
    accuracy: r.accuracy,
    calibrationIntervalMonths: r.calibrationIntervalMonths,
    status: r.status,
    nextDueDate: r.nextDueDate ?? null,
    pastDue: isPastDue(r.nextDueDate, today),
    photoUploadId: r.photoUploadId ?? null,
    notes: r.notes ?? null,
    archived: r.archived,
    version: r.version,
    createdAt: r.createdAt,
    updatedAt: r.updatedAt,
  }
}
