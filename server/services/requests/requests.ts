/**
 * Calibration requests and their contract review (ISO/IEC 17025 7.1). A customer asks (with what
 * it wants and the specification it names); the laboratory reviews — the terms it offers
 * (procedure, points, conditions, specification, decision rule, place) and its capability check —
 * and the customer agrees in the portal, or the laboratory records how the customer agreed. Only
 * then are runs opened, on the agreed terms. New terms after agreement go back for agreement.
 * Customers see only their organization's requests.
 */
import type { Transaction, WhereOptions } from 'sequelize'
import { Op } from 'sequelize'
import { can } from '#shared/permissions'
import { checkCapability, type CapabilityInstrument } from '#shared/calibration/capability'
import type { RequestAcceptInput, RequestAgreeInput, RequestCreateInput, RequestDeclineInput, RequestRecordAgreementInput, RequestReviewInput } from '#shared/schemas/request'
import type { Page, SessionUser } from '#shared/types'
import type { CalibrationRequestDTO, RequestTerms } from '#shared/types/requests'
import { CalibrationRequest } from '#server/models/CalibrationRequest'
import { Instrument } from '#server/models/Instrument'
import { Organization } from '#server/models/Organization'
import { ProcedureVersion } from '#server/models/ProcedureVersion'
import { SpectralResponse } from '#server/models/SpectralResponse'
import { User } from '#server/models/User'
import { organizationScope } from '#server/utils/access'
import { createAudited, updateAudited } from '#server/utils/audit'
import { assertVersion, conflict, invalidInput, notFound } from '#server/utils/errors'
import { inTransaction } from '#server/utils/transaction'
import { notifyRequestAccepted, notifyRequestReceived, notifyTermsOffered } from '#server/services/mail/events'
import { createRunIn } from '#server/services/runs/runs'

async function toDTOs(rows: CalibrationRequest[]): Promise<CalibrationRequestDTO[]> {
  const instrumentIds = [...new Set(rows.flatMap(r => r.instrumentIds))]
  const userIds = [...new Set(rows.flatMap(r => [r.requestedBy, r.handledBy, r.reviewedBy, r.agreedBy]).filter((v): v is number => v !== null))]
  const orgIds = [...new Set(rows.map(r => r.organizationId))]
  const [instruments, users, orgs] = await Promise.all([
    instrumentIds.length ? Instrument.findAll({ where: { id: instrumentIds }, attributes: ['id', 'serial', 'maker', 'model'] }) : [],
    userIds.length ? User.findAll({ where: { id: userIds }, attributes: ['id', 'name'] }) : [],
    Organization.findAll({ where: { id: orgIds }, attributes: ['id', 'name'] }),
  ])
  const inst = new Map(instruments.map(i => [i.id, { id: i.id, serial: i.serial, maker: i.maker, model: i.model }]))
  const names = new Map(users.map(u => [u.id, u.name]))
  const orgNames = new Map(orgs.map(o => [o.id, o.name]))
  const name = (id: number | null) => (id ? names.get(id) ?? null : null)
  return rows.map(r => ({
    id: r.id,
    organizationId: r.organizationId,
    organizationName: orgNames.get(r.organizationId) ?? null,
    requestedBy: r.requestedBy,
    requestedByName: names.get(r.requestedBy) ?? null,
    instruments: r.instrumentIds.map(id => inst.get(id)).filter((v): v is NonNullable<typeof v> => !!v),
    preferredDate: r.preferredDate,
    requirements: r.requirements ?? null,
    specification: r.specification ?? null,
    notes: r.notes,
    status: r.status,
    terms: r.terms ?? null,
    termsVersion: r.termsVersion,
    reviewedByName: name(r.reviewedBy),
    reviewedAt: r.reviewedAt ? r.reviewedAt.toISOString() : null,
    agreedTermsVersion: r.agreedTermsVersion ?? null,
    agreedAt: r.agreedAt ? r.agreedAt.toISOString() : null,
    agreedByName: name(r.agreedBy),
    agreementMethod: r.agreementMethod ?? null,
    agreementNote: r.agreementNote ?? null,
    handledByName: name(r.handledBy),
    handledAt: r.handledAt ? r.handledAt.toISOString() : null,
    response: r.response,
    runIds: r.runIds ?? [],
    version: r.version,
    createdAt: r.createdAt.toISOString(),
  }))
}

