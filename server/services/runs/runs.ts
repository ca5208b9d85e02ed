/**
 * Calibration runs: the header, points, CSV entry, submission and review, the record of amendments
 * (ISO/IEC 17025 7.5) and the lock on approved runs. Each point's numbers come from the pure
 * shared/calibration/compute.ts; this module only loads the records, checks the equipment and the
 * workflow, and stores what the computation returns.
 *
 * The functions named `…In` work inside the caller's transaction (routes wrap them in
 * `inTransaction`, the demo seed passes its own); every change writes its audit row there.
 */
import { createError } from 'h3'
import { Op, type Transaction, type WhereOptions } from 'sequelize'
import { MAX_READINGS, type PointStage } from '#shared/calibration/constants'
import { computePoint } from '#shared/calibration/compute'
import { EngineInputError } from '#shared/radiometry/errors'
import { fieldErrors } from '#shared/schemas/errors'
import { pointCreateSchema, type PointCreateInput, type PointImportInput, type PointUpdateInput, type RunActionInput, type RunCreateInput, type RunQuery, type RunReturnInput, type RunUpdateInput } from '#shared/schemas/run'
import type { AuditEventDTO, BandInput, Page, PointComputationInput, PointResult, RunDTO, RunDetailDTO, RunImportPreview, RunPointDTO } from '#shared/types'
import { AuditEvent } from '#server/models/AuditEvent'
import { BlackbodySource } from '#server/models/BlackbodySource'
import { CalibrationRun } from '#server/models/CalibrationRun'
import { Instrument } from '#server/models/Instrument'
import { Organization } from '#server/models/Organization'
import { ProcedureVersion } from '#server/models/ProcedureVersion'
import { ReferenceInstrument } from '#server/models/ReferenceInstrument'
import { RunPoint } from '#server/models/RunPoint'
import { RunRevision } from '#server/models/RunRevision'
import { SpectralResponse } from '#server/models/SpectralResponse'
import { User } from '#server/models/User'
import { notFound, engine, invalidInput, assertVersion } from '#server/utils/errors'
import { recordAudit, snapshot, updateAudited } from '#server/utils/audit'
import { cellsToInput, previewOf, readCsvRecords, refuseUnlessAllValid, withCsvShape, type CheckedRow, type CsvColumns } from '#server/utils/csv'
import { assertUsableOn } from '#server/services/equipment/usability'
import { procedureVersionDTO } from '#server/services/procedures/procedures'
import { auditDTO } from '#server/services/audit/dto'
import { ListFilter } from '#server/utils/search'
import { inTransaction } from '#server/utils/transaction'
import { instrumentBand, instrumentSummary, runDTO, runPointDTO, runRevisionDTO, type RunNames } from './dto'

/** Who makes a change (the signed-in user, or a demo account in the seed). */
export interface Actor {
  id: number
}

/** Header fields whose change alters the computed points. */
const RECOMPUTE_KEYS = ['emissivitySetting', 'reflectedTemperatureK', 'instrumentTemperatureK', 'procedureVersionId', 'calibrationDate'] as const
const HEADER_KEYS = ['receivedDate', 'calibrationDate', 'ambientTemperatureK', 'relativeHumidityPct', 'distanceMm', 'emissivitySetting', 'reflectedTemperatureK', 'instrumentTemperatureK', 'adjusted', 'notes', 'procedureVersionId'] as const

export const LOCKED_MESSAGE = 'approved runs cannot change'

function conflict(message: string, field = 'status'): never {
  throw createError({ statusCode: 409, statusMessage: 'Conflict', message, data: { message, fields: { [field]: message } } })
}

/** 409 for an approved run: it is locked (certificates build on it). */
export function assertWritable(run: CalibrationRun): void {
  if (run.status === 'approved') conflict(LOCKED_MESSAGE)
}

/** After submission every change needs a reason (400 naming `reason`); before it none is kept. */
export function requireReason(run: CalibrationRun, reason: string | undefined): string | null {
  if (!run.submittedAt) return null
  if (!reason) invalidInput({ reason: 'Give the reason for this change: the run has been submitted, so every amendment is recorded with its reason' })
  return reason
}

