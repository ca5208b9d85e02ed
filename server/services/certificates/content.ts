/**
 * What a certificate of a run states, gathered from the records and nothing else (ISO/IEC 17025
 * 7.8): the laboratory and customer, the item and its receipt record word for word, the place,
 * the method and its recorded deviations, the measured conditions, the results of the points that
 * are not voided with n per point, the equipment with its own certificates, the remarks written
 * for the customer (never the internal notes), and — only when an agreement with the customer is
 * on record — the agreed specification and decision rule. Refusals name what is missing.
 */
import type { Transaction } from 'sequelize'
import { COVERAGE_PROBABILITY, CONDITION_LABELS, conditionFieldsFor, DECISION_RULE_NAMES, RUN_CONDITION_LABELS, type ConditionField } from '#shared/calibration/constants'
import type { EquationTable } from '#shared/calibration/equation'
import { celsiusFixed, describeAccuracy, describeBand, formatFixed } from '#shared/format'
import { INSTRUMENT_KIND_LABELS, isImagerKind, isRatioKind, REFERENCE_KIND_LABELS, SOURCE_KIND_LABELS } from '#shared/registers/constants'
import { roundResult } from '#shared/uncertainty/budget'
import type { RunAgreementDTO } from '#shared/types'
import { BlackbodySource } from '#server/models/BlackbodySource'
import type { CalibrationRun } from '#server/models/CalibrationRun'
import { Instrument } from '#server/models/Instrument'
import { ItemReceipt } from '#server/models/ItemReceipt'
import type { LabSettings } from '#server/models/LabSettings'
import { Organization } from '#server/models/Organization'
import { ProcedureVersion } from '#server/models/ProcedureVersion'
import { ReferenceInstrument } from '#server/models/ReferenceInstrument'
import { RunPoint } from '#server/models/RunPoint'
import { SpectralResponse } from '#server/models/SpectralResponse'
import { conflict } from '#server/utils/errors'
import { calibrationsOf } from '#server/services/equipment/calibrations'
import { agreementOf } from '#server/services/requests/agreement'
import { loadRunContext, runEquation } from '#server/services/runs/context'
import { IMAGER_SETTINGS_LABEL } from '#server/services/runs/workflow'
import { basisStatement } from './basis'
import type { CertificateData, CertificateEquation, CertificateEquipment, CertificateImager, CertificateRatio } from './pdf'
import { readTogether } from '#server/utils/db'

const lines = (s: string | null | undefined) => (s ?? '').split(/\r?\n/).map(l => l.trim()).filter(Boolean)

/** The data of a certificate before it has a number, a signature and a verification code. */
export type CertificateBody = Omit<CertificateData, 'number' | 'revision' | 'amends' | 'signatory' | 'verification'>

export interface Gathered {
  run: CalibrationRun
  instrument: Instrument
  organization: Organization
  points: RunPoint[]
  data: CertificateBody
}

/** The agreed rule as the certificate states it; null when the agreed terms name no specification (no statement of conformity). */
function agreementText(a: RunAgreementDTO): CertificateData['agreement'] {
  if (!a.specification) return null
  return {
    agreedOn: a.agreedAt.slice(0, 10),
    how: a.method === 'portal' ? 'accepted by the customer in the portal' : `recorded by the laboratory: ${a.note ?? 'agreed with the customer'}`,
    ruleLabel: DECISION_RULE_NAMES[a.decisionRule],
    guardBandText: a.decisionRule === 'simple-acceptance' ? 'w = 0' : `w = r·U with r = ${a.guardBandFactor ?? 1}`,
    ruleReference: 'ILAC-G8:09/2019',
    specificationText: `the specification agreed, ${describeAccuracy(a.specification)}`,
  }
}

/**
 * Everything a certificate of this run states, from the records (in the transaction); 409 naming
 * what is missing when the record cannot support a certificate (no receipt, conditions not
 * entered, terms changed since they were agreed).
 */
