/**
 * "Which runs and certificates used this source (or reference instrument) since date D?" — the
 * first question after a reference is found out of tolerance or fails a check (ISO/IEC 17025:2017
 * 6.4.9, 7.10.1 c).
 *
 * A run used the item when one of its points that is not voided names it (`sourceId`, or
 * `referenceInstrumentId` for a reference instrument); a point is calibrated on its run's
 * calibration date. Within a period (both dates included):
 * - `runs`: every run that is not void and used the item;
 * - `certificates`: every **valid** certificate whose run used the item. An amended certificate is
 *   so listed by its latest valid revision (the revision run copies the points, so it used the item
 *   too); the superseded revisions are not valid and are left out, and so are withdrawn ones. An
 *   amendment whose corrected run no longer uses the item is no longer affected.
 * With the corrections found for the reference (true − value used, K) each affected point is
 * re-evaluated (shared/quality/impact.ts): the expected reading moves by c·δ, and the corrected
 * error is compared with the stated U and the tolerance under the point's own decision rule.
 */
import type { Transaction } from 'sequelize'
import { Op } from 'sequelize'
import { EngineInputError } from '#shared/radiometry/errors'
import type { EquipmentType } from '#shared/registers/constants'
import { reevaluatePoint, referenceCorrectionAt } from '#shared/quality'
import type { AffectedWorkDTO, ImpactDTO, PointEffectDTO } from '#shared/types'
import { CalibrationRun } from '#server/models/CalibrationRun'
import { Certificate } from '#server/models/Certificate'
import { CheckResult } from '#server/models/CheckResult'
import { EquipmentCalibration } from '#server/models/EquipmentCalibration'
import { Instrument } from '#server/models/Instrument'
import { RunPoint } from '#server/models/RunPoint'
import { notFound } from '#server/utils/errors'
import { equipmentLabel, findEquipment } from '#server/services/quality/records'
import { readTogether } from '#server/utils/db'

const CHUNK = 500

/** The point column that names the item. */
function itemColumn(type: EquipmentType): 'sourceId' | 'referenceInstrumentId' {
  return type === 'source' ? 'sourceId' : 'referenceInstrumentId'
}

export interface UsedWork {
  /** Runs (not void) that used the item in the period, by calibration date. */
  runs: CalibrationRun[]
  /** The points (not voided) that used it, by run. */
  points: Map<number, RunPoint[]>
  /** Valid certificates of those runs, by issue date. */
  certificates: Certificate[]
}

/**
 * The runs, points and valid certificates that used an item between two dates (inclusive).
 * @param withResults - load each point's stored result too (for re-evaluating it)
 */
export async function usedWork(type: EquipmentType, id: number, from: string, to: string, t?: Transaction, withResults = false): Promise<UsedWork> {
  const points = await RunPoint.findAll({
    where: { [itemColumn(type)]: id, voidedAt: null },
    attributes: withResults ? undefined : ['id', 'runId', 'seq'],
    order: [['runId', 'ASC'], ['seq', 'ASC']],
    transaction: t,
  })
  const runIds = [...new Set(points.map(p => p.runId))]
  const runs: CalibrationRun[] = []
  for (let i = 0; i < runIds.length; i += CHUNK) {
    runs.push(...await CalibrationRun.findAll({
      where: { id: runIds.slice(i, i + CHUNK), calibrationDate: { [Op.between]: [from, to] }, status: { [Op.ne]: 'void' } },
      transaction: t,
    }))
  }
  runs.sort((a, b) => (a.calibrationDate < b.calibrationDate ? -1 : a.calibrationDate > b.calibrationDate ? 1 : a.id - b.id))
  const used = new Set(runs.map(r => r.id))
  const byRun = new Map<number, RunPoint[]>()
  for (const p of points) if (used.has(p.runId)) byRun.set(p.runId, [...(byRun.get(p.runId) ?? []), p])
  const certificates: Certificate[] = []
  const ids = [...used]
  for (let i = 0; i < ids.length; i += CHUNK) {
    certificates.push(...await Certificate.findAll({ where: { runId: ids.slice(i, i + CHUNK), status: 'valid' }, transaction: t }))
  }
  certificates.sort((a, b) => (a.issueDate < b.issueDate ? -1 : a.issueDate > b.issueDate ? 1 : a.id - b.id))
  return { runs, points: byRun, certificates }
}

/** GET /api/sources/[id]/impact (and reference instruments): the contract's answer; 404 for no such item. */
export async function impactOf(type: EquipmentType, id: number, from: string, to: string): Promise<ImpactDTO> {
  if (!(await findEquipment(type, id))) notFound(equipmentLabel(type))
  const w = await usedWork(type, id, from, to)
  return {
    certificates: w.certificates.map(c => ({
      id: c.id,
      number: c.number,
      issuedOn: c.issueDate,
      organizationId: c.organizationId,
      runId: c.runId,
      points: (w.points.get(c.runId) ?? []).map(p => p.id),
    })),
    runs: w.runs.map(r => ({ id: r.id, status: r.status })),
  }
}

/**
 * The effect of the reference's corrections on one point (see the module notes). A source's
 * correction moves a point's reference temperature only when that temperature came from the
 * source's setting and certificate correction; a point whose reference temperature a reference
 * thermometer measured is not moved by it, and is left for the laboratory to judge.
 */