export async function listRequests(user: SessionUser, q: { page: number, pageSize: number, status?: string }): Promise<Page<CalibrationRequestDTO>> {
  const where: WhereOptions = { ...organizationScope(user), ...(q.status ? { status: q.status } : {}) }
  const { rows, count } = await CalibrationRequest.findAndCountAll({ where, order: [['createdAt', 'DESC'], ['id', 'DESC']], limit: q.pageSize, offset: (q.page - 1) * q.pageSize })
  return { rows: await toDTOs(rows), total: count, page: q.page, pageSize: q.pageSize }
}

/** One request, or 404 when it does not exist or belongs to another organization. */
export async function findRequest(user: SessionUser, id: number, t?: Transaction): Promise<CalibrationRequest> {
  const r = await CalibrationRequest.findOne({ where: { id, ...organizationScope(user) }, transaction: t })
  if (!r) notFound('calibration request')
  return r
}

export async function requestDTO(r: CalibrationRequest): Promise<CalibrationRequestDTO> {
  return (await toDTOs([r]))[0]!
}

/** A customer asks for its own, active instruments to be calibrated. */
export async function createRequestIn(t: Transaction, user: SessionUser, input: RequestCreateInput): Promise<CalibrationRequest> {
  const found = await Instrument.findAll({ where: { id: { [Op.in]: input.instrumentIds }, organizationId: user.organizationId ?? -1, archived: false }, attributes: ['id'], transaction: t })
  if (found.length !== input.instrumentIds.length) invalidInput({ instrumentIds: 'Choose instruments of your own organization' })
  const r = await createAudited(t, user, CalibrationRequest, {
    organizationId: user.organizationId!,
    requestedBy: user.id,
    instrumentIds: input.instrumentIds,
    preferredDate: input.preferredDate ?? null,
    requirements: input.requirements ?? null,
    specification: input.specification ?? null,
    notes: input.notes ?? null,
    terms: null,
    reviewedBy: null,
    reviewedAt: null,
    agreedTermsVersion: null,
    agreedAt: null,
    agreedBy: null,
    agreementMethod: null,
    agreementNote: null,
    handledBy: null,
    handledAt: null,
    response: null,
  }, { entity: 'CalibrationRequest' })
  await notifyRequestReceived(t, r)
  return r
}

function assertStatus(r: CalibrationRequest, allowed: readonly CalibrationRequest['status'][], doing: string): void {
  if (!allowed.includes(r.status)) conflict(`This request is ${r.status}: it cannot be ${doing} now`)
}

async function capabilityInstruments(ids: readonly number[], t: Transaction): Promise<CapabilityInstrument[]> {
  const rows = await Instrument.findAll({ where: { id: [...ids] }, transaction: t })
  const tables = new Map((await SpectralResponse.findAll({ where: { id: rows.map(i => i.spectralResponseId).filter((v): v is number => !!v) }, transaction: t })).map(s => [s.id, s]))
  return rows.map((i) => {
    const table = i.spectralResponseId ? tables.get(i.spectralResponseId) : undefined
    const pts = table?.points ?? []
    return {
      id: i.id,
      label: `${i.maker} ${i.model} ${i.serial}`,
      rangeMinK: i.rangeMinK,
      rangeMaxK: i.rangeMaxK,
      bandMinUm: i.bandLambda1Um ?? pts[0]?.[0] ?? null,
      bandMaxUm: i.bandLambda2Um ?? pts[pts.length - 1]?.[0] ?? null,
    }
  })
}

/**
 * The laboratory's review: the terms it offers and its capability check. Refused (400 naming
 * `terms.pointsK` or `terms.procedureVersionId`) when the check fails. New terms on an agreed
 * request take it back to "terms offered": the customer agrees again.
 */
