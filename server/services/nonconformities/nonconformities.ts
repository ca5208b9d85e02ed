/**
 * Nonconforming work (ISO/IEC 17025:2017 7.10). A nonconformity is raised by hand, or by the events
 * that raise one by themselves (./raise.ts is their one entry): a failed intermediate check, an
 * unsatisfactory proficiency result, a reference found out of tolerance at its calibration. It
 * carries the affected work (the impact list of its item over its period, with the effect at each
 * point), the withhold switch (./withhold.ts blocks issuing), a decision per affected certificate —
 * keep with the reason, amend (the existing reopening: a revision run, whose certificate will be
 * the amendment) or withdraw (the existing withdrawal, with the signatory's password) — the
 * customers told through the outbox, who authorised resuming work (the item back in service), and
 * its closing. Every change is audited in its transaction.
 */
import type { H3Event } from 'h3'
import { Op, type Transaction } from 'sequelize'
import { can } from '#shared/permissions'
import type { NonconformityCloseInput, NonconformityCreateInput, NonconformityDecisionInput, NonconformityNotifyInput, NonconformityQuery, NonconformityResumeInput, NonconformityUpdateInput } from '#shared/schemas/nonconformity'
import type { AffectedWorkDTO, NonconformityDTO, NonconformityDetailDTO, Page, SessionUser } from '#shared/types'
import { Certificate } from '#server/models/Certificate'
import { CorrectiveAction } from '#server/models/CorrectiveAction'
import { Nonconformity } from '#server/models/Nonconformity'
import { NonconformityDecision } from '#server/models/NonconformityDecision'
import { Organization } from '#server/models/Organization'
import type { User } from '#server/models/User'
import { createAudited, recordAudit, updateAudited } from '#server/utils/audit'
import { assertVersion, conflict, forbidden, invalidInput, notFound } from '#server/utils/errors'
import { inTransaction } from '#server/utils/transaction'
import { auditTrail } from '#server/services/audit/trail'
import { reopenCertificateIn, verifySigningPassword, withdrawCertificateIn } from '#server/services/certificates/issue'
import { correctiveActionDTOs } from '#server/services/correctiveActions/correctiveActions'
import { affectedWork } from '#server/services/impact/impact'
import { notifyNonconformity } from '#server/services/mail/events'
import { equipmentTags, findEquipment, iso, userNames } from '#server/services/quality/records'
import { raiseNonconformityIn } from './raise'
import { readTogether } from '#server/utils/db'

export async function nonconformityDTOs(rows: Nonconformity[], t?: Transaction): Promise<NonconformityDTO[]> {
  const [names, tags] = await readTogether(t, [
    () => userNames(rows.flatMap(r => [r.raisedBy, r.resumedBy, r.closedBy]), t),
    () => equipmentTags(rows.map(r => ({ type: r.equipmentType, id: r.equipmentId })), t),
  ])
  return rows.map(r => ({
    id: r.id,
    number: r.number,
    raisedOn: r.raisedOn,
    raisedBy: r.raisedBy ?? null,
    raisedByName: r.raisedBy ? names.get(r.raisedBy) ?? null : null,
    origin: r.origin,
    originId: r.originId ?? null,
    title: r.title,
    description: r.description,
    risk: r.risk,
    withhold: !!r.withhold,
    equipmentType: r.equipmentType ?? null,
    equipmentId: r.equipmentId ?? null,
    equipmentTag: r.equipmentType && r.equipmentId ? tags.get(`${r.equipmentType}:${r.equipmentId}`) ?? null : null,
    affectedFrom: r.affectedFrom ?? null,
    affectedTo: r.affectedTo ?? null,
    referenceCorrections: r.referenceCorrections ?? null,
    status: r.status,
    notifications: r.notifications ?? [],
    resumedAt: iso(r.resumedAt),
    resumedByName: r.resumedBy ? names.get(r.resumedBy) ?? null : null,
    resumeNote: r.resumeNote ?? null,
    closedAt: iso(r.closedAt),
    closedByName: r.closedBy ? names.get(r.closedBy) ?? null : null,
    closeNote: r.closeNote ?? null,
    version: r.version,
    createdAt: r.createdAt.toISOString(),
    updatedAt: r.updatedAt.toISOString(),
  }))
}