async function findRun(t: Transaction, id: number): Promise<CalibrationRun> {
  const run = await CalibrationRun.findByPk(id, { transaction: t })
  if (!run) notFound('run')
  return run
}

// ---------------------------------------------------------------- context and computation

/** What every point of a run is computed with. */
export interface RunContext {
  instrument: Instrument
  table: SpectralResponse | null
  band: BandInput
  procedureVersion: ProcedureVersion
}

export async function loadRunContext(t: Transaction | undefined, instrumentId: number, procedureVersionId: number): Promise<RunContext> {
  const instrument = await Instrument.findByPk(instrumentId, { transaction: t })
  if (!instrument) invalidInput({ instrumentId: 'No instrument with this id' })
  const table = instrument.spectralResponseId ? await SpectralResponse.findByPk(instrument.spectralResponseId, { transaction: t }) : null
  const band = instrumentBand(instrument, table)
  if (!band) invalidInput({ instrumentId: 'The instrument has neither a spectral band nor a responsivity table' })
  const procedureVersion = await ProcedureVersion.findByPk(procedureVersionId, { transaction: t })
  if (!procedureVersion) invalidInput({ procedureVersionId: 'No procedure version with this id' })
  return { instrument, table, band, procedureVersion }
}

/** The observations of a point (what the technician entered). */
export interface Observation {
  stage: PointStage
  sourceId: number
  setPointK: number
  sourceIndicatedK: number | null
  referenceInstrumentId: number | null
  referenceReadingK: number | null
  readingsK: number[]
}

function observationOf(p: RunPoint): Observation {
  return {
    stage: p.stage,
    sourceId: p.sourceId,
    setPointK: p.setPointK,
    sourceIndicatedK: p.sourceIndicatedK ?? null,
    referenceInstrumentId: p.referenceInstrumentId ?? null,
    referenceReadingK: p.referenceReadingK ?? null,
    readingsK: p.readingsK,
  }
}

/** The computation's input for one point of a run. */
export function computationInput(run: CalibrationRun, ctx: RunContext, obs: Observation, source: BlackbodySource): PointComputationInput {
  const pv = ctx.procedureVersion
  return {
    band: ctx.band,
    reference: obs.referenceInstrumentId != null
      ? { kind: 'reference-thermometer', referenceReadingK: obs.referenceReadingK! }
      : { kind: 'source-correction', sourceIndicatedK: obs.sourceIndicatedK!, corrections: source.corrections ?? [] },
    sourceEmissivity: source.emissivity,
    reflectedTemperatureK: run.reflectedTemperatureK,
    instrumentTemperatureK: run.instrumentTemperatureK,
    emissivitySetting: run.emissivitySetting,
    readingsK: [...obs.readingsK],
    resolutionK: ctx.instrument.resolutionK,
    template: pv.template,
    cmc: pv.cmc,
    accuracy: ctx.instrument.accuracy,
    rule: pv.decisionRule,
    guardBandFactor: pv.guardBandFactor ?? null,
  }
}

function pointColumns(obs: Observation, result: PointResult) {
  return {
    ...obs,
    referenceTemperatureK: result.referenceTemperatureK,
    expectedReadingK: result.expectedReadingK,
    errorK: result.errorK,
    statedUncertaintyK: result.budget.statedUncertaintyK,
    verdict: result.conformity.verdict,
    engineVersion: result.engineVersion,
    result,
  }
}

/** A point as the revision record keeps it: observations and the key results (the full result is recomputable). */
function pointRecord(p: RunPoint) {
  return {
    ...observationOf(p),
    referenceTemperatureK: p.referenceTemperatureK,
    expectedReadingK: p.expectedReadingK,
    errorK: p.errorK,
    statedUncertaintyK: p.statedUncertaintyK,
    verdict: p.verdict,
    engineVersion: p.engineVersion,
  }
}

