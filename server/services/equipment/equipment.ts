/**
 * The laboratory's reference equipment registers — blackbody sources and reference instruments —
 * share one shape: identity, status, archive flag, calibration history (EquipmentCalibration),
 * CSV import and export. The route files under server/api/sources and
 * server/api/reference-instruments check the role and validate, then call these.
 */
import { createError, type H3Event } from 'h3'
import { literal, type Model, type ModelStatic, type Order, type Transaction, type WhereOptions } from 'sequelize'
import type { z } from 'zod'
import type { EquipmentType } from '#shared/registers/constants'
import type { CalibrationCreateInput } from '#shared/schemas/calibration'
import type { ArchiveInput, CsvImportInput, ReferenceQuery, SourceQuery } from '#shared/schemas/registerQuery'
import { referenceCreateSchema } from '#shared/schemas/referenceInstrument'
import { sourceCreateSchema } from '#shared/schemas/source'
import type { BlackbodySourceDTO, EquipmentCalibrationDTO, EquipmentDetailDTO, ImportPreview, ImportResult, Page, ReferenceInstrumentDTO, SessionUser } from '#shared/types'
import { BlackbodySource } from '#server/models/BlackbodySource'
import { EquipmentCalibration } from '#server/models/EquipmentCalibration'
import { ReferenceInstrument } from '#server/models/ReferenceInstrument'
import { Upload } from '#server/models/Upload'
import { notFound, invalidInput, assertVersion } from '#server/utils/errors'
import { recordAudit, snapshot, updateAudited } from '#server/utils/audit'
import { checkCsvRows, csvFromRows, markDuplicates, previewOf, refuseUnlessAllValid, rowError, sendCsv, withCsvShape, type CsvColumns } from '#server/utils/csv'
import { calibrationDTO, referenceInstrumentDTO, sourceDTO } from './dto'
import { auditTrail } from '#server/services/audit/trail'
import { calibrationsOf, dueDateSql } from './calibrations'
import { changes, checkMerged } from '#server/utils/validation'
import { ListFilter } from '#server/utils/search'
import { labToday } from '#server/services/settings/today'
import { inTransaction } from '#server/utils/transaction'
import { affectedPeriod, raiseNonconformityIn } from '#server/services/nonconformities/raise'

export type EquipmentRow = BlackbodySource | ReferenceInstrument

export interface EquipmentRegister<R extends EquipmentRow, D> {
  type: EquipmentType
  entity: 'BlackbodySource' | 'ReferenceInstrument'
  /** For messages: "No such source". */
  label: string
  model: ModelStatic<R & Model>
  createSchema: z.ZodType
  importColumns: CsvColumns
  exportColumns: readonly string[]
  file: string
  dto: (row: R, latest: EquipmentCalibration | undefined, today: string) => D
}

const SOURCE_IMPORT: CsvColumns = {
  assetTag: 'text', kind: 'text', maker: 'text', model: 'text', serial: 'text', apertureMm: 'number',
  minTemperatureK: 'number', maxTemperatureK: 'number', emissivity: 'number', emissivityU: 'number',
  emissivityBandLambda1Um: 'number', emissivityBandLambda2Um: 'number', emissivityTable: 'json', uniformityK: 'number', stabilityK: 'number',
  corrections: 'json', certifiedBasis: 'text', certifiedBandLambda1Um: 'number', certifiedBandLambda2Um: 'number', certifiedBandMedium: 'text',
  certifiedReflectedTemperatureK: 'number', certifiedExpandedUncertaintyK: 'number', certifiedCoverageFactor: 'number', status: 'text', notes: 'text',
}
const REFERENCE_IMPORT: CsvColumns = {
  assetTag: 'text', kind: 'text', maker: 'text', model: 'text', serial: 'text', rangeMin: 'number', rangeMax: 'number',
  rangeUnit: 'text', standardUncertainty: 'number', uncertaintyUnit: 'text', status: 'text', notes: 'text',
}
/** Read-only columns an export adds after the importable ones (ignored on import). */
const EQUIPMENT_READ_ONLY = ['id', 'archived', 'lastCalibrationDate', 'dueDate', 'pastDue'] as const

