/**
 * Calibration procedures: create, edit (each edit writes a new ProcedureVersion and leaves the
 * earlier ones as they were, so a run keeps the version it used), list and detail.
 */
import type { Transaction } from 'sequelize'
import type { ProcedureCreateInput, ProcedureUpdateInput } from '#shared/schemas/procedure'
import type { ProcedureDTO, ProcedureDetailDTO, ProcedureVersionDTO, TemplateComponent } from '#shared/types'
import { Procedure } from '#server/models/Procedure'
import { ProcedureVersion } from '#server/models/ProcedureVersion'
import { User } from '#server/models/User'
import { correlationProblems } from '#shared/schemas/procedure'
import { fieldName } from '#shared/schemas/errors'
import { notFound, assertVersion, invalidInput } from '#server/utils/errors'
import { recordAudit, snapshot } from '#server/utils/audit'
import { auditTrail } from '#server/services/audit/trail'
import { inTransaction } from '#server/utils/transaction'

export function procedureVersionDTO(v: ProcedureVersion, userName: string | null = null): ProcedureVersionDTO {
  return {
    id: v.id,
    procedureId: v.procedureId,
    versionNumber: v.versionNumber,
    name: v.name,
    documentReference: v.documentReference,
    decisionRule: v.decisionRule,
    guardBandFactor: v.guardBandFactor ?? null,
    template: v.template ?? [],
    correlations: v.correlations ?? [],
    budgetFromEquipment: !!v.budgetFromEquipment,
    spotMargin: v.spotMargin ?? null,
    cmc: v.cmc ?? [],
    applicability: v.applicability ?? null,
    changeNote: v.changeNote ?? null,
    createdBy: v.createdBy ?? null,
    createdByName: userName,
    createdAt: v.createdAt.toISOString(),
  }
}

export function procedureDTO(p: Procedure, current: ProcedureVersionDTO): ProcedureDTO {
  return {
    id: p.id,
    name: p.name,
    documentReference: p.documentReference,
    archived: !!p.archived,
    version: p.version,
    currentVersion: current,
    createdAt: p.createdAt.toISOString(),
    updatedAt: p.updatedAt.toISOString(),
  }
}

async function userNames(ids: (number | null)[], transaction?: Transaction): Promise<Map<number, string>> {
  const wanted = [...new Set(ids.filter((v): v is number => v !== null))]
  const users = wanted.length ? await User.findAll({ where: { id: wanted }, attributes: ['id', 'name'], transaction }) : []
  return new Map(users.map(u => [u.id, u.name]))
}

/** A template as stored: every optional field explicit. */
function normalizeTemplate(template: ProcedureCreateInput['template']): TemplateComponent[] {
  return template.map(c => ({ ...c, coverageFactor: c.coverageFactor ?? null, dof: c.dof ?? null }))
}

/** Create a procedure and its version 1 (in the caller's transaction). */
export async function createProcedureIn(t: Transaction, userId: number | null, input: ProcedureCreateInput, auditAction = 'create'): Promise<Procedure> {
  const p = await Procedure.create({ name: input.name, documentReference: input.documentReference, currentVersionId: null }, { transaction: t })
  const v = await ProcedureVersion.create({
    procedureId: p.id,
    versionNumber: 1,
    name: input.name,
    documentReference: input.documentReference,
    decisionRule: input.decisionRule,
    guardBandFactor: input.decisionRule === 'simple-acceptance' ? null : (input.guardBandFactor ?? 1),
    template: normalizeTemplate(input.template),
    correlations: input.correlations,
    budgetFromEquipment: input.budgetFromEquipment,
    spotMargin: input.spotMargin ?? null,
    cmc: input.cmc,
    applicability: input.applicability,
    changeNote: input.changeNote ?? null,
    createdBy: userId,
  }, { transaction: t })
  // Setting the pointer is part of creating the record, not an edit: no version bump.
  await Procedure.update({ currentVersionId: v.id }, { where: { id: p.id }, transaction: t, silent: true })
  p.currentVersionId = v.id
  await recordAudit(t, { userId, action: auditAction, entity: 'Procedure', entityId: p.id, after: { ...snapshot(p), currentVersion: snapshot(v) } })
  return p
}

