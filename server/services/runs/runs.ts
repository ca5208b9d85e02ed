/**
 * Calibration runs as the pages read them (list, one run with its points, receipt, agreement,
 * revisions and audit), and the routes' operations, each one transaction: the header and its
 * workflow (./workflow.ts), the points (./points.ts), the receipt (./receipt.ts). Each point's
 * numbers come from the pure shared/calibration/compute.ts (./context.ts).
 */
import { Op, type WhereOptions } from 'sequelize'
import type { PointCreateInput, PointImportInput, PointUpdateInput, ReceiptInput, RunActionInput, RunCreateInput, RunQuery, RunReturnInput, RunUpdateInput, VoidInput } from '#shared/schemas/run'
import type { AuditEventDTO, Page, RunDTO, RunDetailDTO, RunImportPreview, RunPointDTO } from '#shared/types'
import { AuditEvent } from '#server/models/AuditEvent'
import { BlackbodySource } from '#server/models/BlackbodySource'
import { CalibrationRun } from '#server/models/CalibrationRun'
import { Certificate } from '#server/models/Certificate'
import { Instrument } from '#server/models/Instrument'
import { Organization } from '#server/models/Organization'
import { ProcedureVersion } from '#server/models/ProcedureVersion'
import { ReferenceInstrument } from '#server/models/ReferenceInstrument'
import { RunPoint } from '#server/models/RunPoint'
import { RunRevision } from '#server/models/RunRevision'
import { User } from '#server/models/User'
import { notFound } from '#server/utils/errors'
import { ListFilter } from '#server/utils/search'
import { inTransaction } from '#server/utils/transaction'
import { auditDTO } from '#server/services/audit/dto'
import { procedureVersionDTO } from '#server/services/procedures/procedures'
import { loadRunContext, runEquation } from './context'
import { instrumentSummary, runDTO, runPointDTO, runRevisionDTO, type RunNames } from './dto'
import { addPointIn, importPointsIn, updatePointIn, voidPointIn } from './points'
import { receiptOf, recordReceiptIn } from './receipt'
import { approveRunIn, createRunIn, missingConditions, returnRunIn, submitRunIn, updateRunIn, voidRunIn, type Actor } from './workflow'

export { addPointIn, addPointsIn, importPointsIn, updatePointIn, voidPointIn, POINT_CSV_COLUMNS } from './points'
export { recordReceiptIn } from './receipt'
export { approveRunIn, assertEditable, assertNotLocked, assertRunOpen, createRunIn, returnRunIn, submitRunIn, updateRunIn, voidRunIn, LOCKED_MESSAGE, FROZEN_MESSAGE, type Actor } from './workflow'
export { computationInput, loadRunContext } from './context'

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
    runIds.length ? RunPoint.count({ where: { runId: runIds, voidedAt: null }, group: ['runId'] }) : [],
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
  const voiders = [...new Set(points.map(p => p.voidedBy).filter((v): v is number => !!v))]
  const users = voiders.length ? await User.findAll({ where: { id: voiders }, attributes: ['id', 'name'] }) : []
  const s = new Map(sources.map(x => [x.id, x.assetTag]))
  const r = new Map(refs.map(x => [x.id, x.assetTag]))
  const u = new Map(users.map(x => [x.id, x.name]))
  return points.map(p => runPointDTO(p, { source: s.get(p.sourceId) ?? null, reference: p.referenceInstrumentId ? r.get(p.referenceInstrumentId) ?? null : null, voidedBy: p.voidedBy ? u.get(p.voidedBy) ?? null : null }))
}

/**
 * GET /api/runs/[id]: header, instrument, procedure version, points with results (voided ones
 * marked), the receipt, the agreed terms, what is still to be entered, revisions (and those since
 * the last review), the certificate issued from it or corrected by it, and the audit trail.
 */
export async function runDetail(id: number): Promise<RunDetailDTO> {
  const run = await CalibrationRun.findByPk(id)
  if (!run) notFound('run')
  const ctx = await loadRunContext(undefined, run.instrumentId, run.procedureVersionId, run.requestId)
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
  const seqOf = new Map(points.map(p => [p.id, p.seq]))
  const revisionDTOs = revisions.map(r => runRevisionDTO(r, userName.get(r.userId) ?? null, r.pointId ? seqOf.get(r.pointId) ?? null : null))
  // What the reviewer has not seen: revisions after the last review (a return), while the run is back for review.
  const since = run.lastReviewedVersion !== null && run.reviewedAt ? run.reviewedAt.getTime() : null
  const [certificate, corrected] = await Promise.all([
    Certificate.findOne({ where: { runId: id }, attributes: ['id', 'number', 'status'], order: [['id', 'DESC']] }),
    run.revisionOf ? Certificate.findOne({ where: { runId: run.revisionOf }, attributes: ['id', 'number'], order: [['id', 'DESC']] }) : null,
  ])
  return {
    ...runDTO(run, names),
    instrument: instrumentSummary(ctx.instrument, ctx.band, ctx.table, names.organizationName ?? null, { band: ctx.band2, table: ctx.table2 }),
    procedureVersion: procedureVersionDTO(ctx.procedureVersion, ctx.procedureVersion.createdBy ? userName.get(ctx.procedureVersion.createdBy) ?? null : null),
    points: await pointDTOs(points),
    revisions: revisionDTOs,
    audit,
    receipt: await receiptOf(id),
    agreement: ctx.agreement,
    missingConditions: missingConditions(run, ctx.instrument),
    changesSinceReview: since === null ? [] : revisionDTOs.filter(r => new Date(r.at).getTime() > since),
    certificate: certificate ? { id: certificate.id, number: certificate.number, status: certificate.status } : null,
    corrects: corrected ? { id: corrected.id, number: corrected.number } : null,
    equation: runEquation(run, ctx, points),
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

export async function voidRun(actor: Actor, id: number, input: VoidInput): Promise<RunDetailDTO> {
  await inTransaction(t => voidRunIn(t, actor, id, input))
  return runDetail(id)
}

export async function recordReceipt(actor: Actor, id: number, input: ReceiptInput): Promise<RunDetailDTO> {
  await inTransaction(t => recordReceiptIn(t, actor, id, input))
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

export async function voidPoint(actor: Actor, runId: number, pointId: number, input: VoidInput): Promise<RunPointDTO> {
  const point = await inTransaction(t => voidPointIn(t, actor, runId, pointId, input))
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

