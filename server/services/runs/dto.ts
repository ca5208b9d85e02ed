/** Plain JSON for runs, their points and revisions (the DTOs in shared/types/runs.ts). */
import type { BandInput, RunDTO, RunInstrumentSummary, RunPointDTO, RunRevisionDTO } from '#shared/types'
import type { CalibrationRun } from '#server/models/CalibrationRun'
import type { Instrument } from '#server/models/Instrument'
import type { RunPoint } from '#server/models/RunPoint'
import type { RunRevision } from '#server/models/RunRevision'
import type { SpectralResponse } from '#server/models/SpectralResponse'

/** Names and labels a run row shows, looked up once per page. */
export interface RunNames {
  instrument?: Instrument | null
  organizationName?: string | null
  procedureId?: number | null
  procedureName?: string | null
  procedureVersionNumber?: number | null
  technicianName?: string | null
  reviewerName?: string | null
  pointCount?: number
}

const iso = (d: Date | null | undefined) => (d ? d.toISOString() : null)

export function runDTO(r: CalibrationRun, n: RunNames = {}): RunDTO {
  return {
    id: r.id,
    instrumentId: r.instrumentId,
    instrumentSerial: n.instrument?.serial ?? null,
    instrumentLabel: n.instrument ? `${n.instrument.maker} ${n.instrument.model}` : null,
    organizationId: n.instrument?.organizationId ?? null,
    organizationName: n.organizationName ?? null,
    procedureId: n.procedureId ?? null,
    procedureVersionId: r.procedureVersionId,
    procedureName: n.procedureName ?? null,
    procedureVersionNumber: n.procedureVersionNumber ?? null,
    technicianId: r.technicianId,
    technicianName: n.technicianName ?? null,
    receivedDate: r.receivedDate,
    calibrationDate: r.calibrationDate,
    ambientTemperatureK: r.ambientTemperatureK,
    relativeHumidityPct: r.relativeHumidityPct,
    distanceMm: r.distanceMm,
    spotDiameterMm: r.spotDiameterMm ?? null,
    emissivitySetting: r.emissivitySetting,
    reflectedTemperatureK: r.reflectedTemperatureK,
    instrumentTemperatureK: r.instrumentTemperatureK,
    emissivityRatioSetting: r.emissivityRatioSetting ?? null,
    imagerSettings: r.imagerSettings ?? null,
    calibrationEquation: r.calibrationEquation ?? null,
    ambientInstrumentId: r.ambientInstrumentId ?? null,
    adjusted: !!r.adjusted,
    asLeftEqualsAsFound: !r.adjusted,
    status: r.status,
    submittedAt: iso(r.submittedAt),
    reviewerId: r.reviewerId ?? null,
    reviewerName: n.reviewerName ?? null,
    reviewedAt: iso(r.reviewedAt),
    reviewComments: r.reviewComments ?? null,
    internalNotes: r.internalNotes ?? null,
    certificateRemarks: r.certificateRemarks ?? null,
    methodDeviations: r.methodDeviations ?? null,
    placeOfCalibration: r.placeOfCalibration,
    siteAddress: r.siteAddress ?? null,
    requestId: r.requestId ?? null,
    voidedAt: iso(r.voidedAt),
    voidReason: r.voidReason ?? null,
    revisionOf: r.revisionOf ?? null,
    revisionReason: r.revisionReason ?? null,
    contributorIds: [...(r.contributorIds ?? [])],
    lastReviewedVersion: r.lastReviewedVersion ?? null,
    pointCount: n.pointCount ?? 0,
    locked: r.status === 'approved',
    version: r.version,
    createdAt: r.createdAt.toISOString(),
    updatedAt: r.updatedAt.toISOString(),
  }
}

/** The band of an instrument: its rectangular λ1–λ2, or its stored responsivity table. */
export function instrumentBand(i: Instrument, table: SpectralResponse | null): BandInput | null {
  if (i.bandLambda1Um != null && i.bandLambda2Um != null) return { kind: 'rectangular', lambda1Um: i.bandLambda1Um, lambda2Um: i.bandLambda2Um }
  if (table) return { kind: 'tabulated', points: table.points }
  return null
}

/** A ratio pyrometer's band 2: its rectangular λ1–λ2, or its stored responsivity table; null when not recorded. */
export function instrumentBand2(i: Instrument, table: SpectralResponse | null): BandInput | null {
  if (i.band2Lambda1Um != null && i.band2Lambda2Um != null) return { kind: 'rectangular', lambda1Um: i.band2Lambda1Um, lambda2Um: i.band2Lambda2Um }
  if (table) return { kind: 'tabulated', points: table.points }
  return null
}

const labelOf = (band: BandInput, table: SpectralResponse | null) => (band.kind === 'rectangular' ? `${band.lambda1Um}–${band.lambda2Um} µm` : (table?.name ?? 'Tabulated responsivity'))

export function instrumentSummary(i: Instrument, band: BandInput, table: SpectralResponse | null, organizationName: string | null, band2: { band: BandInput | null, table: SpectralResponse | null } = { band: null, table: null }): RunInstrumentSummary {
  return {
    id: i.id,
    serial: i.serial,
    assetTag: i.assetTag ?? null,
    maker: i.maker,
    model: i.model,
    organizationId: i.organizationId,
    organizationName,
    band,
    bandLabel: labelOf(band, table),
    kind: i.kind,
    band2: band2.band,
    band2Label: band2.band ? labelOf(band2.band, band2.table) : null,
    emissivityRatioSetting: i.emissivityRatioSetting ?? null,
    accuracy: i.accuracy,
    resolutionK: i.resolutionK,
    rangeMinK: i.rangeMinK,
    rangeMaxK: i.rangeMaxK,
    defaultEmissivity: i.defaultEmissivity,
  }
}

export function runPointDTO(p: RunPoint, tags: { source?: string | null, reference?: string | null, voidedBy?: string | null } = {}): RunPointDTO {
  return {
    id: p.id,
    runId: p.runId,
    seq: p.seq,
    stage: p.stage,
    sourceId: p.sourceId,
    sourceAssetTag: tags.source ?? null,
    referenceInstrumentId: p.referenceInstrumentId ?? null,
    referenceAssetTag: tags.reference ?? null,
    setPointK: p.setPointK,
    sourceIndicatedK: p.sourceIndicatedK ?? null,
    referenceReadingK: p.referenceReadingK ?? null,
    readingsK: p.readingsK,
    rois: p.rois ?? null,
    netdFrames: p.netdFrames ?? null,
    result: p.result,
    monteCarlo: p.monteCarlo ?? null,
    voidedAt: iso(p.voidedAt),
    voidedByName: tags.voidedBy ?? null,
    voidReason: p.voidReason ?? null,
    version: p.version,
    createdAt: p.createdAt.toISOString(),
    updatedAt: p.updatedAt.toISOString(),
  }
}

/** A revision of a run's data; `pointNumber` is the point's number in the run (its `seq`), as people name it. */
export function runRevisionDTO(r: RunRevision, userName: string | null, pointNumber: number | null = null): RunRevisionDTO {
  return {
    id: r.id,
    runId: r.runId,
    pointId: r.pointId ?? null,
    pointNumber,
    userId: r.userId,
    userName,
    at: r.at.toISOString(),
    reason: r.reason,
    before: r.before,
    after: r.after,
  }
}
