/**
 * A run's header and its life: draft → submitted → approved, or → returned → submitted again; a
 * draft (or returned) run can be voided with a reason. A submitted run is frozen for everyone —
 * the reviewer returns it or approves it, nothing else; approved runs are locked. After the first
 * submission every change needs a reason and leaves a RunRevision (ISO/IEC 17025 7.5.2). Every
 * change of data bumps the run's version, which an approval must name, and records who made it:
 * nobody approves data they entered or changed.
 *
 * The functions named `…In` work inside the caller's transaction (routes go through the
 * operations in ./runs.ts; the demo seed passes its own); every change writes its audit row there.
 */
import { createError } from 'h3'
import type { Transaction } from 'sequelize'
import { CONDITION_FIELDS, computationConditionsFor, conditionFieldsFor, RUN_CONDITION_LABELS } from '#shared/calibration/constants'
import { isImagerKind, isRatioKind } from '#shared/registers/constants'
import { computePoint } from '#shared/calibration/compute'
import type { RunActionInput, RunCreateInput, RunReturnInput, RunUpdateInput, VoidInput } from '#shared/schemas/run'
import { CalibrationRun } from '#server/models/CalibrationRun'
import { Instrument } from '#server/models/Instrument'
import { ReferenceInstrument } from '#server/models/ReferenceInstrument'
import { RunPoint } from '#server/models/RunPoint'
import { RunRevision } from '#server/models/RunRevision'
import { recordAudit, snapshot, updateAudited } from '#server/utils/audit'
import { assertVersion, conflict, engine, invalidInput, notFound } from '#server/utils/errors'
import { assertUsableOn } from '#server/services/equipment/usability'
import { Equipment, computationInput, equationKindProblem, fitProblem, loadRunContext, observationOf, pointColumns, pointRecord, refusal, runEquation } from './context'

/** Who makes a change (the signed-in user, or a demo account in the seed). */
export interface Actor {
  id: number
}

/** Header fields whose change alters the computed points. */
/** Header fields the points' results depend on (the reading model's inputs, the procedure, the equipment's date; the spot check's distance and spot). */
const RECOMPUTE_KEYS = ['emissivitySetting', 'reflectedTemperatureK', 'instrumentTemperatureK', 'procedureVersionId', 'calibrationDate', 'distanceMm', 'spotDiameterMm', 'emissivityRatioSetting'] as const
const HEADER_KEYS = ['calibrationDate', ...CONDITION_FIELDS, 'spotDiameterMm', 'ambientInstrumentId', 'adjusted', 'internalNotes', 'certificateRemarks', 'methodDeviations', 'placeOfCalibration', 'siteAddress', 'procedureVersionId', 'emissivityRatioSetting', 'imagerSettings', 'calibrationEquation'] as const

export const LOCKED_MESSAGE = 'approved runs cannot change'
export const FROZEN_MESSAGE = 'the run is under review: nothing in it can change until the reviewer returns it'

/**
 * The run, locked until the transaction ends (SELECT … FOR UPDATE on PostgreSQL; SQLite's
 * transactions already exclude each other): every change to a run's data moves the run's version
 * on, so concurrent changes on any server instance take their turn instead of failing as stale.
 */
export async function findRun(t: Transaction, id: number): Promise<CalibrationRun> {
  const run = await CalibrationRun.findByPk(id, { transaction: t, lock: t.LOCK.UPDATE })
  if (!run) notFound('run')
  return run
}

/** 409 for an approved run: it is locked (certificates build on it). */
export function assertNotLocked(run: CalibrationRun): void {
  if (run.status === 'approved') conflict(LOCKED_MESSAGE)
  if (run.status === 'void') conflict('the run is void')
}

/** 409 unless the run's data may change now: a draft or a returned run. Frozen under review, for every role. */
export function assertEditable(run: CalibrationRun): void {
  assertNotLocked(run)
  if (run.status === 'submitted') conflict(FROZEN_MESSAGE)
}

/**
 * 409 before the body is even read when a run's data cannot change now (under review, approved,
 * void): the answer to a write on a frozen run does not depend on what was sent. The service
 * checks again inside its transaction.
 */
export async function assertRunOpen(id: number): Promise<void> {
  const run = await CalibrationRun.findByPk(id, { attributes: ['id', 'status'] })
  if (!run) notFound('run')
  assertEditable(run)
}

/**
 * After the first submission — and from the start on a revision that corrects an issued
 * certificate — every change needs a reason (400 naming `reason`); before it none is kept.
 */
