/**
 * Customers' instruments: listing (scoped to a customer's organization), detail, creation and
 * change with reference checks, archive, CSV import and export. The list query itself is in
 * ./query.ts (shared with the benchmark).
 */
import type { H3Event } from 'h3'
import { Op, type Transaction } from 'sequelize'
import { instrumentCreateSchema, type InstrumentCreateInput, type InstrumentUpdateInput } from '#shared/schemas/instrument'
import type { ArchiveInput, CsvImportInput, InstrumentQuery } from '#shared/schemas/registerQuery'
import type { ImportPreview, ImportResult, InstrumentDTO, InstrumentDetailDTO, Page, SessionUser } from '#shared/types'
import { isRatioKind } from '#shared/registers/constants'
import { EngineInputError } from '#shared/radiometry/errors'
import type { Band } from '#shared/radiometry/planck'
import { checkBandOrder } from '#shared/radiometry/ratio'
import type { BandInput } from '#shared/types/runs'
import { Instrument } from '#server/models/Instrument'
import { Organization } from '#server/models/Organization'
import { SpectralResponse } from '#server/models/SpectralResponse'
import { Upload } from '#server/models/Upload'
import { createAudited, recordAudit, snapshot, updateAudited } from '#server/utils/audit'
import { organizationScope } from '#server/utils/access'
import { changes, checkMerged } from '#server/utils/validation'
import { auditTrail } from '#server/services/audit/trail'
import { spectralResponseDTO } from '#server/services/responsivities/dto'
import { labToday } from '#server/services/settings/today'
import { checkCsvRows, csvFromRows, markDuplicates, previewOf, refuseUnlessAllValid, rowError, sendCsv, withCsvShape, type CsvColumns } from '#server/utils/csv'
import { instrumentFilter, instrumentOrder, queryInstrumentPage } from './query'
import { instrumentDTO, instrumentListDTO } from './dto'
import { assertVersion, invalidInput, notFound } from '#server/utils/errors'
import { inTransaction } from '#server/utils/transaction'

/**
 * 400 naming the field unless the organization, responsivity tables and photo exist and fit; a ratio
 * pyrometer's band 2 must lie at longer wavelengths than its band 1 (tables included: their spans of
 * non-zero response, shared/radiometry/ratio.ts).
 */
export async function assertInstrumentReferences(v: Pick<InstrumentCreateInput, 'organizationId' | 'spectralResponseId' | 'photoUploadId'> & Partial<Pick<InstrumentCreateInput, 'kind' | 'bandLambda1Um' | 'bandLambda2Um' | 'band2Lambda1Um' | 'band2Lambda2Um' | 'band2SpectralResponseId'>>, transaction?: Transaction): Promise<void> {
  const org = await Organization.findByPk(v.organizationId, { transaction })
  if (!org || !org.active) invalidInput({ organizationId: 'No active organization with this id' })
  let table1: SpectralResponse | null = null
  let table2: SpectralResponse | null = null
  if (v.spectralResponseId) {
    table1 = await SpectralResponse.findByPk(v.spectralResponseId, { transaction })
    if (!table1) invalidInput({ spectralResponseId: 'No responsivity table with this id' })
  }
  if (v.band2SpectralResponseId) {
    table2 = await SpectralResponse.findByPk(v.band2SpectralResponseId, { transaction })
    if (!table2) invalidInput({ band2SpectralResponseId: 'No responsivity table with this id' })
  }
  if (v.kind && isRatioKind(v.kind)) {
    const b1: BandInput | null = v.bandLambda1Um != null && v.bandLambda2Um != null ? { kind: 'rectangular', lambda1Um: v.bandLambda1Um, lambda2Um: v.bandLambda2Um } : table1 ? { kind: 'tabulated', points: table1.points } : null
    const b2: BandInput | null = v.band2Lambda1Um != null && v.band2Lambda2Um != null ? { kind: 'rectangular', lambda1Um: v.band2Lambda1Um, lambda2Um: v.band2Lambda2Um } : table2 ? { kind: 'tabulated', points: table2.points } : null
    if (b1 && b2) {
      try {
        checkBandOrder(b1 as Band, b2 as Band)
      }
      catch (err) {
        if (!(err instanceof EngineInputError)) throw err
        const text = err.message.startsWith(`${err.field}: `) ? err.message.slice(err.field.length + 2) : err.message
        invalidInput({ [b2.kind === 'rectangular' ? 'band2Lambda1Um' : 'band2SpectralResponseId']: `Band 2 ${text.replace(/band2/g, 'band 2').replace(/band1/g, 'band 1')}` })
      }
    }
  }
  if (v.photoUploadId) {
    const up = await Upload.findByPk(v.photoUploadId, { transaction })
    if (!up || up.purpose !== 'instrument-photo' || up.organizationId !== v.organizationId) {
      invalidInput({ photoUploadId: 'No instrument photo of this organization with this id' })
    }
  }
}