/** The reference equipment of an operation, loaded and checked once each. */
class Equipment {
  private sources = new Map<number, { row: BlackbodySource | null, reason: string | null }>()
  private refs = new Map<number, { row: ReferenceInstrument | null, reason: string | null }>()
  constructor(private readonly t: Transaction | undefined, private readonly date: string) {}

  async source(id: number): Promise<{ row: BlackbodySource | null, reason: string | null }> {
    let hit = this.sources.get(id)
    if (!hit) {
      const row = await BlackbodySource.findByPk(id, { transaction: this.t })
      hit = row ? { row, reason: await assertUsableOn(row, this.date, this.t) } : { row: null, reason: 'No blackbody source with this id' }
      this.sources.set(id, hit)
    }
    return hit
  }

  async reference(id: number): Promise<{ row: ReferenceInstrument | null, reason: string | null }> {
    let hit = this.refs.get(id)
    if (!hit) {
      const row = await ReferenceInstrument.findByPk(id, { transaction: this.t })
      if (!row) hit = { row: null, reason: 'No reference instrument with this id' }
      else if (row.rangeUnit !== 'K') hit = { row, reason: `${row.assetTag} does not measure temperature` }
      else hit = { row, reason: await assertUsableOn(row, this.date, this.t) }
      this.refs.set(id, hit)
    }
    return hit
  }
}

function refusal(tag: string, date: string, reason: string): string {
  return `${tag} cannot be used on ${date}: ${reason}`
}

/** Check the equipment and compute one point; 400 naming the field at fault. */
async function evaluateObservation(run: CalibrationRun, ctx: RunContext, eq: Equipment, obs: Observation): Promise<PointResult> {
  if (!run.adjusted && obs.stage === 'as-left') invalidInput({ stage: 'This run records no adjustment, so every point is as found (mark the run adjusted to add as-left points)' })
  const s = await eq.source(obs.sourceId)
  if (!s.row) invalidInput({ sourceId: s.reason! })
  if (s.reason) invalidInput({ sourceId: refusal(s.row.assetTag, run.calibrationDate, s.reason) })
  if (obs.referenceInstrumentId != null) {
    const r = await eq.reference(obs.referenceInstrumentId)
    if (!r.row) invalidInput({ referenceInstrumentId: r.reason! })
    if (r.reason) invalidInput({ referenceInstrumentId: refusal(r.row.assetTag, run.calibrationDate, r.reason) })
  }
  return engine(() => computePoint(computationInput(run, ctx, obs, s.row!)))
}

// ---------------------------------------------------------------- header

/** Create a draft run; the technician is the actor. */
export async function createRunIn(t: Transaction, actor: Actor, input: RunCreateInput, auditAction = 'create'): Promise<CalibrationRun> {
  const instrument = await Instrument.findByPk(input.instrumentId, { transaction: t })
  if (!instrument || instrument.archived) invalidInput({ instrumentId: 'No instrument with this id' })
  if (instrument.status === 'retired') invalidInput({ instrumentId: 'The instrument is retired' })
  await loadRunContext(t, instrument.id, input.procedureVersionId)
  const run = await CalibrationRun.create({
    ...input,
    notes: input.notes ?? null,
    emissivitySetting: input.emissivitySetting ?? instrument.defaultEmissivity,
    technicianId: actor.id,
    status: 'draft',
    submittedAt: null,
    reviewerId: null,
    reviewedAt: null,
    reviewComments: null,
  }, { transaction: t })
  await recordAudit(t, { userId: actor.id, action: auditAction, entity: 'CalibrationRun', entityId: run.id, after: snapshot(run) })
  return run
}

function header(run: CalibrationRun): Record<string, unknown> {
  return Object.fromEntries(HEADER_KEYS.map(k => [k, run.get(k)]))
}

