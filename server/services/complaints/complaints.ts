/**
 * Complaints (ISO/IEC 17025:2017 7.9). A customer submits one in the portal about its own
 * organization's certificate or instrument (another organization's answers 404, as if it did not
 * exist); the laboratory records one it received otherwise. Each is acknowledged by mail through
 * the outbox. The laboratory investigates and proposes the outcome; the outcome is approved — and
 * the complaint closed, with a closing notice by mail — only by someone not involved in the work
 * complained about (403 otherwise): whoever performed, changed, reviewed or signed the runs and
 * certificates concerned, fixed in `involvedUserIds` when the complaint is received.
 */
import { Op, type Transaction } from 'sequelize'
import type { ComplaintApproveInput, ComplaintCreateInput, ComplaintInvestigationInput, ComplaintOutcomeInput, ComplaintQuery } from '#shared/schemas/complaint'
import type { ComplaintDTO, ComplaintDetailDTO, Page, SessionUser } from '#shared/types'
import { CalibrationRun } from '#server/models/CalibrationRun'
import { Certificate } from '#server/models/Certificate'
import { Complaint } from '#server/models/Complaint'
import { CorrectiveAction } from '#server/models/CorrectiveAction'
import { Instrument } from '#server/models/Instrument'
import { Nonconformity } from '#server/models/Nonconformity'
import { Organization } from '#server/models/Organization'
import { organizationScope } from '#server/utils/access'
import { createAudited, updateAudited } from '#server/utils/audit'
import { assertVersion, conflict, forbidden, invalidInput, notFound } from '#server/utils/errors'
import { inTransaction } from '#server/utils/transaction'
import { auditTrail } from '#server/services/audit/trail'
import { correctiveActionDTOs } from '#server/services/correctiveActions/correctiveActions'
import { notifyComplaintClosed, notifyComplaintReceived } from '#server/services/mail/events'
import { iso, nextRecordNumber, userNames } from '#server/services/quality/records'
import { labToday } from '#server/services/settings/today'
import { readTogether } from '#server/utils/db'

export async function complaintDTOs(rows: Complaint[], viewer: Pick<SessionUser, 'role'>, t?: Transaction): Promise<ComplaintDTO[]> {
  if (!rows.length) return []
  const lab = viewer.role !== 'customer'
  const ids = (k: 'organizationId' | 'certificateId' | 'instrumentId') => [...new Set(rows.map(r => r[k]).filter((v): v is number => !!v))]
  const [orgs, certs, instruments, names] = await readTogether(t, [
    () => ids('organizationId').length ? Organization.findAll({ where: { id: ids('organizationId') }, attributes: ['id', 'name'], transaction: t }) : [],
    () => ids('certificateId').length ? Certificate.findAll({ where: { id: ids('certificateId') }, attributes: ['id', 'number'], transaction: t }) : [],
    () => ids('instrumentId').length ? Instrument.findAll({ where: { id: ids('instrumentId') }, attributes: ['id', 'serial'], transaction: t }) : [],
    () => userNames(rows.flatMap(r => [r.submittedBy, r.investigatedBy, r.outcomeProposedBy, r.approvedBy]), t),
  ])
  const org = new Map(orgs.map(o => [o.id, o.name]))
  const cert = new Map(certs.map(c => [c.id, c.number]))
  const serial = new Map(instruments.map(i => [i.id, i.serial]))
  const name = (id: number | null) => (id ? names.get(id) ?? null : null)
  return rows.map(r => ({
    id: r.id,
    number: r.number,
    organizationId: r.organizationId ?? null,
    organizationName: r.organizationId ? org.get(r.organizationId) ?? null : null,
    certificateId: r.certificateId ?? null,
    certificateNumber: r.certificateId ? cert.get(r.certificateId) ?? null : null,
    instrumentId: r.instrumentId ?? null,
    instrumentSerial: r.instrumentId ? serial.get(r.instrumentId) ?? null : null,
    channel: r.channel,
    submittedByName: name(r.submittedBy),
    receivedOn: r.receivedOn,
    subject: r.subject,
    description: r.description,
    status: r.status,
    acknowledgedAt: iso(r.acknowledgedAt),
    outcome: lab || r.status === 'closed' ? r.outcome ?? null : null,
    closedAt: iso(r.closedAt),
    investigation: lab ? r.investigation ?? null : null,
    investigatedByName: lab ? name(r.investigatedBy) : null,
    outcomeProposedByName: lab ? name(r.outcomeProposedBy) : null,
    approvedByName: lab ? name(r.approvedBy) : null,
    approvedAt: lab ? iso(r.approvedAt) : null,
    involvedUserIds: lab ? r.involvedUserIds ?? [] : null,
    nonconformityId: lab ? r.nonconformityId ?? null : null,
    version: r.version,
    createdAt: r.createdAt.toISOString(),
    updatedAt: r.updatedAt.toISOString(),
  }))
}