export const SOURCE_REGISTER: EquipmentRegister<BlackbodySource, BlackbodySourceDTO> = {
  type: 'source',
  entity: 'BlackbodySource',
  label: 'source',
  model: BlackbodySource,
  createSchema: sourceCreateSchema,
  importColumns: SOURCE_IMPORT,
  exportColumns: [...Object.keys(SOURCE_IMPORT), ...EQUIPMENT_READ_ONLY],
  file: 'blackbody-sources',
  dto: sourceDTO,
}

export const REFERENCE_REGISTER: EquipmentRegister<ReferenceInstrument, ReferenceInstrumentDTO> = {
  type: 'reference',
  entity: 'ReferenceInstrument',
  label: 'reference instrument',
  model: ReferenceInstrument,
  createSchema: referenceCreateSchema,
  importColumns: REFERENCE_IMPORT,
  exportColumns: [...Object.keys(REFERENCE_IMPORT), ...EQUIPMENT_READ_ONLY],
  file: 'reference-instruments',
  dto: referenceInstrumentDTO,
}

const SEARCH_COLUMNS = ['assetTag', 'serial', 'maker', 'model'] as const

function listFilter<R extends EquipmentRow, D>(reg: EquipmentRegister<R, D>, q: SourceQuery | ReferenceQuery): ListFilter {
  const f = new ListFilter()
  if (q.archived !== 'all') f.add({ archived: q.archived === 'true' })
  if (q.status) f.add({ status: q.status })
  if (q.kind) f.add({ kind: q.kind })
  if (q.q) f.text(reg.model.name, SEARCH_COLUMNS, q.q)
  if (q.dueBefore) f.sql(dueDateSql(reg.type, reg.model.name) + ' < ' + f.param(q.dueBefore))
  return f
}

function listOrder<R extends EquipmentRow, D>(reg: EquipmentRegister<R, D>, sort: string, dir: 'asc' | 'desc'): Order {
  const d = dir === 'desc' ? 'DESC' : 'ASC'
  // Equipment without a calibration sorts last either way.
  if (sort === 'dueDate') return [[literal(dueDateSql(reg.type, reg.model.name) + ' IS NULL'), 'ASC'], [literal(dueDateSql(reg.type, reg.model.name)), d], ['id', d]]
  return [[sort, d], ['id', d]]
}

async function withLatest<R extends EquipmentRow, D>(reg: EquipmentRegister<R, D>, rows: R[]): Promise<D[]> {
  const cals = await calibrationsOf(reg.type, rows.map(r => r.id))
  const today = await labToday()
  return rows.map(r => reg.dto(r, cals.get(r.id)?.[0], today))
}

export async function listEquipment<R extends EquipmentRow, D>(reg: EquipmentRegister<R, D>, q: SourceQuery | ReferenceQuery): Promise<Page<D>> {
  const filter = listFilter(reg, q).options()
  const [total, rows] = await Promise.all([
    reg.model.count(filter),
    reg.model.findAll({ ...filter, order: listOrder(reg, q.sort, q.dir), limit: q.pageSize, offset: (q.page - 1) * q.pageSize }),
  ])
  return { rows: await withLatest(reg, rows), total, page: q.page, pageSize: q.pageSize }
}

export async function equipmentDetail<R extends EquipmentRow, D>(reg: EquipmentRegister<R, D>, id: number): Promise<EquipmentDetailDTO<D>> {
  const row = await reg.model.findByPk(id)
  if (!row) notFound(reg.label)
  const calibrations = (await calibrationsOf(reg.type, [id])).get(id) ?? []
  return {
    ...reg.dto(row, calibrations[0], await labToday()),
    calibrations: calibrations.map(calibrationDTO),
    audit: await auditTrail(reg.entity, id),
  }
}

export async function createEquipment<R extends EquipmentRow, D>(reg: EquipmentRegister<R, D>, user: SessionUser, input: Record<string, unknown>): Promise<D> {
  const row = await inTransaction(async (t) => {
    const created = await reg.model.create(input as never, { transaction: t })
    await recordAudit(t, { userId: user.id, action: 'create', entity: reg.entity, entityId: created.id, after: snapshot(created) })
    return created
  })
  return reg.dto(row, undefined, await labToday())
}