export function pointEffect(p: RunPoint, corrections: readonly (readonly [number, number])[] | null, type: EquipmentType): PointEffectDTO {
  const base = {
    pointId: p.id,
    runId: p.runId,
    seq: p.seq,
    stage: p.stage,
    referenceTemperatureK: p.referenceTemperatureK,
    errorK: p.errorK,
    statedUncertaintyK: p.statedUncertaintyK,
    verdict: p.verdict,
  }
  const none = (correctionK: number | null, statement: string): PointEffectDTO => ({
    ...base, correctionK, errorShiftK: null, correctedErrorK: null, withinUncertainty: null, correctedVerdict: null, assessment: 'not-computable', statement,
  })
  if (type === 'source' && p.referenceInstrumentId != null) {
    return none(null, 'The reference temperature of this point was measured by a reference thermometer, not taken from the source\'s setting: a correction of the source does not move it. Judge the other effects of the fault (uniformity, emissivity) on this point')
  }
  if (!corrections?.length) return none(null, 'No correction found for the reference is recorded: the effect cannot be computed yet')
  const delta = referenceCorrectionAt(corrections, p.referenceTemperatureK)
  if (delta === null) return none(null, `The corrections found do not cover ${p.referenceTemperatureK.toFixed(2)} K: the effect at this point cannot be computed`)
  const c = p.result?.budget?.components?.find(l => l.input === 'sourceTemperature')?.sensitivity
  if (typeof c !== 'number') return none(delta, 'The point\'s budget states no sensitivity to the reference temperature')
  const conformity = p.result.conformity
  try {
    const r = reevaluatePoint({
      error: p.errorK,
      expandedUncertainty: p.statedUncertaintyK,
      tolerance: conformity.tolerance,
      rule: conformity.rule,
      ...(p.result.inputs?.guardBandFactor != null ? { guardBandFactor: p.result.inputs.guardBandFactor } : {}),
      verdict: p.verdict as never,
      referenceCorrection: delta,
      sensitivity: c,
    })
    return {
      ...base,
      correctionK: delta,
      errorShiftK: r.errorShift,
      correctedErrorK: r.correctedError,
      withinUncertainty: r.withinUncertainty,
      correctedVerdict: r.correctedVerdict,
      assessment: r.assessment,
      statement: r.statement,
    }
  }
  catch (err) {
    if (err instanceof EngineInputError) return none(delta, `The point cannot be re-evaluated: ${err.message}`)
    throw err
  }
}

/** The affected work of an item in a period, with names and the effect of the corrections at each point. */
export async function affectedWork(type: EquipmentType, id: number, from: string, to: string, corrections: readonly (readonly [number, number])[] | null, t?: Transaction): Promise<AffectedWorkDTO> {
  const item = await findEquipment(type, id, t)
  const w = await usedWork(type, id, from, to, t, true)
  const instrumentIds = [...new Set(w.runs.map(r => r.instrumentId))]
  const instruments = instrumentIds.length ? await Instrument.findAll({ where: { id: instrumentIds }, attributes: ['id', 'serial'], transaction: t }) : []
  const serial = new Map(instruments.map(i => [i.id, i.serial]))
  const certOfRun = new Map(w.certificates.map(c => [c.runId, c]))
  const allCerts = w.runs.length ? await Certificate.findAll({ where: { runId: w.runs.map(r => r.id) }, attributes: ['runId', 'number'], transaction: t }) : []
  const anyCertOfRun = new Map(allCerts.map(c => [c.runId, c.number]))
  return {
    equipment: item ? { type, id, assetTag: item.assetTag } : null,
    from,
    to,
    certificates: w.certificates.map(c => ({
      id: c.id,
      number: c.number,
      issuedOn: c.issueDate,
      organizationId: c.organizationId,
      organizationName: ((c.content ?? {}) as { customer?: { name?: string } }).customer?.name ?? null,
      instrumentSerial: c.instrumentSerial,
      runId: c.runId,
      points: (w.points.get(c.runId) ?? []).map(p => p.id),
    })),
    runs: w.runs.map(r => ({
      id: r.id,
      status: r.status,
      calibrationDate: r.calibrationDate,
      instrumentSerial: serial.get(r.instrumentId) ?? null,
      certificateNumber: certOfRun.get(r.id)?.number ?? anyCertOfRun.get(r.id) ?? null,
    })),
    effects: w.runs.flatMap(r => (w.points.get(r.id) ?? []).map(p => pointEffect(p, corrections, type))),
  }
}

/**
 * The last good evidence about an item before a date (exclusive): its latest passing intermediate
 * check or its latest external calibration (as left, it was good), whichever is later; null when
 * there is none. Work on that date itself counts as affected (the time of day is not recorded).
 */
export async function lastGoodEvidence(type: EquipmentType, id: number, before: string, t?: Transaction): Promise<string | null> {
  const [check, cal] = await readTogether(t, [
    () => CheckResult.findOne({ where: { equipmentType: type, equipmentId: id, verdict: 'pass', checkedOn: { [Op.lt]: before } }, order: [['checkedOn', 'DESC']], attributes: ['checkedOn'], transaction: t }),
    () => EquipmentCalibration.findOne({ where: { equipmentType: type, equipmentId: id, calibrationDate: { [Op.lt]: before } }, order: [['calibrationDate', 'DESC']], attributes: ['calibrationDate'], transaction: t }),
  ])
  const dates = [check?.checkedOn, cal?.calibrationDate].filter((d): d is string => !!d).sort()
  return dates.length ? dates[dates.length - 1]! : null
}

/** The first date the item was used in a point (not voided, run not void), or null. */
export async function firstUse(type: EquipmentType, id: number, t?: Transaction): Promise<string | null> {
  const w = await usedWork(type, id, '0001-01-01', '9999-12-31', t)
  return w.runs[0]?.calibrationDate ?? null
}