/** Organization and responsivity names for a page of instruments (two small queries). */
export async function instrumentNames(rows: readonly Instrument[]): Promise<(i: Instrument) => { organization: string | null, spectralResponse: string | null, band2SpectralResponse: string | null }> {
  const orgIds = [...new Set(rows.map(r => r.organizationId))]
  const srIds = [...new Set(rows.flatMap(r => [r.spectralResponseId, r.band2SpectralResponseId]).filter((v): v is number => !!v))]
  const [orgs, srs] = await Promise.all([
    orgIds.length ? Organization.findAll({ where: { id: orgIds }, attributes: ['id', 'name'] }) : [],
    srIds.length ? SpectralResponse.findAll({ where: { id: srIds }, attributes: ['id', 'name'] }) : [],
  ])
  const orgNames = new Map(orgs.map(o => [o.id, o.name]))
  const srNames = new Map(srs.map(s => [s.id, s.name]))
  return i => ({
    organization: orgNames.get(i.organizationId) ?? null,
    spectralResponse: i.spectralResponseId ? srNames.get(i.spectralResponseId) ?? null : null,
    band2SpectralResponse: i.band2SpectralResponseId ? srNames.get(i.band2SpectralResponseId) ?? null : null,
  })
}

export async function instrumentDTOs(rows: Instrument[]): Promise<InstrumentDTO[]> {
  const names = await instrumentNames(rows)
  const today = await labToday()
  return rows.map(r => instrumentDTO(r, names(r), today))
}

// ---------------------------------------------------------------- CSV

const INSTRUMENT_COLUMNS: CsvColumns = {
  organizationId: 'integer', serial: 'text', assetTag: 'text', maker: 'text', model: 'text', kind: 'text',
  bandLambda1Um: 'number', bandLambda2Um: 'number', spectralResponseId: 'integer',
  band2Lambda1Um: 'number', band2Lambda2Um: 'number', band2SpectralResponseId: 'integer', emissivityRatioSetting: 'number', distanceToSpot: 'number',
  rangeMinK: 'number', rangeMaxK: 'number', defaultEmissivity: 'number', resolutionK: 'number', accuracy: 'json',
  calibrationIntervalMonths: 'integer', status: 'text', nextDueDate: 'date', notes: 'text',
}
const INSTRUMENT_EXPORT = [...Object.keys(INSTRUMENT_COLUMNS), 'id', 'organizationName', 'spectralResponseName', 'band2SpectralResponseName', 'pastDue', 'archived'] as const