export async function reviewRequestIn(t: Transaction, user: SessionUser, id: number, input: RequestReviewInput): Promise<CalibrationRequest> {
  const r = await findRequest(user, id, t)
  assertVersion(r.version, input.version)
  assertStatus(r, ['open', 'reviewed', 'agreed', 'accepted'], 'reviewed')
  const pv = await ProcedureVersion.findByPk(input.terms.procedureVersionId, { transaction: t })
  if (!pv) invalidInput({ 'terms.procedureVersionId': 'No procedure version with this id' })
  const capability = checkCapability({ pointsK: input.terms.pointsK, applicability: pv.applicability, cmc: pv.cmc, instruments: await capabilityInstruments(r.instrumentIds, t) })
  const failed = capability.filter(f => !f.ok)
  if (failed.length) {
    const field = failed.some(f => f.pointK !== null) ? 'terms.pointsK' : 'terms.procedureVersionId'
    invalidInput({ [field]: failed.map(f => f.message).join('; ') })
  }
  const terms: RequestTerms = { ...input.terms, procedureName: pv.name, procedureVersionNumber: pv.versionNumber, capability }
  await updateAudited(t, user, r, {
    terms,
    termsVersion: r.termsVersion + 1,
    reviewedBy: user.id,
    reviewedAt: new Date(),
    status: r.status === 'accepted' ? 'accepted' : 'reviewed',
  }, { entity: 'CalibrationRequest', action: r.termsVersion ? 'revise-terms' : 'review' })
  await notifyTermsOffered(t, r)
  return r
}

function assertCurrentTerms(r: CalibrationRequest, termsVersion: number): void {
  if (!r.terms || termsVersion !== r.termsVersion) conflict('These terms are not the current ones: reload the request', 'termsVersion')
}

/** The agreement to the current terms: by the customer in the portal, or recorded by the laboratory with how it was agreed. */
async function agreeIn(t: Transaction, user: SessionUser, id: number, input: { version: number, termsVersion: number }, how: { method: 'portal' | 'recorded', note: string | null, action: string }): Promise<CalibrationRequest> {
  const r = await findRequest(user, id, t)
  assertVersion(r.version, input.version)
  assertStatus(r, ['reviewed', 'accepted'], 'agreed to')
  assertCurrentTerms(r, input.termsVersion)
  if (r.agreedTermsVersion === r.termsVersion) conflict('These terms are already agreed', 'termsVersion')
  await updateAudited(t, user, r, {
    agreedTermsVersion: r.termsVersion, agreedAt: new Date(), agreedBy: user.id, agreementMethod: how.method, agreementNote: how.note,
    status: r.status === 'accepted' ? 'accepted' : 'agreed',
  }, { entity: 'CalibrationRequest', action: how.action })
  return r
}

/** The customer accepts the reviewed terms in the portal. */
export async function agreeRequestIn(t: Transaction, user: SessionUser, id: number, input: RequestAgreeInput): Promise<CalibrationRequest> {
  return agreeIn(t, user, id, input, { method: 'portal', note: null, action: 'agree' })
}

/** The laboratory records how the customer agreed to the reviewed terms (by telephone, e-mail, order …). */
export async function recordAgreementIn(t: Transaction, user: SessionUser, id: number, input: RequestRecordAgreementInput): Promise<CalibrationRequest> {
  return agreeIn(t, user, id, input, { method: 'recorded', note: input.note, action: 'record-agreement' })
}

/**
 * Accept an agreed request into work: one draft run per instrument, on the agreed terms (procedure,
 * the instrument's emissivity setting, place); the conditions — distance included — are entered
 * when measured, and the receipt of each item is recorded on its run.
 */