export async function updateEquipment<R extends EquipmentRow, D>(reg: EquipmentRegister<R, D>, user: SessionUser, id: number, input: { version: number } & Record<string, unknown>): Promise<D> {
  const row = await inTransaction(async (t) => {
    const row = await reg.model.findByPk(id, { transaction: t })
    if (!row) notFound(reg.label)
    assertVersion(row.version, input.version)
    const { id: _id, version: _v, archived: _a, createdAt: _c, updatedAt: _u, ...stored } = snapshot(row)
    const merged = checkMerged(reg.createSchema, { ...stored, ...changes(input) }) as Record<string, unknown>
    // Back in service by hand: the reason it was out of service no longer applies.
    if (merged.status === 'in-service') merged.statusReason = null
    await updateAudited(t, user, row, merged as never, { entity: reg.entity })
    return row
  })
  const cals = await calibrationsOf(reg.type, [id])
  return reg.dto(row, cals.get(id)?.[0], await labToday())
}

export async function archiveEquipment<R extends EquipmentRow, D>(reg: EquipmentRegister<R, D>, user: SessionUser, id: number, input: ArchiveInput): Promise<D> {
  const row = await inTransaction(async (t) => {
    const row = await reg.model.findByPk(id, { transaction: t })
    if (!row) notFound(reg.label)
    assertVersion(row.version, input.version)
    await updateAudited(t, user, row, { archived: input.archived } as never, { entity: reg.entity, action: input.archived ? 'archive' : 'restore' })
    return row
  })
  const cals = await calibrationsOf(reg.type, [id])
  return reg.dto(row, cals.get(id)?.[0], await labToday())
}

/**
 * Record an external calibration of a source or reference instrument in the caller's transaction,
 * with its audit rows: 404 for no such equipment, 400 for an upload that is not an equipment
 * certificate, 409 when the certificate number is already recorded for it. With as-found data out
 * of tolerance it raises a nonconformity (returned with the calibration).
 */
export async function addCalibrationIn<R extends EquipmentRow, D>(t: Transaction, reg: EquipmentRegister<R, D>, user: SessionUser, id: number, input: CalibrationCreateInput): Promise<EquipmentCalibration & { nonconformityId?: number | null }> {
  const row = await reg.model.findByPk(id, { transaction: t })
  if (!row) notFound(reg.label)
  if (input.uploadId) {
    const upload = await Upload.findByPk(input.uploadId, { transaction: t })
    if (!upload || upload.purpose !== 'equipment-certificate') invalidInput({ uploadId: 'No uploaded equipment certificate with this id' })
  }
  const clash = await EquipmentCalibration.findOne({ where: { equipmentType: reg.type, equipmentId: id, certificateNumber: input.certificateNumber }, transaction: t })
  if (clash) {
    throw createError({ statusCode: 409, statusMessage: 'Conflict', message: 'This certificate is already recorded', data: { fields: { certificateNumber: 'Already recorded for this equipment' } } })
  }
  const asFound = input.asFound ?? null
  const inTolerance = asFound ? asFound.corrections.every(([, d]) => Math.abs(d) <= asFound.toleranceK * (1 + 1e-12)) : null
  const created = await EquipmentCalibration.create(
    {
      equipmentType: reg.type, equipmentId: id, provider: input.provider, certificateNumber: input.certificateNumber, calibrationDate: input.calibrationDate, dueDate: input.dueDate, results: input.results ?? null, uploadId: input.uploadId ?? null, createdBy: user.id,
      asFoundCorrections: asFound?.corrections ?? null, asFoundUncertaintyK: asFound?.standardUncertaintyK ?? null, asFoundToleranceK: asFound?.toleranceK ?? null, asFoundInTolerance: inTolerance,
    },
    { transaction: t },
  )
  await recordAudit(t, { userId: user.id, action: 'create', entity: 'EquipmentCalibration', entityId: created.id, after: snapshot(created) })
  await recordAudit(t, { userId: user.id, action: 'add-calibration', entity: reg.entity, entityId: id, after: { calibrationId: created.id, certificateNumber: created.certificateNumber, calibrationDate: created.calibrationDate, dueDate: created.dueDate } })
  const nc = inTolerance === false ? await raiseOnAsFound(t, user, reg.type, row, created) : null
  return Object.assign(created, { nonconformityId: nc?.id ?? null })
}