export function requireReason(run: CalibrationRun, reason: string | undefined): string | null {
  if (!run.submittedAt && !run.revisionOf) return null
  if (!reason) invalidInput({ reason: 'Give the reason for this change: the run has been submitted before, so every amendment is recorded with its reason' })
  return reason
}

/** A change of the run's data: the actor joins those who changed it, and the run's version moves on. */
export async function markChanged(t: Transaction, run: CalibrationRun, actor: Actor): Promise<void> {
  const ids = run.contributorIds ?? []
  if (!ids.includes(actor.id)) run.contributorIds = [...ids, actor.id]
  run.changed('updatedAt', true)
  await run.save({ transaction: t })
}

/**
 * What only some kinds of instrument record in a run (400 naming the field otherwise): the ratio setting
 * (ratio pyrometers), the imager's settings (thermal imagers), a calibration equation (spot and reference
 * pyrometers).
 */
function assertKindFields(instrument: Instrument, v: { emissivityRatioSetting?: number | null, imagerSettings?: unknown, calibrationEquation?: unknown }): void {
  if (v.emissivityRatioSetting != null && !isRatioKind(instrument.kind)) invalidInput({ emissivityRatioSetting: 'Only a ratio pyrometer has an emissivity-ratio setting' })
  if (v.imagerSettings != null && !isImagerKind(instrument.kind)) invalidInput({ imagerSettings: 'Only a thermal imager\'s run records lens, field of view, range setting and NUC' })
  if (v.calibrationEquation != null) {
    const problem = equationKindProblem(instrument)
    if (problem) invalidInput({ calibrationEquation: problem })
  }
}

async function assertAmbientInstrument(t: Transaction, id: number | null | undefined, date: string): Promise<void> {
  if (id == null) return
  const r = await ReferenceInstrument.findByPk(id, { transaction: t })
  if (!r) invalidInput({ ambientInstrumentId: 'No reference instrument with this id' })
  const reason = await assertUsableOn(r, date, t)
  if (reason) invalidInput({ ambientInstrumentId: refusal(r.assetTag, date, reason) })
}

// ---------------------------------------------------------------- header

/**
 * Create a draft run; the technician is the actor unless `from` names the request it was opened
 * from and the technician it is assigned to. A run opened from a request holds only the agreed
 * terms, so nobody has entered its data yet (no contributors): whoever accepted the request may
 * still review it.
 */
export async function createRunIn(t: Transaction, actor: Actor, input: RunCreateInput, auditAction = 'create', from: { requestId: number, technicianId: number } | null = null): Promise<CalibrationRun> {
  const instrument = await Instrument.findByPk(input.instrumentId, { transaction: t })
  if (!instrument || instrument.archived) invalidInput({ instrumentId: 'No instrument with this id' })
  if (instrument.status === 'retired') invalidInput({ instrumentId: 'The instrument is retired' })
  await loadRunContext(t, instrument.id, input.procedureVersionId)
  assertKindFields(instrument, input)
  await assertAmbientInstrument(t, input.ambientInstrumentId, input.calibrationDate)
  const run = await CalibrationRun.create({
    ...input,
    receivedDate: null,
    technicianId: from?.technicianId ?? actor.id,
    status: 'draft',
    submittedAt: null,
    reviewerId: null,
    reviewedAt: null,
    reviewComments: null,
    requestId: from?.requestId ?? null,
    voidedAt: null,
    voidedBy: null,
    voidReason: null,
    revisionOf: null,
    revisionReason: null,
    contributorIds: from ? [] : [actor.id],
    lastReviewedVersion: null,
  }, { transaction: t })
  await recordAudit(t, { userId: actor.id, action: auditAction, entity: 'CalibrationRun', entityId: run.id, after: snapshot(run) })
  return run
}

function header(run: CalibrationRun): Record<string, unknown> {
  return Object.fromEntries(HEADER_KEYS.map(k => [k, run.get(k)]))
}

/**
 * Recompute (and store) every point of a run after a header change (voided points stay as they
 * were); 400 on `calibrationDate` when equipment is no longer usable.
 */
/**
 * Recompute every point of a run after a header change its results depend on; each point must still fit
 * (source emissivity in the band, spot against aperture): a refusal names the header field that changed.
 */
