/**
 * The points of a run: added one by one, several at once, or from CSV; corrected; voided with a
 * reason. Every point is computed by the pure shared/calibration/compute.ts after the setup checks
 * (./context.ts) and stored with its inputs. Every change of a run's data bumps the run's version
 * (the version an approval must name) and records who made it (they may not approve it).
 */
import type { Transaction } from 'sequelize'
import { MAX_READINGS } from '#shared/calibration/constants'
import { computePoint } from '#shared/calibration/compute'
import { EngineInputError } from '#shared/radiometry/errors'
import { fieldErrors } from '#shared/schemas/errors'
import { pointCreateSchema, type PointCreateInput, type PointImportInput, type PointUpdateInput, type VoidInput } from '#shared/schemas/run'
import type { PointResult, RunImportPreview } from '#shared/types'
import { BlackbodySource } from '#server/models/BlackbodySource'
import { ReferenceInstrument } from '#server/models/ReferenceInstrument'
import { RunPoint } from '#server/models/RunPoint'
import { RunRevision } from '#server/models/RunRevision'
import { recordAudit, snapshot } from '#server/utils/audit'
import { cellsToInput, previewOf, readCsvRecords, refuseUnlessAllValid, withCsvShape, type CheckedRow, type CsvColumns } from '#server/utils/csv'
import { assertVersion, conflict, invalidInput, notFound } from '#server/utils/errors'
import { Equipment, assertComputable, computationInput, evaluateObservation, loadRunContext, observationFrom, observationOf, pointColumns, pointRecord, setupProblem, type Observation } from './context'
import { assertEditable, findRun, markChanged, requireReason, type Actor } from './workflow'

async function nextSeq(t: Transaction, runId: number): Promise<number> {
  const max = await RunPoint.max<number, RunPoint>('seq', { where: { runId }, transaction: t })
  return (typeof max === 'number' ? max : 0) + 1
}

/** Store a new point (and its revision once submitted); `auditAction` null when the caller writes one audit row for a batch. */
async function storeNewPoint(t: Transaction, actor: Actor, runId: number, seq: number, obs: Observation, result: PointResult, reason: string | null, auditAction: string | null): Promise<RunPoint> {
  const p = await RunPoint.create({ runId, seq, ...pointColumns(obs, result), monteCarlo: null, voidedAt: null, voidedBy: null, voidReason: null }, { transaction: t })
  if (reason) await RunRevision.create({ runId, pointId: p.id, userId: actor.id, at: new Date(), reason, before: null, after: pointRecord(p) }, { transaction: t })
  if (auditAction) await recordAudit(t, { userId: actor.id, action: auditAction, entity: 'RunPoint', entityId: p.id, after: { ...snapshot(p, ['result']), reason } })
  return p
}

/** Add a point: setup and equipment checked on the run's calibration date, everything computed and stored. */
export async function addPointIn(t: Transaction, actor: Actor, runId: number, input: PointCreateInput, auditAction = 'create'): Promise<RunPoint> {
  return (await addPointsIn(t, actor, runId, [input], auditAction))[0]!
}

/**
 * Add several points to a run at once (a whole run saved from the entry page, the demo seed): the
 * run, its context and each piece of equipment are loaded once. Field errors of the i-th point are
 * named `points[i].field` when there is more than one. All points or none (the caller's transaction).
 */
export async function addPointsIn(t: Transaction, actor: Actor, runId: number, inputs: readonly PointCreateInput[], auditAction = 'create'): Promise<RunPoint[]> {
  const run = await findRun(t, runId)
  assertEditable(run)
  const reason = requireReason(run, inputs.find(i => i.reason)?.reason)
  if (!inputs.length) return []
  const ctx = await loadRunContext(t, run.instrumentId, run.procedureVersionId, run.requestId)
  assertComputable(run, ctx.ratio)
  const eq = new Equipment(t, run.calibrationDate)
  const computed: { obs: Observation, result: PointResult }[] = []
  for (const [i, input] of inputs.entries()) {
    const obs = observationFrom(input)
    try {
      computed.push({ obs, result: await evaluateObservation(run, ctx, eq, obs) })
    }
    catch (err) {
      const fields = (err as { data?: { fields?: Record<string, string> } }).data?.fields
      if (inputs.length > 1 && fields) invalidInput(Object.fromEntries(Object.entries(fields).map(([f, m]) => [`points[${i}].${f}`, m])))
      throw err
    }
  }
  let seq = await nextSeq(t, run.id)
  const out: RunPoint[] = []
  if (computed.length === 1) {
    out.push(await storeNewPoint(t, actor, run.id, seq, computed[0]!.obs, computed[0]!.result, reason, auditAction))
  }
  else {
    // Several points saved together are one change: one audit row on the run lists them all.
    for (const c of computed) out.push(await storeNewPoint(t, actor, run.id, seq++, c.obs, c.result, reason, null))
    await recordAudit(t, { userId: actor.id, action: auditAction === 'create' ? 'add-points' : auditAction, entity: 'CalibrationRun', entityId: run.id, after: { points: out.map(p => ({ id: p.id, ...snapshot(p, ['result']) })), reason } })
  }
  await markChanged(t, run, actor)
  return out
}

