/**
 * Customers' instruments: reference checks on create and update, CSV import and export.
 * Used by server/api/instruments; the list query itself is in instrumentQuery.ts.
 */
import type { H3Event } from 'h3'
import { Op, type Transaction } from 'sequelize'
import { todayISO } from '../../shared/registers/dates'
import { instrumentCreateSchema, type InstrumentCreateInput } from '../../shared/schemas/instrument'
import type { CsvImportInput, InstrumentQuery } from '../../shared/schemas/registerQuery'
import type { ImportPreview, ImportResult, InstrumentDTO, SessionUser } from '../../shared/types'
import { Instrument } from '../models/Instrument'
import { Organization } from '../models/Organization'
import { SpectralResponse } from '../models/SpectralResponse'
import { Upload } from '../models/Upload'
import { recordAudit, snapshot } from './audit'
import { checkCsvRows, csvFromRows, markDuplicates, previewOf, refuseUnlessAllValid, rowError, sendCsv, withCsvShape, type CsvColumns } from './csv'
import { instrumentFilter, instrumentOrder } from './instrumentQuery'
import { instrumentDTO } from './presentRegisters'
import { invalidInput } from './registers'
import { inTransaction } from './transaction'

/** 400 naming the field unless the organization, responsivity table and photo exist and fit. */
export async function assertInstrumentReferences(v: Pick<InstrumentCreateInput, 'organizationId' | 'spectralResponseId' | 'photoUploadId'>, transaction?: Transaction): Promise<void> {
  const org = await Organization.findByPk(v.organizationId, { transaction })
  if (!org || !org.active) invalidInput({ organizationId: 'No active organization with this id' })
  if (v.spectralResponseId) {
    const sr = await SpectralResponse.findByPk(v.spectralResponseId, { transaction })
    if (!sr) invalidInput({ spectralResponseId: 'No responsivity table with this id' })
  }
  if (v.photoUploadId) {
    const up = await Upload.findByPk(v.photoUploadId, { transaction })
    if (!up || up.purpose !== 'instrument-photo' || up.organizationId !== v.organizationId) {
      invalidInput({ photoUploadId: 'No instrument photo of this organization with this id' })
    }
  }
}

/** Organization and responsivity names for a page of instruments (two small queries). */
export async function instrumentNames(rows: readonly Instrument[]): Promise<(i: Instrument) => { organization: string | null, spectralResponse: string | null }> {
  const orgIds = [...new Set(rows.map(r => r.organizationId))]
  const srIds = [...new Set(rows.map(r => r.spectralResponseId).filter((v): v is number => !!v))]
  const [orgs, srs] = await Promise.all([
    orgIds.length ? Organization.findAll({ where: { id: orgIds }, attributes: ['id', 'name'] }) : [],
    srIds.length ? SpectralResponse.findAll({ where: { id: srIds }, attributes: ['id', 'name'] }) : [],
  ])
  const orgNames = new Map(orgs.map(o => [o.id, o.name]))
  const srNames = new Map(srs.map(s => [s.id, s.name]))
  return i => ({ organization: orgNames.get(i.organizationId) ?? null, spectralResponse: i.spectralResponseId ? srNames.get(i.spectralResponseId) ?? null : null })
}

export async function instrumentDTOs(rows: Instrument[]): Promise<InstrumentDTO[]> {
  const names = await instrumentNames(rows)
  const today = todayISO()
  return rows.map(r => instrumentDTO(r, names(r), today))
}

// ---------------------------------------------------------------- CSV

const INSTRUMENT_COLUMNS: CsvColumns = {
  organizationId: 'integer', serial: 'text', assetTag: 'text', maker: 'text', model: 'text', kind: 'text',
  bandLambda1Um: 'number', bandLambda2Um: 'number', spectralResponseId: 'integer', distanceToSpot: 'number',
  rangeMinK: 'number', rangeMaxK: 'number', defaultEmissivity: 'number', resolutionK: 'number', accuracy: 'json',
  calibrationIntervalMonths: 'integer', status: 'text', nextDueDate: 'date', notes: 'text',
}
const INSTRUMENT_EXPORT = [...Object.keys(INSTRUMENT_COLUMNS), 'id', 'organizationName', 'spectralResponseName', 'pastDue', 'archived'] as const

export async function exportInstruments(event: H3Event, q: Omit<InstrumentQuery, 'page' | 'pageSize'>): Promise<string> {
  const rows = await Instrument.findAll({ ...instrumentFilter(q).options(), order: instrumentOrder(q.sort, q.dir), limit: 200_000 })
  const dtos = await instrumentDTOs(rows)
  return sendCsv(event, 'instruments', csvFromRows(INSTRUMENT_EXPORT, dtos as unknown as Record<string, unknown>[]))
}

const identity = (v: Pick<InstrumentCreateInput, 'organizationId' | 'maker' | 'model' | 'serial'>) => `${v.organizationId}\u0000${v.maker}\u0000${v.model}\u0000${v.serial}`.toLowerCase()

export async function importInstruments(user: SessionUser, input: CsvImportInput): Promise<ImportPreview | ImportResult> {
  const rows = withCsvShape(() => checkCsvRows(input.csv, INSTRUMENT_COLUMNS, instrumentCreateSchema))
  markDuplicates(rows, identity, 'serial')
  const good = () => rows.filter(r => r.value)
  const orgIds = [...new Set(good().map(r => r.value!.organizationId))]
  const orgs = orgIds.length ? await Organization.findAll({ where: { id: orgIds, active: true }, attributes: ['id'] }) : []
  const activeOrgs = new Set(orgs.map(o => o.id))
  const srIds = [...new Set(good().map(r => r.value!.spectralResponseId).filter((v): v is number => !!v))]
  const srs = srIds.length ? await SpectralResponse.findAll({ where: { id: srIds }, attributes: ['id'] }) : []
  const knownSr = new Set(srs.map(s => s.id))
  for (const row of good()) {
    if (!activeOrgs.has(row.value!.organizationId)) rowError(row, 'organizationId', 'No active organization with this id')
    else if (row.value!.spectralResponseId && !knownSr.has(row.value!.spectralResponseId)) rowError(row, 'spectralResponseId', 'No responsivity table with this id')
    else if (row.value!.photoUploadId) rowError(row, 'photoUploadId', 'Photos are not imported')
  }
  const serials = [...new Set(good().map(r => r.value!.serial))]
  for (let i = 0; i < serials.length; i += 500) {
    const existing = await Instrument.findAll({ where: { serial: { [Op.in]: serials.slice(i, i + 500) } }, attributes: ['organizationId', 'maker', 'model', 'serial'] })
    const taken = new Set(existing.map(identity))
    for (const row of good()) if (taken.has(identity(row.value!))) rowError(row, 'serial', 'This organization already has this instrument (maker, model, serial)')
  }
  if (!input.commit) return previewOf(rows)
  const values = refuseUnlessAllValid(rows)
  await inTransaction(async (t) => {
    for (const value of values) {
      const created = await Instrument.create(value, { transaction: t })
      await recordAudit(t, { userId: user.id, action: 'import', entity: 'Instrument', entityId: created.id, after: snapshot(created) })
    }
  })
  return { created: values.length }
}

/** What a viewer may see of an instrument: the laboratory's own notes never reach a customer. */
export function visibleTo<T extends { notes: string | null }>(dto: T, user: { role: string }): T {
  return user.role === 'customer' ? { ...dto, notes: null } : dto
}