async function recomputePoints(t: Transaction, actor: Actor, run: CalibrationRun, changed: readonly string[]): Promise<number> {
  const recheckEquipment = changed.includes('calibrationDate')
  const blame = (['distanceMm', 'spotDiameterMm', 'procedureVersionId', 'calibrationDate'] as const).find(k => changed.includes(k))
  const points = await RunPoint.findAll({ where: { runId: run.id, voidedAt: null }, order: [['seq', 'ASC']], transaction: t })
  if (!points.length) return 0
  const ctx = await loadRunContext(t, run.instrumentId, run.procedureVersionId, run.requestId)
  const missing = computationConditionsFor(ctx.ratio).filter(f => run.get(f) == null)
  if (missing.length) invalidInput(Object.fromEntries(missing.map(f => [f, 'The run has points: this measured condition cannot be removed'])))
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
    const problem = fitProblem(run, ctx, s.row!, obs)
    if (problem) invalidInput({ [blame ?? problem.field]: `Point ${p.seq}: ${problem.message}` })
    const used = await eq.used(obs)
    const result = engine(() => computePoint(computationInput(run, ctx, obs, s.row!, used)))
    const before = pointRecord(p)
    p.set({ ...pointColumns(obs, result), monteCarlo: null })
    await p.save({ transaction: t })
    changes.push({ pointId: p.id, before, after: pointRecord(p) })
  }
  // One audit row for the recomputation of the whole run (the points' stored results changed with the header).
  await recordAudit(t, { userId: actor.id, action: 'recompute-points', entity: 'CalibrationRun', entityId: run.id, before: changes.map(c => ({ pointId: c.pointId, ...c.before })), after: changes.map(c => ({ pointId: c.pointId, ...c.after })) })
  return changes.length
}

/** Edit the run header (409 when stale, under review or approved; a reason once submitted); points are recomputed when their inputs change. */
export async function updateRunIn(t: Transaction, actor: Actor, id: number, input: RunUpdateInput): Promise<CalibrationRun> {
  const run = await findRun(t, id)
  assertEditable(run)
  assertVersion(run.version, input.version)
  const reason = requireReason(run, input.reason)
  const { version: _v, reason: _r, ...changes } = input
  if (changes.calibrationDate && run.receivedDate && changes.calibrationDate < run.receivedDate) {
    invalidInput({ calibrationDate: `The calibration date cannot be before the item was received (${run.receivedDate})` })
  }
  if (changes.adjusted === false && run.adjusted) {
    const asLeft = await RunPoint.count({ where: { runId: run.id, stage: 'as-left', voidedAt: null }, transaction: t })
    if (asLeft) invalidInput({ adjusted: `The run has ${asLeft} as-left point(s); change them to as found or void them first` })
  }
  if (changes.procedureVersionId !== undefined) await loadRunContext(t, run.instrumentId, changes.procedureVersionId)
  const instrument = await Instrument.findByPk(run.instrumentId, { transaction: t })
  if (instrument) assertKindFields(instrument, changes)
  if (changes.ambientInstrumentId !== undefined) await assertAmbientInstrument(t, changes.ambientInstrumentId, changes.calibrationDate ?? run.calibrationDate)
  const before = header(run)
  const full = snapshot(run)
  run.set(changes)
  if (run.placeOfCalibration === 'on-site' && !run.siteAddress) invalidInput({ siteAddress: 'Give the address of the site' })
  const keys = (run.changed() || []) as string[]
  if (!keys.length) return run
  if (!run.contributorIds.includes(actor.id)) run.contributorIds = [...run.contributorIds, actor.id]
  await run.save({ transaction: t })
  if (keys.some(k => (RECOMPUTE_KEYS as readonly string[]).includes(k))) await recomputePoints(t, actor, run, keys)
  const after = header(run)
  const pick = (o: Record<string, unknown>) => Object.fromEntries(keys.filter(k => k in o).map(k => [k, o[k]]))
  if (reason) await RunRevision.create({ runId: run.id, pointId: null, userId: actor.id, at: new Date(), reason, before: pick(before), after: pick(after) }, { transaction: t })
  await recordAudit(t, { userId: actor.id, action: 'update', entity: 'CalibrationRun', entityId: run.id, before: full, after: { ...snapshot(run), reason } })
  return run
}

/** Void a draft or returned run with the reason: kept, audited, never certified. */
export async function voidRunIn(t: Transaction, actor: Actor, id: number, input: VoidInput): Promise<CalibrationRun> {
  const run = await findRun(t, id)
  assertEditable(run)
  assertVersion(run.version, input.version)
  await updateAudited(t, actor, run, { status: 'void', voidedAt: new Date(), voidedBy: actor.id, voidReason: input.reason }, { entity: 'CalibrationRun', action: 'void' })
  return run
}

// ---------------------------------------------------------------- workflow

/** Label of a thermal imager's settings when they are still to be entered. */
export const IMAGER_SETTINGS_LABEL = 'Imager settings (lens, field of view, range setting, non-uniformity correction)'