async function findPoint(t: Transaction, runId: number, pointId: number): Promise<RunPoint> {
  const point = await RunPoint.findOne({ where: { id: pointId, runId }, transaction: t })
  if (!point) notFound('point')
  return point
}

/** Edit a point's observations (its own `version`); the earlier values go to a revision once the run was submitted. */
export async function updatePointIn(t: Transaction, actor: Actor, runId: number, pointId: number, input: PointUpdateInput): Promise<RunPoint> {
  const run = await findRun(t, runId)
  assertEditable(run)
  const point = await findPoint(t, runId, pointId)
  if (point.voidedAt) conflict(`Point ${point.seq} is void: it cannot change`)
  assertVersion(point.version, input.version)
  const reason = requireReason(run, input.reason)
  const ctx = await loadRunContext(t, run.instrumentId, run.procedureVersionId, run.requestId)
  assertComputable(run, ctx.ratio)
  const { version: _v, reason: _r, ...changes } = input
  const { readingsK: storedReadings, ...stored } = observationOf(point)
  // new regions of interest bring their own (centre) readings
  const base = changes.rois !== undefined && changes.readingsK === undefined ? stored : { ...stored, readingsK: storedReadings }
  const parsed = pointCreateSchema.safeParse({ ...base, ...changes })
  if (!parsed.success) invalidInput(fieldErrors(parsed.error))
  const obs = observationFrom(parsed.data)
  const result = await evaluateObservation(run, ctx, new Equipment(t, run.calibrationDate), obs)
  const before = pointRecord(point)
  const full = snapshot(point, ['result'])
  point.set({ ...pointColumns(obs, result), monteCarlo: null })
  await point.save({ transaction: t })
  if (reason) await RunRevision.create({ runId: run.id, pointId: point.id, userId: actor.id, at: new Date(), reason, before, after: pointRecord(point) }, { transaction: t })
  await recordAudit(t, { userId: actor.id, action: 'update', entity: 'RunPoint', entityId: point.id, before: full, after: { ...snapshot(point, ['result']), reason } })
  await markChanged(t, run, actor)
  return point
}

/** Void a mistaken point with the reason: it is kept (greyed, audited) and never used or printed. */
export async function voidPointIn(t: Transaction, actor: Actor, runId: number, pointId: number, input: VoidInput): Promise<RunPoint> {
  const run = await findRun(t, runId)
  assertEditable(run)
  const point = await findPoint(t, runId, pointId)
  if (point.voidedAt) conflict(`Point ${point.seq} is already void`)
  assertVersion(point.version, input.version)
  const before = snapshot(point, ['result'])
  point.set({ voidedAt: new Date(), voidedBy: actor.id, voidReason: input.reason, monteCarlo: null })
  await point.save({ transaction: t })
  if (run.submittedAt) await RunRevision.create({ runId: run.id, pointId: point.id, userId: actor.id, at: new Date(), reason: input.reason, before: pointRecord(point), after: { point: point.seq, voided: true } }, { transaction: t })
  await recordAudit(t, { userId: actor.id, action: 'void', entity: 'RunPoint', entityId: point.id, before, after: { ...snapshot(point, ['result']), reason: input.reason } })
  await markChanged(t, run, actor)
  return point
}

// ---------------------------------------------------------------- CSV entry

const READING_COLUMNS = Array.from({ length: MAX_READINGS }, (_, i) => `reading${i + 1}`)
export const POINT_CSV_COLUMNS: CsvColumns = {
  stage: 'text',
  sourceAssetTag: 'text',
  setPointK: 'number',
  sourceIndicatedK: 'number',
  referenceAssetTag: 'text',
  referenceReadingK: 'number',
  ...Object.fromEntries(READING_COLUMNS.map(c => [c, 'number' as const])),
}

/** A schema or engine field name as the CSV spells it. */
function csvField(field: string): string {
  if (field === 'sourceId') return 'sourceAssetTag'
  if (field === 'referenceInstrumentId') return 'referenceAssetTag'
  const m = /^readingsK(?:\[(\d+)\])?$/.exec(field)
  if (m) return m[1] === undefined ? 'reading1' : `reading${Number(m[1]) + 1}`
  return field
}