export async function listNonconformities(q: NonconformityQuery): Promise<Page<NonconformityDTO>> {
  const where: Record<string, unknown> = {}
  if (q.status) where.status = q.status
  if (q.from || q.to) where.raisedOn = { ...(q.from ? { [Op.gte]: q.from } : {}), ...(q.to ? { [Op.lte]: q.to } : {}) }
  const { rows, count } = await Nonconformity.findAndCountAll({ where, order: [['raisedOn', 'DESC'], ['id', 'DESC']], limit: q.pageSize, offset: (q.page - 1) * q.pageSize })
  return { rows: await nonconformityDTOs(rows), total: count, page: q.page, pageSize: q.pageSize }
}

/** The affected work as it stands now (null for a record with no item). */
export async function currentAffectedWork(nc: Nonconformity, t?: Transaction): Promise<AffectedWorkDTO | null> {
  if (!nc.equipmentType || !nc.equipmentId || !nc.affectedFrom || !nc.affectedTo) return null
  return affectedWork(nc.equipmentType, nc.equipmentId, nc.affectedFrom, nc.affectedTo, nc.referenceCorrections, t)
}

/**
 * Affected valid certificates still without a decision. A certificate amended on this record's
 * "amend" decision carries that decision (its run is the revision the decision opened).
 */
function undecided(affected: AffectedWorkDTO | null, decisions: NonconformityDecision[]): number[] {
  if (!affected) return []
  const decided = new Set(decisions.map(d => d.certificateId))
  const revisionRuns = new Set(decisions.map(d => d.revisionRunId).filter((v): v is number => !!v))
  return affected.certificates.filter(c => !decided.has(c.id) && !revisionRuns.has(c.runId)).map(c => c.id)
}

export async function nonconformityDetail(id: number): Promise<NonconformityDetailDTO> {
  const nc = await Nonconformity.findByPk(id)
  if (!nc) notFound('nonconformity')
  const [dto] = await nonconformityDTOs([nc])
  const decisions = await NonconformityDecision.findAll({ where: { nonconformityId: id }, order: [['decidedAt', 'ASC'], ['id', 'ASC']] })
  const [certs, names, affected, actions] = await Promise.all([
    decisions.length ? Certificate.findAll({ where: { id: decisions.map(d => d.certificateId) }, attributes: ['id', 'number'] }) : [],
    userNames(decisions.map(d => d.decidedBy)),
    currentAffectedWork(nc),
    CorrectiveAction.findAll({ where: { nonconformityId: id }, order: [['id', 'ASC']] }),
  ])
  const number = new Map(certs.map(c => [c.id, c.number]))
  return {
    ...dto!,
    affected,
    affectedWhenRaised: nc.affectedWork ?? null,
    decisions: decisions.map(d => ({
      id: d.id,
      certificateId: d.certificateId,
      certificateNumber: number.get(d.certificateId) ?? null,
      decision: d.decision,
      reason: d.reason,
      revisionRunId: d.revisionRunId ?? null,
      decidedByName: names.get(d.decidedBy) ?? null,
      decidedAt: d.decidedAt.toISOString(),
    })),
    undecidedCertificateIds: undecided(affected, decisions),
    correctiveActions: await correctiveActionDTOs(actions),
    audit: await auditTrail('Nonconformity', id),
  }
}

/** POST /api/nonconformities: raised by hand (400 naming `equipmentId` for no such item). */
export async function raiseNonconformity(user: SessionUser, input: NonconformityCreateInput): Promise<NonconformityDetailDTO> {
  const nc = await inTransaction(async (t) => {
    if (input.equipmentType && input.equipmentId && !(await findEquipment(input.equipmentType, input.equipmentId, t))) {
      invalidInput({ equipmentId: `No ${input.equipmentType === 'source' ? 'blackbody source' : 'reference instrument'} with this id` })
    }
    return raiseNonconformityIn(t, user, {
      origin: 'manual',
      originId: null,
      title: input.title,
      description: input.description,
      risk: input.risk,
      withhold: input.withhold,
      equipment: input.equipmentType && input.equipmentId ? { type: input.equipmentType, id: input.equipmentId } : null,
      affectedFrom: input.affectedFrom,
      affectedTo: input.affectedTo,
      referenceCorrections: input.referenceCorrections,
    })
  })
  return nonconformityDetail(nc.id)
}