export async function addCalibration<R extends EquipmentRow, D>(reg: EquipmentRegister<R, D>, user: SessionUser, id: number, input: CalibrationCreateInput): Promise<EquipmentCalibrationDTO> {
  const created = await inTransaction(t => addCalibrationIn(t, reg, user, id, input))
  return { ...calibrationDTO(created), nonconformityId: created.nonconformityId ?? null }
}

/**
 * A reference found out of tolerance at its calibration (ISO/IEC 17025:2017 6.4.9): a nonconformity
 * over the work done with it since the last good evidence, with the corrections found (to
 * re-evaluate each affected point) and issuing withheld until the work is reviewed.
 */
async function raiseOnAsFound(t: Transaction, user: SessionUser, type: EquipmentType, item: EquipmentRow, cal: EquipmentCalibration) {
  const period = await affectedPeriod(type, item.id, cal.calibrationDate, t)
  const worst = (cal.asFoundCorrections ?? []).reduce((m, [, d]) => (Math.abs(d) > Math.abs(m) ? d : m), 0)
  return raiseNonconformityIn(t, user, {
    origin: 'calibration',
    originId: cal.id,
    title: `${item.assetTag} found out of tolerance at its calibration ${cal.certificateNumber}`,
    description: `The calibration of ${cal.calibrationDate} by ${cal.provider} (certificate ${cal.certificateNumber}) found ${item.assetTag} needing a correction of up to ${worst} K as found, beyond its tolerance of ±${cal.asFoundToleranceK} K. Work done with it from ${period.from} (last good evidence) to ${period.to} is affected; issuing certificates from it is withheld until the work is reviewed.`,
    risk: 'high',
    withhold: true,
    equipment: { type, id: item.id },
    affectedFrom: period.from,
    affectedTo: period.to,
    referenceCorrections: cal.asFoundCorrections,
  })
}

export async function exportEquipment<R extends EquipmentRow, D>(reg: EquipmentRegister<R, D>, event: H3Event, q: SourceQuery | ReferenceQuery): Promise<string> {
  const rows = await reg.model.findAll({ ...listFilter(reg, q).options(), order: listOrder(reg, q.sort, q.dir), limit: 100_000 })
  const dtos = await withLatest(reg, rows)
  return sendCsv(event, reg.file, csvFromRows(reg.exportColumns, dtos as Record<string, unknown>[]))
}

export async function importEquipment<R extends EquipmentRow, D>(reg: EquipmentRegister<R, D>, user: SessionUser, input: CsvImportInput): Promise<ImportPreview | ImportResult> {
  const rows = withCsvShape(() => checkCsvRows(input.csv, reg.importColumns, reg.createSchema)) as ReturnType<typeof checkCsvRows<typeof sourceCreateSchema>>
  markDuplicates(rows, v => String(v.assetTag), 'assetTag')
  const tags = rows.filter(r => r.value).map(r => String(r.value!.assetTag))
  if (tags.length) {
    const existing = await reg.model.findAll({ where: { assetTag: tags } as WhereOptions, attributes: ['assetTag'] })
    const taken = new Set(existing.map(e => e.assetTag.toLowerCase()))
    for (const row of rows) if (row.value && taken.has(String(row.value.assetTag).toLowerCase())) rowError(row, 'assetTag', 'Already in the register')
  }
  if (!input.commit) return previewOf(rows)
  const values = refuseUnlessAllValid(rows)
  await inTransaction(async (t) => {
    for (const value of values) {
      const created = await reg.model.create(value as never, { transaction: t })
      await recordAudit(t, { userId: user.id, action: 'import', entity: reg.entity, entityId: created.id, after: snapshot(created) })
    }
  })
  return { created: values.length }
}