/**
 * Points from CSV (columns stage, sourceAssetTag, setPointK, sourceIndicatedK or referenceAssetTag +
 * referenceReadingK, reading1 … readingN): a preview with errors by line and field, or with
 * `commit` every row in this transaction or none.
 */
export async function importPointsIn(t: Transaction, actor: Actor, runId: number, input: PointImportInput): Promise<RunImportPreview | { created: number }> {
  const run = await findRun(t, runId)
  assertEditable(run)
  const reason = input.commit ? requireReason(run, input.reason) : null
  const ctx = await loadRunContext(t, run.instrumentId, run.procedureVersionId, run.requestId)
  if (ctx.imager) invalidInput({ csv: 'A thermal imager\'s points are entered with their regions of interest (position, size and readings of each), which a points CSV does not hold: enter them on the run page or through the API' })
  assertComputable(run, ctx.ratio)
  const records = withCsvShape(() => readCsvRecords(input.csv, POINT_CSV_COLUMNS))
  const eq = new Equipment(t, run.calibrationDate)
  const tagCache = new Map<string, number | null>()
  const idOfTag = async (kind: 'source' | 'reference', tag: string): Promise<number | null> => {
    const key = `${kind}:${tag.toLowerCase()}`
    if (!tagCache.has(key)) {
      const row = kind === 'source'
        ? await BlackbodySource.findOne({ where: { assetTag: tag }, attributes: ['id'], transaction: t })
        : await ReferenceInstrument.findOne({ where: { assetTag: tag }, attributes: ['id'], transaction: t })
      tagCache.set(key, row?.id ?? null)
    }
    return tagCache.get(key)!
  }

  const rows: CheckedRow<{ obs: Observation, result: PointResult }>[] = []
  for (const rec of records) {
    const { input: cells, errors } = cellsToInput(rec.cells, POINT_CSV_COLUMNS)
    const readings = READING_COLUMNS.filter(c => cells[c] !== undefined).map(c => cells[c] as number)
    const body: Record<string, unknown> = {
      stage: cells.stage,
      setPointK: cells.setPointK,
      sourceIndicatedK: cells.sourceIndicatedK,
      referenceReadingK: cells.referenceReadingK,
      readingsK: readings,
    }
    if (typeof cells.sourceAssetTag === 'string') {
      const id = await idOfTag('source', cells.sourceAssetTag)
      if (id === null) errors.sourceAssetTag ??= 'No blackbody source with this asset tag'
      else body.sourceId = id
    }
    else errors.sourceAssetTag ??= 'Give the source’s asset tag'
    if (typeof cells.referenceAssetTag === 'string') {
      const id = await idOfTag('reference', cells.referenceAssetTag)
      if (id === null) errors.referenceAssetTag ??= 'No reference instrument with this asset tag'
      else body.referenceInstrumentId = id
    }
    const parsed = pointCreateSchema.safeParse(body)
    if (!parsed.success) for (const [f, m] of Object.entries(fieldErrors(parsed.error))) errors[csvField(f)] ??= m
    let value: { obs: Observation, result: PointResult } | null = null
    if (parsed.success && !Object.keys(errors).length) {
      const obs = observationFrom(parsed.data)
      const problem = await setupProblem(run, ctx, eq, obs)
      if (problem) errors[csvField(problem.field)] = problem.message
      else {
        try {
          const source = (await eq.source(obs.sourceId)).row!
          const used = await eq.used(obs)
          const result = computePoint(computationInput(run, ctx, obs, source, used))
          value = { obs, result }
        }
        catch (err) {
          if (!(err instanceof EngineInputError)) throw err
          errors[csvField(err.field)] = err.message.startsWith(`${err.field}: `) ? err.message.slice(err.field.length + 2) : err.message
        }
      }
    }
    const data: Record<string, unknown> = value
      ? { ...rec.cells, expectedReadingK: value.result.expectedReadingK, errorK: value.result.errorK, statedUncertaintyK: value.result.budget.statedUncertaintyK, verdict: value.result.conformity.verdict }
      : rec.cells
    rows.push({ line: rec.line, data, errors, value })
  }
  if (!input.commit) return previewOf(rows)
  const values = refuseUnlessAllValid(rows)
  let seq = await nextSeq(t, run.id)
  for (const v of values) await storeNewPoint(t, actor, run.id, seq++, v.obs, v.result, reason, 'import')
  await markChanged(t, run, actor)
  return { created: values.length }
}