/**
 * The measured conditions still to be entered, for the run's kind of instrument: a ratio pyrometer's
 * ratio setting instead of the emissivity setting and the instrument temperature; a thermal imager's
 * settings besides the conditions.
 */
export function missingConditions(run: CalibrationRun, instrument?: Pick<Instrument, 'kind'> | null): { field: string, label: string }[] {
  const kind = instrument?.kind ?? ''
  const out = conditionFieldsFor(isRatioKind(kind)).filter(f => run.get(f) === null || run.get(f) === undefined).map(f => ({ field: f as string, label: RUN_CONDITION_LABELS[f] }))
  if (isImagerKind(kind) && !run.imagerSettings) out.push({ field: 'imagerSettings', label: IMAGER_SETTINGS_LABEL })
  return out
}

/**
 * draft or returned → submitted: every measured condition entered, at least one point (not
 * voided); an adjusted run needs as-found and as-left points. (The receipt of the item is needed
 * for the certificate, not for the technical review.)
 */
export async function submitRunIn(t: Transaction, actor: Actor, id: number, input: RunActionInput, auditAction = 'submit'): Promise<CalibrationRun> {
  const run = await findRun(t, id)
  assertNotLocked(run)
  assertVersion(run.version, input.version)
  if (run.status === 'submitted') conflict('The run is already submitted')
  const instrument = await Instrument.findByPk(run.instrumentId, { transaction: t })
  const missing = missingConditions(run, instrument)
  if (missing.length) invalidInput(Object.fromEntries(missing.map(m => [m.field, `Enter the ${m.label.toLowerCase()} measured for this run before submitting it`])))
  if (run.placeOfCalibration === 'on-site' && !run.siteAddress) invalidInput({ siteAddress: 'Give the address of the site' })
  const stages = new Set((await RunPoint.findAll({ where: { runId: id, voidedAt: null }, attributes: ['stage'], transaction: t })).map(p => p.stage))
  if (!stages.size) invalidInput({ points: 'Add at least one point before submitting' })
  if (run.adjusted && !(stages.has('as-found') && stages.has('as-left'))) {
    invalidInput({ points: 'An adjusted run needs both as-found and as-left points before it is submitted' })
  }
  if (run.calibrationEquation) {
    // the equation the certificate will state must exist: enough as-left points, every table temperature inside their range
    const ctx = await loadRunContext(t, run.instrumentId, run.procedureVersionId, run.requestId)
    const points = await RunPoint.findAll({ where: { runId: id, voidedAt: null }, order: [['seq', 'ASC']], transaction: t })
    const eq = runEquation(run, ctx, points)
    if (eq?.problem) invalidInput({ [eq.problem.field]: eq.problem.message })
  }
  await updateAudited(t, actor, run, { status: 'submitted', submittedAt: new Date() }, { entity: 'CalibrationRun', action: auditAction })
  return run
}

/**
 * submitted → approved, at the version the reviewer saw, by someone who neither performed the run
 * nor entered or changed any of its data (403 otherwise).
 */
export async function approveRunIn(t: Transaction, actor: Actor, id: number, input: RunActionInput, auditAction = 'approve'): Promise<CalibrationRun> {
  const run = await findRun(t, id)
  assertNotLocked(run)
  assertVersion(run.version, input.version)
  if (run.status !== 'submitted') conflict('Only a submitted run can be approved')
  if (run.technicianId === actor.id || (run.contributorIds ?? []).includes(actor.id)) {
    throw createError({ statusCode: 403, statusMessage: 'Forbidden', message: 'You performed this run or entered or changed its data: another quality manager must review and approve it' })
  }
  await updateAudited(t, actor, run, { status: 'approved', reviewerId: actor.id, reviewedAt: new Date(), lastReviewedVersion: run.version }, { entity: 'CalibrationRun', action: auditAction })
  return run
}

/** submitted → returned with the reviewer's comments; the run is then corrected and submitted again. */
export async function returnRunIn(t: Transaction, actor: Actor, id: number, input: RunReturnInput, auditAction = 'return'): Promise<CalibrationRun> {
  const run = await findRun(t, id)
  assertNotLocked(run)
  assertVersion(run.version, input.version)
  if (run.status !== 'submitted') conflict('Only a submitted run can be returned')
  await updateAudited(t, actor, run, { status: 'returned', reviewerId: actor.id, reviewedAt: new Date(), reviewComments: input.comments, lastReviewedVersion: run.version }, { entity: 'CalibrationRun', action: auditAction })
  return run
}