/** Recompute (and store) every point of a run after a header change; 400 on `calibrationDate` when equipment is no longer usable. */
async function recomputePoints(t: Transaction, actor: Actor, run: CalibrationRun, recheckEquipment: boolean): Promise<number> {
  const ctx = await loadRunContext(t, run.instrumentId, run.procedureVersionId)
  const points = await RunPoint.findAll({ where: { runId: run.id }, order: [['seq', 'ASC']], transaction: t })
  const eq = new Equipment(t, run.calibrationDate)
  const changes: { pointId: number, before: Record<string, unknown>, after: Record<string, unknown> }[] = []
  for (const p of points) {
    const obs = observationOf(p)
    const s = await eq.source(obs.sourceId)
    if (recheckEquipment && s.reason) invalidInput({ calibrationDate: refusal(s.row?.assetTag ?? `Source ${obs.sourceId}`, run.calibrationDate, s.reason) })
    if (recheckEquipment && obs.referenceInstrumentId != null) {
      const r = await eq.reference(obs.referenceInstrumentId)
      if (r.reason) invalidInput({ calibrationDate: refusal(r.row?.assetTag ?? `Reference ${obs.referenceInstrumentId}`, run.calibrationDate, r.reason) })
    }
    const result = engine(() => computePoint(computationInput(run, ctx, obs, s.row!)))
    const before = pointRecord(p)
    p.set({ ...pointColumns(obs, result), monteCarlo: null })
    await p.save({ transaction: t })
    changes.push({ pointId: p.id, before, after: pointRecord(p) })
  }
  // One audit row for the recomputation of the whole run (the points' stored results changed with the header).
  if (changes.length) await recordAudit(t, { userId: actor.id, action: 'recompute-points', entity: 'CalibrationRun', entityId: run.id, before: changes.map(c => ({ pointId: c.pointId, ...c.before })), after: changes.map(c => ({ pointId: c.pointId, ...c.after })) })
  return changes.length
}

/** Edit the run header (409 when stale or approved; a reason once submitted); points are recomputed when their inputs change. */
export async function updateRunIn(t: Transaction, actor: Actor, id: number, input: RunUpdateInput): Promise<CalibrationRun> {
  const run = await findRun(t, id)
  assertWritable(run)
  assertVersion(run.version, input.version)
  const reason = requireReason(run, input.reason)
  const { version: _v, reason: _r, ...changes } = input
  if (changes.receivedDate || changes.calibrationDate) {
    const received = changes.receivedDate ?? run.receivedDate
    const calibrated = changes.calibrationDate ?? run.calibrationDate
    if (calibrated < received) invalidInput({ calibrationDate: 'The calibration date cannot be before the date the item was received' })
  }
  if (changes.adjusted === false && run.adjusted) {
    const asLeft = await RunPoint.count({ where: { runId: run.id, stage: 'as-left' }, transaction: t })
    if (asLeft) invalidInput({ adjusted: `The run has ${asLeft} as-left point(s); change them to as found first` })
  }
  if (changes.procedureVersionId !== undefined) await loadRunContext(t, run.instrumentId, changes.procedureVersionId)
  const before = header(run)
  const full = snapshot(run)
  run.set(changes)
  const keys = (run.changed() || []) as string[]
  if (!keys.length) return run
  await run.save({ transaction: t })
  if (keys.some(k => (RECOMPUTE_KEYS as readonly string[]).includes(k))) await recomputePoints(t, actor, run, keys.includes('calibrationDate'))
  const after = header(run)
  const pick = (o: Record<string, unknown>) => Object.fromEntries(keys.filter(k => k in o).map(k => [k, o[k]]))
  if (reason) await RunRevision.create({ runId: run.id, pointId: null, userId: actor.id, at: new Date(), reason, before: pick(before), after: pick(after) }, { transaction: t })
  await recordAudit(t, { userId: actor.id, action: 'update', entity: 'CalibrationRun', entityId: run.id, before: full, after: { ...snapshot(run), reason } })
  return run
}

// ---------------------------------------------------------------- points

async function nextSeq(t: Transaction, runId: number): Promise<number> {
  const max = await RunPoint.max<number, RunPoint>('seq', { where: { runId }, transaction: t })
  return (typeof max === 'number' ? max : 0) + 1
}