export async function gather(t: Transaction | undefined, settings: LabSettings, run: CalibrationRun, issueDate: string): Promise<Gathered> {
  const instrument = await Instrument.findByPk(run.instrumentId, { transaction: t })
  if (!instrument) conflict('The run’s instrument no longer exists', 'runId')
  const organization = await Organization.findByPk(instrument.organizationId, { transaction: t })
  if (!organization) conflict('The instrument’s customer no longer exists', 'runId')
  const pv = await ProcedureVersion.findByPk(run.procedureVersionId, { transaction: t })
  if (!pv) conflict('The run’s procedure version no longer exists', 'runId')
  const receipt = await ItemReceipt.findOne({ where: { runId: run.id }, transaction: t })
  if (!receipt) conflict('No receipt of the item is recorded for this run: record it (date, packaging, condition) before a certificate can state it', 'receipt')
  const ratio = isRatioKind(instrument.kind)
  const imagerKind = isImagerKind(instrument.kind)
  const missing = conditionFieldsFor(ratio).filter(f => run.get(f) == null)
  if (missing.length) conflict(`These conditions were not recorded: ${missing.map(f => RUN_CONDITION_LABELS[f]).join(', ')}`, missing[0]!)
  if (imagerKind && !run.imagerSettings) conflict(`${IMAGER_SETTINGS_LABEL} not recorded`, 'imagerSettings')
  const agreement = await agreementOf(run.requestId, t)
  if (agreement && !agreement.current) conflict('The terms of the calibration request changed after the customer agreed to them: the customer must agree to the current terms first', 'agreement')
  const table = instrument.spectralResponseId ? await SpectralResponse.findByPk(instrument.spectralResponseId, { transaction: t }) : null
  const points = await RunPoint.findAll({ where: { runId: run.id, voidedAt: null }, order: [['seq', 'ASC']], transaction: t })
  if (!points.length) conflict('The run has no points', 'points')
  const ctx = await loadRunContext(t, run.instrumentId, run.procedureVersionId, run.requestId)
  const equation = runEquation(run, ctx, points)
  if (equation?.problem) conflict(`The calibration equation the run asks for cannot be stated: ${equation.problem.message}`, equation.problem.field)

  const sourceIds = [...new Set(points.map(p => p.sourceId))]
  const refIds = [...new Set([...points.map(p => p.referenceInstrumentId), run.ambientInstrumentId].filter((v): v is number => !!v))]
  const [sources, refs, sourceCals, refCals] = await readTogether(t, [
    () => BlackbodySource.findAll({ where: { id: sourceIds }, transaction: t }),
    () => refIds.length ? ReferenceInstrument.findAll({ where: { id: refIds }, transaction: t }) : [],
    () => calibrationsOf('source', sourceIds, t),
    () => calibrationsOf('reference', refIds, t),
  ])
  // The external calibration in force on the calibration date (the latest one before it).
  const inForce = (list: { calibrationDate: string, certificateNumber: string, provider: string }[] | undefined) =>
    (list ?? []).find(c => c.calibrationDate <= run.calibrationDate) ?? null
  const equipment: CertificateEquipment[] = [
    ...sources.map((s) => {
      const c = inForce(sourceCals.get(s.id))
      return { role: `Blackbody source (${SOURCE_KIND_LABELS[s.kind].toLowerCase()})`, assetTag: s.assetTag, description: `${s.maker} ${s.model}, serial ${s.serial}`, certificateNumber: c?.certificateNumber ?? null, provider: c?.provider ?? null, calibrationDate: c?.calibrationDate ?? null }
    }),
    ...refs.map((r) => {
      const c = inForce(refCals.get(r.id))
      return { role: REFERENCE_KIND_LABELS[r.kind] ?? 'Reference instrument', assetTag: r.assetTag, description: `${r.maker} ${r.model}, serial ${r.serial}`, certificateNumber: c?.certificateNumber ?? null, provider: c?.provider ?? null, calibrationDate: c?.calibrationDate ?? null }
    }),
  ]
  const ambient = run.ambientInstrumentId ? refs.find(r => r.id === run.ambientInstrumentId) : undefined

  const first = points[0]!.result
  const accuracyText = describeAccuracy(instrument.accuracy)
  const customerAddress = [...lines(organization.addressLines), [organization.postcode, organization.city].filter(Boolean).join(' '), organization.country ?? ''].filter(Boolean)
  const labAddress = [...lines(settings.addressLines), [settings.postcode, settings.city].filter(Boolean).join(' '), settings.country].filter(Boolean)
  const referenceBasis = sources.map((s) => {
    const own = points.filter(p => p.sourceId === s.id)
    const tags = [...new Set(own.map(p => p.referenceInstrumentId).filter((v): v is number => v !== null))].map(id => refs.find(r => r.id === id)?.assetTag ?? `#${id}`)
    return basisStatement(s, own.map(p => p.result), tags)
  }).join(' ')
  return {
    run,
    instrument,
    organization,
    points,
    data: {
      lab: { name: settings.name, addressLines: labAddress, email: settings.email ?? null, phone: settings.phone ?? null, accreditationBody: settings.accreditationBody, accreditationNumber: settings.accreditationNumber },
      customer: { name: organization.name, addressLines: customerAddress },
      instrument: {
        maker: instrument.maker,
        model: instrument.model,
        serial: instrument.serial,
        assetTag: instrument.assetTag ?? null,
        kind: INSTRUMENT_KIND_LABELS[instrument.kind] ?? instrument.kind,
        band: ratio && ctx.band2
          ? `band 1: ${describeBand({ bandLambda1Um: instrument.bandLambda1Um, bandLambda2Um: instrument.bandLambda2Um, spectralResponseName: table?.name ?? null })}; band 2: ${describeBand({ bandLambda1Um: instrument.band2Lambda1Um ?? null, bandLambda2Um: instrument.band2Lambda2Um ?? null, spectralResponseName: ctx.table2?.name ?? null })}`
          : describeBand({ bandLambda1Um: instrument.bandLambda1Um, bandLambda2Um: instrument.bandLambda2Um, spectralResponseName: table?.name ?? null }),
        rangeText: `${celsiusFixed(instrument.rangeMinK, 1)} °C to ${celsiusFixed(instrument.rangeMaxK, 1)} °C`,
        resolutionText: `${formatFixed(instrument.resolutionK, 2).replace(/0$/, '')} °C`,
        accuracyText,
      },
      receipt: {
        receivedOn: receipt.receivedOn,
        packaging: receipt.packaging,
        condition: receipt.condition,
        accessories: receipt.accessories ?? null,
        deviations: receipt.deviations ?? null,
        customerConsulted: !!receipt.customerConsulted,
        customerDecision: receipt.customerDecision ?? null,
      },
      place: run.placeOfCalibration === 'on-site'
        ? { kind: 'on-site', addressLines: lines(run.siteAddress) }
        : { kind: 'laboratory', addressLines: labAddress },
      methodDeviations: run.methodDeviations ?? null,
      referenceBasis,
      method: { procedureName: pv.name, documentReference: pv.documentReference, versionNumber: pv.versionNumber },
      dates: { received: receipt.receivedOn, calibrated: run.calibrationDate, issued: issueDate },
      environment: {
        ambientK: run.ambientTemperatureK!,
        relativeHumidityPct: run.relativeHumidityPct!,
        distanceMm: run.distanceMm!,
        // a ratio pyrometer's model has no emissivity setting (its ratio setting is stated instead)
        emissivitySetting: ratio ? null : run.emissivitySetting!,
        reflectedK: run.reflectedTemperatureK!,
        instrumentK: run.instrumentTemperatureK ?? null,
        measuredWith: ambient ? `measured with ${ambient.assetTag}` : null,
      },
      adjusted: !!run.adjusted,
      points: points.map(p => ({
        stage: p.stage,
        referenceK: p.result.referenceTemperatureK,
        expectedK: p.result.expectedReadingK,
        meanK: p.result.meanReadingK,
        errorK: p.result.errorK,
        uncertaintyK: p.result.budget.statedUncertaintyK,
        coverageFactor: p.result.budget.coverageFactor,
        errorText: p.result.rounded.errorText,
        uncertaintyText: p.result.rounded.uncertaintyText,
        n: p.result.n,
        toleranceK: p.result.conformity.tolerance,
        acceptanceLimitK: p.result.conformity.acceptanceLimit,
        verdict: p.result.conformity.verdict,
        probabilityOfConformity: p.result.conformity.probabilityOfConformity ?? null,
        ...(p.result.imager ? { imager: imagerPointText(p.result.imager.rois.length, p.result.imager.uniformity, p.result.rounded.uncertaintyText) } : {}),
      })),
      coverageProbability: first.budget.coverageProbability ?? COVERAGE_PROBABILITY,
      equipment,
      statements: {
        traceability: settings.traceabilityStatement,
        decisionRule: settings.decisionRuleStatement,
        items: settings.itemsStatement,
        reproduction: settings.reproductionStatement ?? null,
      },
      agreement: agreement ? agreementText(agreement) : null,
      remarks: run.certificateRemarks ?? null,
      ratio: ratio ? ratioText(run, points, sources, describeBandOf(ctx.band, table?.name ?? null), ctx.band2 ? describeBandOf(ctx.band2, ctx.table2?.name ?? null) : '—') : null,
      imager: imagerKind ? imagerText(run, points) : null,
      equation: equation?.fit ? equationText(equation.fit) : null,
    },
  }
}