async function openRecord(t: Transaction, id: number): Promise<Nonconformity> {
  const nc = await Nonconformity.findByPk(id, { transaction: t })
  if (!nc) notFound('nonconformity')
  if (nc.status === 'closed') conflict(`Nonconformity ${nc.number} is closed`)
  return nc
}

/** PATCH: description, risk, the withhold switch, the corrections found. */
export async function updateNonconformity(user: SessionUser, id: number, input: NonconformityUpdateInput): Promise<NonconformityDetailDTO> {
  await inTransaction(async (t) => {
    const nc = await openRecord(t, id)
    assertVersion(nc.version, input.version)
    const { version: _v, ...changes } = input
    if (changes.referenceCorrections !== undefined && !nc.equipmentId) invalidInput({ referenceCorrections: 'This nonconformity names no item: corrections belong to an item' })
    await updateAudited(t, user, nc, changes, {
      entity: 'Nonconformity',
      action: (b, a) => (b.withhold !== a.withhold ? (a.withhold ? 'withhold' : 'release') : 'update'),
    })
  })
  return nonconformityDetail(id)
}

/**
 * The decision for one affected certificate (409 once decided; 400 naming `certificateId` for one
 * it does not affect). Amending and withdrawing are the existing operations, so they need the
 * same permission they need elsewhere (403 otherwise) — withdrawal also the password again.
 */
export async function decideOnCertificate(event: H3Event, user: SessionUser, id: number, input: NonconformityDecisionInput): Promise<NonconformityDetailDTO> {
  if (input.decision === 'amend' && !can(user, 'certificate:reopen')) forbidden('Only a quality manager can reopen a certificate for amendment')
  if (input.decision === 'withdraw' && !can(user, 'certificate:sign')) forbidden('Only a quality manager can withdraw a certificate')
  let signer: User | null = null
  if (input.decision === 'withdraw') signer = await verifySigningPassword(event, user, input.password!)
  await inTransaction(async (t) => {
    const nc = await openRecord(t, id)
    const affected = await currentAffectedWork(nc, t)
    const decisions = await NonconformityDecision.findAll({ where: { nonconformityId: nc.id }, transaction: t })
    if (decisions.some(d => d.certificateId === input.certificateId)) conflict(`A decision on this certificate is already recorded in ${nc.number}`, 'certificateId')
    if (!undecided(affected, decisions).includes(input.certificateId)) {
      invalidInput({ certificateId: `Not a valid certificate among the work ${nc.number} affects` })
    }
    const reason = `${nc.number}: ${input.reason}`
    let revisionRunId: number | null = null
    if (input.decision === 'amend') revisionRunId = (await reopenCertificateIn(t, user, input.certificateId, { reason })).id
    if (input.decision === 'withdraw') await withdrawCertificateIn(t, signer!, input.certificateId, reason)
    const d = await createAudited(t, user, NonconformityDecision, {
      nonconformityId: nc.id, certificateId: input.certificateId, decision: input.decision, reason: input.reason, revisionRunId, decidedBy: user.id, decidedAt: new Date(),
    }, { entity: 'NonconformityDecision' })
    await recordAudit(t, { userId: user.id, action: 'decide', entity: 'Nonconformity', entityId: nc.id, after: { decisionId: d.id, certificateId: d.certificateId, decision: d.decision, reason: d.reason, revisionRunId } })
  })
  return nonconformityDetail(id)
}

/**
 * Tell the customers of the affected work (all of them by default, or those named), one message per
 * organization through the outbox; each notice is kept on the record. 400 naming
 * `organizationIds[i]` for a customer the record does not affect, 409 when it affects none.
 */