export async function acceptRequestIn(t: Transaction, user: SessionUser, id: number, input: RequestAcceptInput): Promise<CalibrationRequest> {
  const r = await findRequest(user, id, t)
  assertVersion(r.version, input.version)
  if (r.status === 'reviewed' || r.status === 'open') conflict(r.status === 'open' ? 'Review the request and offer terms first' : 'The customer has not agreed to the terms yet (or record how they agreed)')
  assertStatus(r, ['agreed'], 'accepted')
  const terms = r.terms!
  const technicianId = input.technicianId ?? user.id
  if (technicianId !== user.id) {
    const tech = await User.findByPk(technicianId, { attributes: ['id', 'role', 'active'], transaction: t })
    if (!tech || !tech.active || !can(tech.role, 'run:edit')) invalidInput({ technicianId: 'Choose an active member of the laboratory staff' })
  }
  const runIds: number[] = []
  for (const instrumentId of r.instrumentIds) {
    const run = await createRunIn(t, user, {
      instrumentId,
      procedureVersionId: terms.procedureVersionId,
      calibrationDate: input.calibrationDate,
      ambientTemperatureK: null,
      relativeHumidityPct: null,
      // Measured when the run is performed (the agreed distance is shown beside it as the target).
      distanceMm: null,
      spotDiameterMm: null,
      emissivitySetting: terms.emissivitySetting,
      reflectedTemperatureK: null,
      instrumentTemperatureK: null,
      // a ratio pyrometer's ratio setting and an imager's settings are entered as used in the run
      emissivityRatioSetting: null,
      imagerSettings: null,
      calibrationEquation: null,
      ambientInstrumentId: null,
      adjusted: false,
      internalNotes: null,
      certificateRemarks: null,
      methodDeviations: null,
      placeOfCalibration: terms.placeOfCalibration,
      siteAddress: terms.siteAddress ?? null,
    }, 'create-from-request', { requestId: r.id, technicianId })
    runIds.push(run.id)
  }
  await updateAudited(t, user, r, { status: 'accepted', handledBy: user.id, handledAt: new Date(), response: input.response ?? null, runIds }, { entity: 'CalibrationRequest', action: 'accept' })
  await notifyRequestAccepted(t, r)
  return r
}

export async function declineRequestIn(t: Transaction, user: SessionUser, id: number, input: RequestDeclineInput): Promise<CalibrationRequest> {
  const r = await findRequest(user, id, t)
  assertVersion(r.version, input.version)
  assertStatus(r, ['open', 'reviewed', 'agreed'], 'declined')
  await updateAudited(t, user, r, { status: 'declined', handledBy: user.id, handledAt: new Date(), response: input.response }, { entity: 'CalibrationRequest', action: 'decline' })
  return r
}

// ---------------------------------------------------------------- the routes' operations (one transaction each)

export async function requestDetail(user: SessionUser, id: number): Promise<CalibrationRequestDTO> {
  return requestDTO(await findRequest(user, id))
}

export async function createRequest(user: SessionUser, input: RequestCreateInput): Promise<CalibrationRequestDTO> {
  return requestDTO(await inTransaction(t => createRequestIn(t, user, input)))
}

export async function reviewRequest(user: SessionUser, id: number, input: RequestReviewInput): Promise<CalibrationRequestDTO> {
  return requestDTO(await inTransaction(t => reviewRequestIn(t, user, id, input)))
}

export async function agreeRequest(user: SessionUser, id: number, input: RequestAgreeInput): Promise<CalibrationRequestDTO> {
  return requestDTO(await inTransaction(t => agreeRequestIn(t, user, id, input)))
}

export async function recordAgreement(user: SessionUser, id: number, input: RequestRecordAgreementInput): Promise<CalibrationRequestDTO> {
  return requestDTO(await inTransaction(t => recordAgreementIn(t, user, id, input)))
}

export async function acceptRequest(user: SessionUser, id: number, input: RequestAcceptInput): Promise<CalibrationRequestDTO> {
  return requestDTO(await inTransaction(t => acceptRequestIn(t, user, id, input)))
}

export async function declineRequest(user: SessionUser, id: number, input: RequestDeclineInput): Promise<CalibrationRequestDTO> {
  return requestDTO(await inTransaction(t => declineRequestIn(t, user, id, input)))
}