const describeBandOf = (b: { kind: string, lambda1Um?: number, lambda2Um?: number }, tableName: string | null) =>
  (b.kind === 'rectangular' ? `${b.lambda1Um}–${b.lambda2Um} µm` : `table: ${tableName ?? 'tabulated responsivity'}`)
const emissivityText = (e: number) => formatFixed(e, 4).replace(/0+$/, '').replace(/\.$/, '')

/** A ratio pyrometer's bands, ratio setting and the source emissivity in each band, from the points as computed. */
function ratioText(run: CalibrationRun, points: RunPoint[], sources: BlackbodySource[], band1: string, band2: string): CertificateRatio {
  return {
    band1,
    band2,
    emissivityRatioSetting: run.emissivityRatioSetting!,
    sources: sources.map((s) => {
      const own = points.filter(p => p.sourceId === s.id)
      const e1 = [...new Set(own.map(p => p.result.inputs.sourceEmissivity))].map(emissivityText).join(', ')
      const e2 = [...new Set(own.map(p => p.result.inputs.ratio?.sourceEmissivity2).filter((e): e is number => e !== undefined))].map(emissivityText).join(', ')
      return { assetTag: s.assetTag, emissivity1: e1, emissivity2: e2 || '—' }
    }),
  }
}

/** The uniformity of an imager's point as printed: to the decimal place of the point's U (at least two decimals). */
function imagerPointText(roiCount: number, u: { rangeK: number, standardDeviationK: number } | null, uncertaintyText: string): { roiCount: number, rangeText: string | null, sdText: string | null } {
  const dec = Math.max(2, uncertaintyText.includes('.') ? uncertaintyText.split('.')[1]!.length : 0)
  return { roiCount, rangeText: u ? formatFixed(u.rangeK, dec) : null, sdText: u ? formatFixed(u.standardDeviationK, dec) : null }
}