export async function listComplaints(user: SessionUser, q: ComplaintQuery): Promise<Page<ComplaintDTO>> {
  const where: Record<string, unknown> = { ...organizationScope(user) as Record<string, unknown> }
  if (q.status) where.status = q.status
  if (q.open === 'true') where.status = { [Op.ne]: 'closed' }
  if (q.open === 'false') where.status = 'closed'
  const { rows, count } = await Complaint.findAndCountAll({ where, order: [['receivedOn', 'DESC'], ['id', 'DESC']], limit: q.pageSize, offset: (q.page - 1) * q.pageSize })
  return { rows: await complaintDTOs(rows, user), total: count, page: q.page, pageSize: q.pageSize }
}

/** A complaint in the user's scope, or 404 (another organization's looks like a missing one). */
async function scopedComplaint(user: SessionUser, id: number, t?: Transaction): Promise<Complaint> {
  const row = await Complaint.findOne({ where: { [Op.and]: [{ id }, organizationScope(user)] }, transaction: t })
  if (!row) notFound('complaint')
  return row
}

export async function complaintDetail(user: SessionUser, id: number): Promise<ComplaintDetailDTO> {
  const row = await scopedComplaint(user, id)
  const [dto] = await complaintDTOs([row], user)
  if (user.role === 'customer') return { ...dto!, correctiveActions: [], audit: [] }
  const actions = await CorrectiveAction.findAll({ where: { complaintId: id }, order: [['id', 'ASC']] })
  return { ...dto!, correctiveActions: await correctiveActionDTOs(actions), audit: await auditTrail('Complaint', id) }
}

/**
 * Everyone who did the work a complaint is about: for a certificate, the runs of all its revisions
 * and their certificates; for an instrument, all its runs that are not void and their
 * certificates — their technicians, contributors, reviewers and signatories.
 */
async function involvedIn(t: Transaction, certificate: Certificate | null, instrument: Instrument | null): Promise<number[]> {
  let certs: Certificate[] = []
  let runs: CalibrationRun[] = []
  if (certificate) {
    certs = await Certificate.findAll({ where: { baseNumber: certificate.baseNumber }, transaction: t })
    runs = await CalibrationRun.findAll({ where: { id: certs.map(c => c.runId) }, transaction: t })
  }
  else if (instrument) {
    runs = await CalibrationRun.findAll({ where: { instrumentId: instrument.id, status: { [Op.ne]: 'void' } }, transaction: t })
    certs = await Certificate.findAll({ where: { instrumentId: instrument.id }, transaction: t })
  }
  const ids = [...runs.flatMap(r => [r.technicianId, r.reviewerId, ...(r.contributorIds ?? [])]), ...certs.map(c => c.signedBy)]
  return [...new Set(ids.filter((v): v is number => typeof v === 'number'))].sort((a, b) => a - b)
}

/**
 * Receive a complaint in the caller's transaction. A customer's is scoped to its organization: a
 * certificate or instrument of another one is 404. The acknowledgement is queued in the outbox.
 */
export async function submitComplaintIn(t: Transaction, user: SessionUser, input: ComplaintCreateInput, receivedOn?: string): Promise<Complaint> {
  const customer = user.role === 'customer'
  const scope = customer ? { organizationId: user.organizationId ?? -1 } : {}
  let certificate: Certificate | null = null
  let instrument: Instrument | null = null
  if (input.certificateId) {
    certificate = await Certificate.findOne({ where: { id: input.certificateId, ...scope }, transaction: t })
    if (!certificate) {
      if (customer) notFound('certificate')
      invalidInput({ certificateId: 'No certificate with this id' })
    }
  }
  if (input.instrumentId) {
    instrument = await Instrument.findOne({ where: { id: input.instrumentId, ...scope }, transaction: t })
    if (!instrument) {
      if (customer) notFound('instrument')
      invalidInput({ instrumentId: 'No instrument with this id' })
    }
    if (certificate && certificate.instrumentId !== instrument.id) invalidInput({ instrumentId: `Certificate ${certificate.number} is for another instrument` })
  }
  let organizationId: number | null = certificate?.organizationId ?? instrument?.organizationId ?? null
  if (customer) organizationId = user.organizationId
  else if (input.organizationId) {
    if (organizationId && organizationId !== input.organizationId) invalidInput({ organizationId: 'The certificate or instrument belongs to another customer' })
    if (!(await Organization.findByPk(input.organizationId, { transaction: t }))) invalidInput({ organizationId: 'No customer with this id' })
    organizationId = input.organizationId
  }
  const today = await labToday(new Date(), t)
  // The date given by the calling code (the demo seed) wins; a customer's complaint is received today.
  const day = receivedOn ?? (customer ? today : input.receivedOn ?? today)
  if (day > today) invalidInput({ receivedOn: 'A complaint cannot be received on a date still to come' })
  const row = await createAudited(t, user, Complaint, {
    number: await nextRecordNumber(t, Complaint, 'CP', day),
    organizationId,
    certificateId: certificate?.id ?? null,
    instrumentId: instrument?.id ?? null,
    channel: customer ? 'portal' : 'laboratory',
    submittedBy: user.id,
    receivedOn: day,
    subject: input.subject,
    description: input.description,
    involvedUserIds: await involvedIn(t, certificate, instrument),
    acknowledgedAt: null,
    investigation: null, investigatedBy: null, outcome: null, outcomeProposedBy: null, outcomeProposedAt: null,
    approvedBy: null, approvedAt: null, closedAt: null, nonconformityId: null,
  }, { entity: 'Complaint' })
  const about = certificate ? `certificate ${certificate.number}` : instrument ? `instrument ${instrument.serial}` : null
  if (await notifyComplaintReceived(t, row, about)) await updateAudited(t, user, row, { acknowledgedAt: new Date() }, { entity: 'Complaint', action: 'acknowledge' })
  return row
}