export async function notifyCustomers(user: SessionUser, id: number, input: NonconformityNotifyInput): Promise<NonconformityDetailDTO> {
  await inTransaction(async (t) => {
    const nc = await openRecord(t, id)
    const affected = await currentAffectedWork(nc, t)
    const decisions = await NonconformityDecision.findAll({ where: { nonconformityId: nc.id }, transaction: t })
    const decidedCerts = decisions.length ? await Certificate.findAll({ where: { id: decisions.map(d => d.certificateId) }, transaction: t }) : []
    const certs = [...(affected?.certificates ?? []).map(c => ({ organizationId: c.organizationId, number: c.number })), ...decidedCerts.map(c => ({ organizationId: c.organizationId, number: c.number }))]
    const orgs = [...new Set(certs.map(c => c.organizationId))]
    if (!orgs.length) conflict(`${nc.number} affects no customer's certificate: there is nobody to notify`, 'organizationIds')
    const chosen = input.organizationIds ?? orgs
    const stranger = chosen.findIndex(o => !orgs.includes(o))
    if (stranger >= 0) invalidInput({ [`organizationIds[${stranger}]`]: 'This customer has no certificate among the affected work' })
    const names = await userNames([user.id], t)
    const organizations = await Organization.findAll({ where: { id: chosen }, attributes: ['id', 'name'], transaction: t })
    const orgName = new Map(organizations.map(o => [o.id, o.name]))
    const notices = [...(nc.notifications ?? [])]
    for (const orgId of [...new Set(chosen)]) {
      const numbers = [...new Set(certs.filter(c => c.organizationId === orgId).map(c => c.number))]
      const queued = await notifyNonconformity(t, nc, orgId, input.message, numbers, notices.length + 1)
      notices.push({ organizationId: orgId, organizationName: orgName.get(orgId) ?? `Customer ${orgId}`, at: new Date().toISOString(), byName: names.get(user.id) ?? null, outboxMessageId: queued?.id ?? null })
    }
    await updateAudited(t, user, nc, { notifications: notices }, { entity: 'Nonconformity', action: 'notify-customers', extra: { message: input.message } })
  })
  return nonconformityDetail(id)
}

/**
 * Who authorised resuming work, and why (7.10.1 f). An item taken out of service by this record
 * goes back in service.
 */
export async function resumeWork(user: SessionUser, id: number, input: NonconformityResumeInput): Promise<NonconformityDetailDTO> {
  await inTransaction(async (t) => {
    const nc = await openRecord(t, id)
    assertVersion(nc.version, input.version)
    if (nc.resumedAt) conflict(`Resuming work was authorised on ${nc.resumedAt.toISOString().slice(0, 10)}`)
    await updateAudited(t, user, nc, { resumedAt: new Date(), resumedBy: user.id, resumeNote: input.note }, { entity: 'Nonconformity', action: 'resume-work' })
    if (nc.equipmentType && nc.equipmentId) {
      const item = await findEquipment(nc.equipmentType, nc.equipmentId, t)
      if (item && item.status === 'out-of-service' && (item.statusReason ?? '').includes(nc.number)) {
        await updateAudited(t, user, item, { status: 'in-service', statusReason: null } as never, { entity: nc.equipmentType === 'source' ? 'BlackbodySource' : 'ReferenceInstrument', action: 'back-in-service', extra: { nonconformity: nc.number, note: input.note } })
      }
    }
  })
  return nonconformityDetail(id)
}

/**
 * Close: every affected valid certificate has its decision, and work has resumed if this record
 * took an item out of service (409 otherwise). The withhold switch goes off with it.
 */
export async function closeNonconformity(user: SessionUser, id: number, input: NonconformityCloseInput): Promise<NonconformityDetailDTO> {
  await inTransaction(async (t) => {
    const nc = await openRecord(t, id)
    assertVersion(nc.version, input.version)
    const decisions = await NonconformityDecision.findAll({ where: { nonconformityId: nc.id }, transaction: t })
    const open = undecided(await currentAffectedWork(nc, t), decisions)
    if (open.length) {
      const numbers = (await Certificate.findAll({ where: { id: open }, attributes: ['number'], transaction: t })).map(c => c.number)
      conflict(`Decide on every affected certificate before closing ${nc.number}: ${numbers.join(', ')} still without a decision`, 'decisions')
    }
    if (nc.equipmentType && nc.equipmentId && !nc.resumedAt) {
      const item = await findEquipment(nc.equipmentType, nc.equipmentId, t)
      if (item && item.status === 'out-of-service' && (item.statusReason ?? '').includes(nc.number)) {
        conflict(`${item.assetTag} is out of service under ${nc.number}: record who authorised resuming work first`, 'resumedAt')
      }
    }
    await updateAudited(t, user, nc, { status: 'closed', closedAt: new Date(), closedBy: user.id, closeNote: input.note, withhold: false }, { entity: 'Nonconformity', action: 'close' })
  })
  return nonconformityDetail(id)
}