/** A thermal imager's settings, its regions of interest (as first recorded, by name) and the NETD where frames were recorded. */
function imagerText(run: CalibrationRun, points: RunPoint[]): CertificateImager {
  const s = run.imagerSettings!
  const rois = new Map<string, { name: string, xPx: number, yPx: number, widthPx: number, heightPx: number }>()
  let centre = 'centre'
  for (const p of points) {
    const im = p.result.imager
    if (!im) continue
    centre = im.centreRoi
    for (const r of im.rois) if (!rois.has(r.name)) rois.set(r.name, { name: r.name, xPx: r.xPx, yPx: r.yPx, widthPx: r.widthPx, heightPx: r.heightPx })
  }
  const netd = points.filter(p => p.result.imager?.netd).map((p) => {
    const n = p.result.imager!.netd!
    return { referenceK: p.result.referenceTemperatureK, netdText: formatFixed(n.netdK, n.netdK < 0.1 ? 3 : 2), roiCount: n.rois.length, frameCount: Math.max(...n.rois.map(r => r.n)) }
  })
  return { lens: s.lens, fieldOfView: s.fieldOfView, rangeSetting: s.rangeSetting, nonUniformityCorrection: s.nonUniformityCorrection, rois: [...rois.values()], centreRoi: centre, netd }
}

/** The calibration equation as the certificate prints it: parameters with u, and each row rounded to its U (GUM 7.2.6). */
function equationText(e: EquationTable): CertificateEquation {
  const sig = (v: number, d = 6) => Number(v.toPrecision(d)).toString()
  return {
    points: e.points,
    pointCount: e.pointCount,
    pointCorrelation: e.pointCorrelation,
    parameters: e.parameters.map(p => ({ name: p.name, valueText: sig(p.value, 7), uText: sig(p.standardUncertainty, 2), unit: p.unit })),
    nominalText: `A₀ = ${sig(e.nominal.A)} µm, B₀ = ${sig(e.nominal.B)} µm·K, c₂ = ${sig(e.c2UmK, 10)} µm·K`,
    chiSquaredText: sig(e.chiSquared, 3),
    degreesOfFreedom: e.degreesOfFreedom,
    rangeK: e.rangeK,
    coverageFactor: e.coverageFactor,
    rows: e.rows.map((r) => {
      const reading = roundResult(r.readingK - 273.15, r.expandedUncertaintyK)
      const correction = roundResult(r.correctionK, r.expandedUncertaintyK)
      return { temperatureK: r.temperatureK, readingText: reading.valueText.replace(/^-/, '−'), correctionText: correction.valueText, uncertaintyText: correction.uncertaintyText }
    }),
  }
}