export async function submitComplaint(user: SessionUser, input: ComplaintCreateInput): Promise<ComplaintDetailDTO> {
  const row = await inTransaction(t => submitComplaintIn(t, user, input))
  return complaintDetail(user, row.id)
}

async function openComplaint(t: Transaction, id: number): Promise<Complaint> {
  const row = await Complaint.findByPk(id, { transaction: t })
  if (!row) notFound('complaint')
  if (row.status === 'closed') conflict(`Complaint ${row.number} is closed`)
  return row
}

/** Record the investigation; the complaint is then under investigation (a proposed outcome must be proposed again). */
export async function investigateComplaintIn(t: Transaction, user: { id: number }, id: number, input: ComplaintInvestigationInput): Promise<void> {
  const row = await openComplaint(t, id)
  assertVersion(row.version, input.version)
  if (input.nonconformityId && !(await Nonconformity.findByPk(input.nonconformityId, { transaction: t }))) invalidInput({ nonconformityId: 'No nonconformity with this id' })
  await updateAudited(t, user, row, {
    investigation: input.investigation,
    investigatedBy: user.id,
    status: 'investigating',
    ...(input.nonconformityId !== undefined ? { nonconformityId: input.nonconformityId } : {}),
  }, { entity: 'Complaint', action: 'investigate' })
}

export async function investigateComplaint(user: SessionUser, id: number, input: ComplaintInvestigationInput): Promise<ComplaintDetailDTO> {
  await inTransaction(t => investigateComplaintIn(t, user, id, input))
  return complaintDetail(user, id)
}

/** Propose the outcome (409 before the investigation is recorded). */
export async function proposeOutcomeIn(t: Transaction, user: { id: number }, id: number, input: ComplaintOutcomeInput): Promise<void> {
  const row = await openComplaint(t, id)
  assertVersion(row.version, input.version)
  if (!row.investigation) conflict(`Record the investigation of ${row.number} before proposing its outcome`, 'investigation')
  await updateAudited(t, user, row, { outcome: input.outcome, outcomeProposedBy: user.id, outcomeProposedAt: new Date(), status: 'outcome-proposed' }, { entity: 'Complaint', action: 'propose-outcome' })
}

export async function proposeOutcome(user: SessionUser, id: number, input: ComplaintOutcomeInput): Promise<ComplaintDetailDTO> {
  await inTransaction(t => proposeOutcomeIn(t, user, id, input))
  return complaintDetail(user, id)
}

/**
 * Approve the proposed outcome and close: only someone not involved in the work complained about
 * (403 otherwise); 409 unless an outcome is proposed. The closing notice is queued in the outbox.
 */
export async function approveOutcome(user: SessionUser, id: number, input: ComplaintApproveInput): Promise<ComplaintDetailDTO> {
  await inTransaction(async (t) => {
    const row = await openComplaint(t, id)
    assertVersion(row.version, input.version)
    if (row.status !== 'outcome-proposed' || !row.outcome) conflict(`No outcome of ${row.number} is waiting for approval`)
    if ((row.involvedUserIds ?? []).includes(user.id)) {
      forbidden(`You were involved in the work complaint ${row.number} is about: someone who was not involved must approve its outcome`)
    }
    const now = new Date()
    await updateAudited(t, user, row, { approvedBy: user.id, approvedAt: now, closedAt: now, status: 'closed' }, { entity: 'Complaint', action: 'approve-and-close' })
    await notifyComplaintClosed(t, row)
  })
  return complaintDetail(user, id)
}
