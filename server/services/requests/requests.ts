/**
 * Calibration requests: a customer asks, the laboratory accepts (a draft run per instrument)
 * or declines with a message. Customers see only their organization's requests.
 */
import { createError } from 'h3'
import { Op, type Transaction, type WhereOptions } from 'sequelize'
import type { RequestAcceptInput, RequestCreateInput, RequestDeclineInput } from '#shared/schemas/request'
import type { Page, SessionUser } from '#shared/types'
import type { CalibrationRequestDTO } from '#shared/types/requests'
import { CalibrationRequest } from '#server/models/CalibrationRequest'
import { Instrument } from '#server/models/Instrument'
import { Organization } from '#server/models/Organization'
import { User } from '#server/models/User'
import { notFound, invalidInput, assertVersion } from '#server/utils/errors'
import { organizationScope } from '#server/utils/access'
import { recordAudit, snapshot, updateAudited } from '#server/utils/audit'
import { notifyRequestAccepted, notifyRequestReceived } from '#server/services/mail/events'
import { createRunIn } from '#server/services/runs/runs'
import { inTransaction } from '#server/utils/transaction'

/** Conditions a draft run opens with; the technician records the real ones in the run header. */
const DEFAULT_CONDITIONS = { ambientTemperatureK: 296.15, relativeHumidityPct: 45, distanceMm: 300, reflectedTemperatureK: 296.15, instrumentTemperatureK: 296.15 }

async function toDTOs(rows: CalibrationRequest[]): Promise<CalibrationRequestDTO[]> {
  const instrumentIds = [...new Set(rows.flatMap(r => r.instrumentIds))]
  const userIds = [...new Set(rows.flatMap(r => [r.requestedBy, r.handledBy]).filter((v): v is number => v !== null))]
  const orgIds = [...new Set(rows.map(r => r.organizationId))]
  const [instruments, users, orgs] = await Promise.all([
    instrumentIds.length ? Instrument.findAll({ where: { id: instrumentIds }, attributes: ['id', 'serial', 'maker', 'model'] }) : [],
    userIds.length ? User.findAll({ where: { id: userIds }, attributes: ['id', 'name'] }) : [],
    Organization.findAll({ where: { id: orgIds }, attributes: ['id', 'name'] }),
  ])
  const inst = new Map(instruments.map(i => [i.id, { id: i.id, serial: i.serial, maker: i.maker, model: i.model }]))
  const names = new Map(users.map(u => [u.id, u.name]))
  const orgNames = new Map(orgs.map(o => [o.id, o.name]))
  return rows.map(r => ({
    id: r.id,
    organizationId: r.organizationId,
    organizationName: orgNames.get(r.organizationId) ?? null,
    requestedBy: r.requestedBy,
    requestedByName: names.get(r.requestedBy) ?? null,
    instruments: r.instrumentIds.map(id => inst.get(id)).filter((v): v is NonNullable<typeof v> => !!v),
    preferredDate: r.preferredDate,
    notes: r.notes,
    status: r.status,
    handledByName: r.handledBy ? names.get(r.handledBy) ?? null : null,
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
  const r = await CalibrationRequest.create({
    organizationId: user.organizationId!,
    requestedBy: user.id,
    instrumentIds: input.instrumentIds,
    preferredDate: input.preferredDate ?? null,
    notes: input.notes ?? null,
    handledBy: null,
    handledAt: null,
    response: null,
  }, { transaction: t })
  await recordAudit(t, { userId: user.id, action: 'create', entity: 'CalibrationRequest', entityId: r.id, after: snapshot(r) })
  await notifyRequestReceived(t, r)
  return r
}

function assertOpen(r: CalibrationRequest): void {
  if (r.status !== 'open') {
    throw createError({ statusCode: 409, statusMessage: 'Conflict', message: `This request is already ${r.status}`, data: { fields: { status: `Already ${r.status}` } } })
  }
}

/** Accept: one draft run per instrument, performed by the accepting technician. */
export async function acceptRequestIn(t: Transaction, user: SessionUser, id: number, input: RequestAcceptInput): Promise<CalibrationRequest> {
  const r = await findRequest(user, id, t)
  assertVersion(r.version, input.version)
  assertOpen(r)
  const before = snapshot(r)
  const runIds: number[] = []
  for (const instrumentId of r.instrumentIds) {
    const run = await createRunIn(t, user, {
      instrumentId,
      procedureVersionId: input.procedureVersionId,
      receivedDate: input.receivedDate,
      calibrationDate: input.receivedDate,
      ...DEFAULT_CONDITIONS,
      adjusted: false,
      notes: `Opened from calibration request ${r.id}.`,
    }, 'create-from-request')
    runIds.push(run.id)
  }
  r.set({ status: 'accepted', handledBy: user.id, handledAt: new Date(), response: input.response ?? null, runIds })
  await r.save({ transaction: t })
  await recordAudit(t, { userId: user.id, action: 'accept', entity: 'CalibrationRequest', entityId: r.id, before, after: snapshot(r) })
  await notifyRequestAccepted(t, r)
  return r
}

export async function declineRequestIn(t: Transaction, user: SessionUser, id: number, input: RequestDeclineInput): Promise<CalibrationRequest> {
  const r = await findRequest(user, id, t)
  assertVersion(r.version, input.version)
  assertOpen(r)
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

export async function acceptRequest(user: SessionUser, id: number, input: RequestAcceptInput): Promise<CalibrationRequestDTO> {
  return requestDTO(await inTransaction(t => acceptRequestIn(t, user, id, input)))
}

export async function declineRequest(user: SessionUser, id: number, input: RequestDeclineInput): Promise<CalibrationRequestDTO> {
  return requestDTO(await inTransaction(t => declineRequestIn(t, user, id, input)))
}