export async function exportInstruments(event: H3Event, q: Omit<InstrumentQuery, 'page' | 'pageSize'>): Promise<string> {
  const rows = await Instrument.findAll({ ...instrumentFilter(q).options(), order: instrumentOrder(q.sort, q.dir, !!q.q), limit: 200_000 })
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
  const srIds = [...new Set(good().flatMap(r => [r.value!.spectralResponseId, r.value!.band2SpectralResponseId]).filter((v): v is number => !!v))]
  const srs = srIds.length ? await SpectralResponse.findAll({ where: { id: srIds }, attributes: ['id'] }) : []
  const knownSr = new Set(srs.map(s => s.id))
  for (const row of good()) {
    if (!activeOrgs.has(row.value!.organizationId)) rowError(row, 'organizationId', 'No active organization with this id')
    else if (row.value!.spectralResponseId && !knownSr.has(row.value!.spectralResponseId)) rowError(row, 'spectralResponseId', 'No responsivity table with this id')
    else if (row.value!.band2SpectralResponseId && !knownSr.has(row.value!.band2SpectralResponseId)) rowError(row, 'band2SpectralResponseId', 'No responsivity table with this id')
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

/** One page of instruments; a customer sees only its own organization's, whatever it asks for. */
export async function listInstruments(user: SessionUser, q: InstrumentQuery): Promise<Page<InstrumentDTO>> {
  const organizationId = user.role === 'customer' ? (user.organizationId ?? -1) : q.organizationId
  const [{ rows, total }, today] = await Promise.all([queryInstrumentPage({ ...q, organizationId }), labToday()])
  return { rows: rows.map(r => visibleTo(instrumentListDTO(r, today), user)), total, page: q.page, pageSize: q.pageSize }
}

/** An instrument with its responsivity table and (lab staff only) its audit trail; 404 outside the customer's organization. */
export async function instrumentDetail(user: SessionUser, id: number): Promise<InstrumentDetailDTO> {
  const row = await Instrument.findOne({ where: { id, ...organizationScope(user) } })
  if (!row) notFound('instrument')
  const [dto] = await instrumentDTOs([row])
  const sr = row.spectralResponseId ? await SpectralResponse.findByPk(row.spectralResponseId) : null
  const sr2 = row.band2SpectralResponseId ? await SpectralResponse.findByPk(row.band2SpectralResponseId) : null
  const detail: InstrumentDetailDTO = visibleTo({ ...dto!, spectralResponse: sr ? spectralResponseDTO(sr) : null, band2SpectralResponse: sr2 ? spectralResponseDTO(sr2) : null }, user)
  if (user.role !== 'customer') detail.audit = await auditTrail('Instrument', id)
  return detail
}

export async function createInstrument(actor: SessionUser, input: InstrumentCreateInput): Promise<InstrumentDTO> {
  const row = await inTransaction(async (t) => {
    await assertInstrumentReferences(input, t)
    return createAudited(t, actor, Instrument, input, { entity: 'Instrument' })
  })
  return (await instrumentDTOs([row]))[0]!
}

/** Any subset of the fields, checked as the whole record it would make; 409 when stale. */
export async function updateInstrument(actor: SessionUser, id: number, input: InstrumentUpdateInput): Promise<InstrumentDTO> {
  const row = await inTransaction(async (t) => {
    const row = await Instrument.findByPk(id, { transaction: t })
    if (!row) notFound('instrument')
    assertVersion(row.version, input.version)
    const { id: _id, version: _v, archived: _a, createdAt: _c, updatedAt: _u, ...stored } = snapshot(row)
    const merged = checkMerged(instrumentCreateSchema, { ...stored, ...changes(input) })
    await assertInstrumentReferences(merged, t)
    await updateAudited(t, actor, row, merged, { entity: 'Instrument' })
    return row
  })
  return (await instrumentDTOs([row]))[0]!
}

/** Archive or restore an instrument; instruments are never deleted. */
export async function archiveInstrument(actor: SessionUser, id: number, input: ArchiveInput): Promise<InstrumentDTO> {
  const row = await inTransaction(async (t) => {
    const row = await Instrument.findByPk(id, { transaction: t })
    if (!row) notFound('instrument')
    assertVersion(row.version, input.version)
    await updateAudited(t, actor, row, { archived: input.archived }, { entity: 'Instrument', action: input.archived ? 'archive' : 'restore' })
    return row
  })
  return (await instrumentDTOs([row]))[0]!
}