/** Edit a procedure: a new version with the merged content; 409 when `version` is stale. */
export async function updateProcedureIn(t: Transaction, userId: number, id: number, input: ProcedureUpdateInput): Promise<Procedure> {
  const p = await Procedure.findByPk(id, { transaction: t })
  if (!p) notFound('procedure')
  assertVersion(p.version, input.version)
  const current = await ProcedureVersion.findByPk(p.currentVersionId!, { transaction: t })
  if (!current) notFound('procedure version')
  const rule = input.decisionRule ?? current.decisionRule
  const r = input.guardBandFactor !== undefined ? input.guardBandFactor : current.guardBandFactor
  const template = input.template ? normalizeTemplate(input.template) : current.template
  const correlations = input.correlations ?? current.correlations ?? []
  const problems = correlationProblems(correlations, template.length)
  if (problems.length) invalidInput(Object.fromEntries(problems.map(p => [fieldName(['correlations', ...p.path]), input.correlations ? p.message : `${p.message} (the correlations of the current version no longer fit the new template: state them again)`])))
  const next = await ProcedureVersion.create({
    procedureId: p.id,
    versionNumber: current.versionNumber + 1,
    name: input.name ?? current.name,
    documentReference: input.documentReference ?? current.documentReference,
    decisionRule: rule,
    guardBandFactor: rule === 'simple-acceptance' ? null : (r ?? 1),
    template,
    correlations,
    budgetFromEquipment: input.budgetFromEquipment ?? !!current.budgetFromEquipment,
    spotMargin: input.spotMargin !== undefined ? input.spotMargin : current.spotMargin ?? null,
    cmc: input.cmc ?? current.cmc,
    applicability: input.applicability ?? current.applicability,
    changeNote: input.changeNote ?? null,
    createdBy: userId,
  }, { transaction: t })
  const before = { ...snapshot(p), currentVersion: snapshot(current) }
  p.set({ name: next.name, documentReference: next.documentReference, currentVersionId: next.id })
  p.changed('updatedAt', true)
  await p.save({ transaction: t })
  await recordAudit(t, { userId, action: 'update', entity: 'Procedure', entityId: p.id, before, after: { ...snapshot(p), currentVersion: snapshot(next) } })
  return p
}

/** Procedures with their current versions, by name. */
export async function listProcedures(): Promise<ProcedureDTO[]> {
  const rows = await Procedure.findAll({ order: [['name', 'ASC']], limit: 1000 })
  const versions = await ProcedureVersion.findAll({ where: { id: rows.map(r => r.currentVersionId!).filter(Boolean) } })
  const names = await userNames(versions.map(v => v.createdBy))
  const byId = new Map(versions.map(v => [v.id, v]))
  return rows.flatMap((p) => {
    const v = byId.get(p.currentVersionId!)
    return v ? [procedureDTO(p, procedureVersionDTO(v, v.createdBy ? names.get(v.createdBy) ?? null : null))] : []
  })
}

export async function procedureOut(p: Procedure, transaction?: Transaction): Promise<ProcedureDTO> {
  const v = await ProcedureVersion.findByPk(p.currentVersionId!, { transaction })
  if (!v) notFound('procedure version')
  const names = await userNames([v.createdBy], transaction)
  return procedureDTO(p, procedureVersionDTO(v, v.createdBy ? names.get(v.createdBy) ?? null : null))
}

/** One procedure with every version (newest first) and its audit trail. */
export async function procedureDetail(id: number): Promise<ProcedureDetailDTO> {
  const p = await Procedure.findByPk(id)
  if (!p) notFound('procedure')
  const versions = await ProcedureVersion.findAll({ where: { procedureId: id }, order: [['versionNumber', 'DESC']] })
  const names = await userNames(versions.map(v => v.createdBy))
  const dtos = versions.map(v => procedureVersionDTO(v, v.createdBy ? names.get(v.createdBy) ?? null : null))
  const current = dtos.find(v => v.id === p.currentVersionId) ?? dtos[0]!
  return { ...procedureDTO(p, current), versions: dtos, audit: await auditTrail('Procedure', id) }
}

// ---------------------------------------------------------------- the routes' operations (one transaction each)

export async function createProcedure(actor: { id: number }, input: ProcedureCreateInput): Promise<ProcedureDTO> {
  return procedureOut(await inTransaction(t => createProcedureIn(t, actor.id, input)))
}

export async function updateProcedure(actor: { id: number }, id: number, input: ProcedureUpdateInput): Promise<ProcedureDetailDTO> {
  await inTransaction(t => updateProcedureIn(t, actor.id, id, input))
  return procedureDetail(id)
}