/** Store a new point (and its revision once submitted); `auditAction` null when the caller writes one audit row for a batch. */
async function storeNewPoint(t: Transaction, actor: Actor, run: CalibrationRun, seq: number, obs: Observation, result: PointResult, reason: string | null, auditAction: string | null): Promise<RunPoint> {
  const p = await RunPoint.create({ runId: run.id, seq, ...pointColumns(obs, result), monteCarlo: null }, { transaction: t })
  if (reason) await RunRevision.create({ runId: run.id, pointId: p.id, userId: actor.id, at: new Date(), reason, before: null, after: pointRecord(p) }, { transaction: t })
  if (auditAction) await recordAudit(t, { userId: actor.id, action: auditAction, entity: 'RunPoint', entityId: p.id, after: { ...snapshot(p, ['result']), reason } })
  return p
}

function observationFrom(input: Omit<PointCreateInput, 'reason'>): Observation {
  return {
    stage: input.stage,
    sourceId: input.sourceId,
    setPointK: input.setPointK,
    sourceIndicatedK: input.sourceIndicatedK ?? null,
    referenceInstrumentId: input.referenceInstrumentId ?? null,
    referenceReadingK: input.referenceReadingK ?? null,
    readingsK: input.readingsK,
  }
}

/** Add a point: equipment checked on the run's calibration date, everything computed and stored. */
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
  assertWritable(run)
  const reason = requireReason(run, inputs.find(i => i.reason)?.reason)
  if (!inputs.length) return []
  const ctx = await loadRunContext(t, run.instrumentId, run.procedureVersionId)
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
    out.push(await storeNewPoint(t, actor, run, seq, computed[0]!.obs, computed[0]!.result, reason, auditAction))
    return out
  }
  // Several points saved together are one change: one audit row on the run lists them all.
  for (const c of computed) out.push(await storeNewPoint(t, actor, run, seq++, c.obs, c.result, reason, null))
  await recordAudit(t, { userId: actor.id, action: auditAction === 'create' ? 'add-points' : auditAction, entity: 'CalibrationRun', entityId: run.id, after: { points: out.map(p => ({ id: p.id, ...snapshot(p, ['result']) })), reason } })
  return out
}