/**
 * What an amended certificate states changed: per point (by its number in the run) the readings,
 * set-point, error and uncertainty that differ between the run certified before and the corrected
 * run, and points added or voided; the header conditions that differ.
 */
export function describeChanges(before: { run: CalibrationRun, points: RunPoint[] }, after: { run: CalibrationRun, points: RunPoint[] }): string[] {
  const out: string[] = []
  const c = (k: number) => `${celsiusFixed(k, 2)} °C`
  const bySeq = new Map(before.points.map(p => [p.seq, p]))
  for (const p of after.points) {
    const o = bySeq.get(p.seq)
    bySeq.delete(p.seq)
    if (!o) {
      out.push(`point ${p.seq} added (${c(p.setPointK)})`)
      continue
    }
    const diffs: string[] = []
    if (o.setPointK !== p.setPointK) diffs.push(`set-point ${c(o.setPointK)} → ${c(p.setPointK)}`)
    const n = Math.max(o.readingsK.length, p.readingsK.length)
    for (let i = 0; i < n; i++) {
      const a = o.readingsK[i]
      const b = p.readingsK[i]
      if (a !== b) diffs.push(`reading ${i + 1} ${a === undefined ? '—' : c(a)} → ${b === undefined ? '—' : c(b)}`)
    }
    if (o.sourceIndicatedK !== p.sourceIndicatedK && p.sourceIndicatedK !== null) diffs.push(`source indication ${o.sourceIndicatedK === null ? '—' : c(o.sourceIndicatedK)} → ${c(p.sourceIndicatedK)}`)
    if (o.referenceReadingK !== p.referenceReadingK && p.referenceReadingK !== null) diffs.push(`reference reading ${o.referenceReadingK === null ? '—' : c(o.referenceReadingK)} → ${c(p.referenceReadingK)}`)
    if (JSON.stringify(o.rois ?? null) !== JSON.stringify(p.rois ?? null)) diffs.push('regions of interest or their readings')
    if (JSON.stringify(o.netdFrames ?? null) !== JSON.stringify(p.netdFrames ?? null)) diffs.push('frame series for the NETD')
    if (o.result.rounded.errorText !== p.result.rounded.errorText) diffs.push(`error ${o.result.rounded.errorText} °C → ${p.result.rounded.errorText} °C`)
    if (o.result.rounded.uncertaintyText !== p.result.rounded.uncertaintyText) diffs.push(`U ${o.result.rounded.uncertaintyText} °C → ${p.result.rounded.uncertaintyText} °C`)
    if (diffs.length) out.push(`point ${p.seq}: ${diffs.join(', ')}`)
  }
  for (const p of bySeq.values()) out.push(`point ${p.seq} (${c(p.setPointK)}) removed`)
  const condition = (f: ConditionField, v: unknown) => {
    if (typeof v !== 'number') return '—'
    if (f.endsWith('K')) return c(v)
    if (f === 'relativeHumidityPct') return `${v} %RH`
    if (f === 'distanceMm') return `${v} mm`
    return String(v)
  }
  for (const f of ['ambientTemperatureK', 'relativeHumidityPct', 'distanceMm', 'emissivitySetting', 'reflectedTemperatureK', 'instrumentTemperatureK'] as ConditionField[]) {
    if (before.run.get(f) !== after.run.get(f)) out.push(`${CONDITION_LABELS[f].toLowerCase()} ${condition(f, before.run.get(f))} → ${condition(f, after.run.get(f))}`)
  }
  if ((before.run.emissivityRatioSetting ?? null) !== (after.run.emissivityRatioSetting ?? null)) out.push(`emissivity-ratio setting ${before.run.emissivityRatioSetting ?? '—'} → ${after.run.emissivityRatioSetting ?? '—'}`)
  if (JSON.stringify(before.run.imagerSettings ?? null) !== JSON.stringify(after.run.imagerSettings ?? null)) out.push('imager settings (lens, field of view, range, non-uniformity correction)')
  if (JSON.stringify(before.run.calibrationEquation ?? null) !== JSON.stringify(after.run.calibrationEquation ?? null)) out.push('calibration equation table')
  if ((before.run.certificateRemarks ?? '') !== (after.run.certificateRemarks ?? '')) out.push('remarks')
  if ((before.run.methodDeviations ?? '') !== (after.run.methodDeviations ?? '')) out.push('deviations from the method')
  return out
}