/** Edit a point's observations (its own `version`); the earlier values go to a revision once the run was submitted. */
export async function updatePointIn(t: Transaction, actor: Actor, runId: number, pointId: number, input: PointUpdateInput): Promise<RunPoint> {
  const run = await findRun(t, runId)
  assertWritable(run)
  const point = await RunPoint.findOne({ where: { id: pointId, runId }, transaction: t })
  if (!point) notFound('point')
  assertVersion(point.version, input.version)
  const reason = requireReason(run, input.reason)
  const { version: _v, reason: _r, ...changes } = input
  const parsed = pointCreateSchema.safeParse({ ...observationOf(point), ...changes })
  if (!parsed.success) invalidInput(fieldErrors(parsed.error))
  const obs = observationFrom(parsed.data)
  const ctx = await loadRunContext(t, run.instrumentId, run.procedureVersionId)
  const result = await evaluateObservation(run, ctx, new Equipment(t, run.calibrationDate), obs)
  const before = pointRecord(point)
  const full = snapshot(point, ['result'])
  point.set({ ...pointColumns(obs, result), monteCarlo: null })
  await point.save({ transaction: t })
  if (reason) await RunRevision.create({ runId: run.id, pointId: point.id, userId: actor.id, at: new Date(), reason, before, after: pointRecord(point) }, { transaction: t })
  await recordAudit(t, { userId: actor.id, action: 'update', entity: 'RunPoint', entityId: point.id, before: full, after: { ...snapshot(point, ['result']), reason } })
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
  assertWritable(run)
  const reason = input.commit ? requireReason(run, input.reason) : null
  const records = withCsvShape(() => readCsvRecords(input.csv, POINT_CSV_COLUMNS))
  const ctx = await loadRunContext(t, run.instrumentId, run.procedureVersionId)
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
      const problem = await rowProblem(run, ctx, eq, obs)
      if (problem) errors[problem.field] = problem.message
      else {
        try {
          const result = computePoint(computationInput(run, ctx, obs, (await eq.source(obs.sourceId)).row!))
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
  for (const v of values) await storeNewPoint(t, actor, run, seq++, v.obs, v.result, reason, 'import')
  return { created: values.length }
}

async function rowProblem(run: CalibrationRun, _ctx: RunContext, eq: Equipment, obs: Observation): Promise<{ field: string, message: string } | null> {
  if (!run.adjusted && obs.stage === 'as-left') return { field: 'stage', message: 'This run records no adjustment, so every point is as found' }
  const s = await eq.source(obs.sourceId)
  if (s.reason) return { field: 'sourceAssetTag', message: s.row ? refusal(s.row.assetTag, run.calibrationDate, s.reason) : s.reason }
  if (obs.referenceInstrumentId != null) {
    const r = await eq.reference(obs.referenceInstrumentId)
    if (r.reason) return { field: 'referenceAssetTag', message: r.row ? refusal(r.row.assetTag, run.calibrationDate, r.reason) : r.reason }
  }
  return null
}

// ---------------------------------------------------------------- workflow

/** draft or returned → submitted: at least one point; an adjusted run needs as-found and as-left points. */
export async function submitRunIn(t: Transaction, actor: Actor, id: number, input: RunActionInput, auditAction = 'submit'): Promise<CalibrationRun> {
  const run = await findRun(t, id)
  assertWritable(run)
  assertVersion(run.version, input.version)
  if (run.status === 'submitted') conflict('The run is already submitted')
  const stages = new Set((await RunPoint.findAll({ where: { runId: id }, attributes: ['stage'], transaction: t })).map(p => p.stage))
  if (!stages.size) invalidInput({ points: 'Add at least one point before submitting' })
  if (run.adjusted && !(stages.has('as-found') && stages.has('as-left'))) {
    invalidInput({ points: 'An adjusted run needs both as-found and as-left points before it is submitted' })
  }
  await updateAudited(t, actor, run, { status: 'submitted', submittedAt: new Date() }, { entity: 'CalibrationRun', action: auditAction })
  return run
}

/** submitted → approved, by someone other than the person who performed it (403 otherwise). */
export async function approveRunIn(t: Transaction, actor: Actor, id: number, input: RunActionInput, auditAction = 'approve'): Promise<CalibrationRun> {
  const run = await findRun(t, id)
  assertWritable(run)
  assertVersion(run.version, input.version)
  if (run.status !== 'submitted') conflict('Only a submitted run can be approved')
  if (run.technicianId === actor.id) {
    throw createError({ statusCode: 403, statusMessage: 'Forbidden', message: 'The person who performed a run cannot approve it: another quality manager must review it' })
  }
  await updateAudited(t, actor, run, { status: 'approved', reviewerId: actor.id, reviewedAt: new Date() }, { entity: 'CalibrationRun', action: auditAction })
  return run
}

/** submitted → returned with the reviewer's comments; the run is then corrected and submitted again. */
export async function returnRunIn(t: Transaction, actor: Actor, id: number, input: RunReturnInput, auditAction = 'return'): Promise<CalibrationRun> {
  const run = await findRun(t, id)
  assertWritable(run)
  assertVersion(run.version, input.version)
  if (run.status !== 'submitted') conflict('Only a submitted run can be returned')
  await updateAudited(t, actor, run, { status: 'returned', reviewerId: actor.id, reviewedAt: new Date(), reviewComments: input.comments }, { entity: 'CalibrationRun', action: auditAction })
  return run
}

// ---------------------------------------------------------------- reading

async function namesFor(runs: CalibrationRun[]): Promise<(r: CalibrationRun) => RunNames> {
  const instrumentIds = [...new Set(runs.map(r => r.instrumentId))]
  const pvIds = [...new Set(runs.map(r => r.procedureVersionId))]
  const userIds = [...new Set(runs.flatMap(r => [r.technicianId, r.reviewerId]).filter((v): v is number => !!v))]
  const runIds = runs.map(r => r.id)
  const [instruments, pvs, users, counts] = await Promise.all([
    instrumentIds.length ? Instrument.findAll({ where: { id: instrumentIds } }) : [],
    pvIds.length ? ProcedureVersion.findAll({ where: { id: pvIds }, attributes: ['id', 'procedureId', 'versionNumber', 'name'] }) : [],
    userIds.length ? User.findAll({ where: { id: userIds }, attributes: ['id', 'name'] }) : [],
    runIds.length ? RunPoint.count({ where: { runId: runIds }, group: ['runId'] }) : [],
  ])
  const orgIds = [...new Set(instruments.map(i => i.organizationId))]
  const orgs = orgIds.length ? await Organization.findAll({ where: { id: orgIds }, attributes: ['id', 'name'] }) : []
  const inst = new Map(instruments.map(i => [i.id, i]))
  const pv = new Map(pvs.map(v => [v.id, v]))
  const user = new Map(users.map(u => [u.id, u.name]))
  const org = new Map(orgs.map(o => [o.id, o.name]))
  const count = new Map((counts as unknown as { runId: number, count: number }[]).map(c => [c.runId, Number(c.count)]))
  return (r) => {
    const i = inst.get(r.instrumentId) ?? null
    const v = pv.get(r.procedureVersionId)
    return {
      instrument: i,
      organizationName: i ? org.get(i.organizationId) ?? null : null,
      procedureId: v?.procedureId ?? null,
      procedureName: v?.name ?? null,
      procedureVersionNumber: v?.versionNumber ?? null,
      technicianName: user.get(r.technicianId) ?? null,
      reviewerName: r.reviewerId ? user.get(r.reviewerId) ?? null : null,
      pointCount: count.get(r.id) ?? 0,
    }
  }
}

/** GET /api/runs: paged, filtered by status, instrument, technician and a serial prefix, sorted. */
export async function listRuns(q: RunQuery): Promise<Page<RunDTO>> {
  const where: WhereOptions[] = []
  if (q.status) where.push({ status: q.status })
  if (q.instrumentId) where.push({ instrumentId: q.instrumentId })
  if (q.technicianId) where.push({ technicianId: q.technicianId })
  if (q.q) {
    const ids = (await Instrument.findAll({ ...new ListFilter().text('Instrument', ['serial'], q.q).options(), attributes: ['id'], limit: 5000 })).map(i => i.id)
    where.push({ instrumentId: { [Op.in]: ids } })
  }
  const { rows, count } = await CalibrationRun.findAndCountAll({
    where: { [Op.and]: where },
    order: [[q.sort, q.dir.toUpperCase()], ['id', q.dir.toUpperCase()]],
    limit: q.pageSize,
    offset: (q.page - 1) * q.pageSize,
  })
  const names = await namesFor(rows)
  return { rows: rows.map(r => runDTO(r, names(r))), total: count, page: q.page, pageSize: q.pageSize }
}

export async function runSummary(id: number): Promise<RunDTO> {
  const run = await CalibrationRun.findByPk(id)
  if (!run) notFound('run')
  return runDTO(run, (await namesFor([run]))(run))
}

/** Points of runs with their equipment's asset tags. */
export async function pointDTOs(points: RunPoint[]): Promise<RunPointDTO[]> {
  const sIds = [...new Set(points.map(p => p.sourceId))]
  const rIds = [...new Set(points.map(p => p.referenceInstrumentId).filter((v): v is number => !!v))]
  const [sources, refs] = await Promise.all([
    sIds.length ? BlackbodySource.findAll({ where: { id: sIds }, attributes: ['id', 'assetTag'] }) : [],
    rIds.length ? ReferenceInstrument.findAll({ where: { id: rIds }, attributes: ['id', 'assetTag'] }) : [],
  ])
  const s = new Map(sources.map(x => [x.id, x.assetTag]))
  const r = new Map(refs.map(x => [x.id, x.assetTag]))
  return points.map(p => runPointDTO(p, { source: s.get(p.sourceId) ?? null, reference: p.referenceInstrumentId ? r.get(p.referenceInstrumentId) ?? null : null }))
}

/** GET /api/runs/[id]: header, instrument, procedure version, points with results, revisions and audit. */
export async function runDetail(id: number): Promise<RunDetailDTO> {
  const run = await CalibrationRun.findByPk(id)
  if (!run) notFound('run')
  const ctx = await loadRunContext(undefined, run.instrumentId, run.procedureVersionId)
  const names = (await namesFor([run]))(run)
  const points = await RunPoint.findAll({ where: { runId: id }, order: [['seq', 'ASC']] })
  const revisions = await RunRevision.findAll({ where: { runId: id }, order: [['at', 'ASC'], ['id', 'ASC']] })
  const pointIds = points.map(p => p.id)
  const auditRows = await AuditEvent.findAll({
    where: { [Op.or]: [{ entity: 'CalibrationRun', entityId: id }, ...(pointIds.length ? [{ entity: 'RunPoint', entityId: pointIds }] : [])] },
    order: [['at', 'ASC'], ['id', 'ASC']],
    limit: 2000,
  })
  const userIds = [...new Set([...revisions.map(r => r.userId), ...auditRows.map(a => a.userId), ctx.procedureVersion.createdBy].filter((v): v is number => !!v))]
  const users = userIds.length ? await User.findAll({ where: { id: userIds }, attributes: ['id', 'name'] }) : []
  const userName = new Map(users.map(u => [u.id, u.name]))
  const audit: AuditEventDTO[] = auditRows.map(a => auditDTO(a, a.userId ? userName.get(a.userId) ?? null : null))
  return {
    ...runDTO(run, names),
    instrument: instrumentSummary(ctx.instrument, ctx.band, ctx.table, names.organizationName ?? null),
    procedureVersion: procedureVersionDTO(ctx.procedureVersion, ctx.procedureVersion.createdBy ? userName.get(ctx.procedureVersion.createdBy) ?? null : null),
    points: await pointDTOs(points),
    revisions: revisions.map(r => runRevisionDTO(r, userName.get(r.userId) ?? null)),
    audit,
  }
}

// ---------------------------------------------------------------- the routes' operations (one transaction each)

/** Start a draft run; the run as the run page shows it. */
export async function createRun(actor: Actor, input: RunCreateInput): Promise<RunDetailDTO> {
  const run = await inTransaction(t => createRunIn(t, actor, input))
  return runDetail(run.id)
}

export async function updateRun(actor: Actor, id: number, input: RunUpdateInput): Promise<RunDetailDTO> {
  await inTransaction(t => updateRunIn(t, actor, id, input))
  return runDetail(id)
}

export async function addPoint(actor: Actor, runId: number, input: PointCreateInput): Promise<RunPointDTO> {
  const point = await inTransaction(t => addPointIn(t, actor, runId, input))
  return (await pointDTOs([point]))[0]!
}

export async function updatePoint(actor: Actor, runId: number, pointId: number, input: PointUpdateInput): Promise<RunPointDTO> {
  const point = await inTransaction(t => updatePointIn(t, actor, runId, pointId, input))
  return (await pointDTOs([point]))[0]!
}

export async function importPoints(actor: Actor, runId: number, input: PointImportInput): Promise<RunImportPreview | { created: number }> {
  return inTransaction(t => importPointsIn(t, actor, runId, input))
}

export async function submitRun(actor: Actor, id: number, input: RunActionInput): Promise<RunDetailDTO> {
  await inTransaction(t => submitRunIn(t, actor, id, input))
  return runDetail(id)
}

export async function approveRun(actor: Actor, id: number, input: RunActionInput): Promise<RunDetailDTO> {
  await inTransaction(t => approveRunIn(t, actor, id, input))
  return runDetail(id)
}

export async function returnRun(actor: Actor, id: number, input: RunReturnInput): Promise<RunDetailDTO> {
  await inTransaction(t => returnRunIn(t, actor, id, input))
  return runDetail(id)
}
