/**
 * Helpers the register routes share: 400 answers naming fields, re-checking a merged record
 * against its create schema, the audit trail of one record, the latest
 * calibration of each piece of equipment.
 */
import type { Transaction } from 'sequelize'
import type { z } from 'zod'
import { fieldErrors } from '../../shared/schemas/errors'
import type { EquipmentType } from '../../shared/registers/constants'
import type { AuditEventDTO, FieldErrors } from '../../shared/types'
import { AuditEvent } from '../models/AuditEvent'
import { EquipmentCalibration } from '../models/EquipmentCalibration'
import { User } from '../models/User'
import { quotedColumn } from './search'
import { auditDTO } from './present'

/** 400 "Validation Error" with `data.fields`, the same shape `parseWith` produces. */
export function invalidInput(fields: FieldErrors): never {
  const message = 'Invalid input: ' + Object.entries(fields).map(([f, m]) => `${f}: ${m}`).join('; ')
  throw createError({ statusCode: 400, statusMessage: 'Validation Error', message, data: { message, fields } })
}

/**
 * Validate the record an update would produce (stored values overlaid with the change) against
 * the create schema, so cross-field rules (min < max, band ends) hold after a partial update.
 */
export function checkMerged<S extends z.ZodType>(schema: S, merged: unknown): z.output<S> {
  const result = schema.safeParse(merged)
  if (!result.success) invalidInput(fieldErrors(result.error))
  return result.data
}

/** The attributes of `input` without `version`, for `record.set(...)`. */
export function changes<T extends { version: number }>(input: T): Omit<T, 'version'> {
  const { version: _version, ...rest } = input
  return rest
}

/** The audit rows of one record, oldest first, with the names of the people who made them. */
export async function auditTrail(entity: string, entityId: number): Promise<AuditEventDTO[]> {
  const rows = await AuditEvent.findAll({ where: { entity, entityId }, order: [['at', 'ASC'], ['id', 'ASC']], limit: 1000 })
  const ids = [...new Set(rows.map(r => r.userId).filter((v): v is number => v !== null))]
  const users = ids.length ? await User.findAll({ where: { id: ids }, attributes: ['id', 'name'] }) : []
  const names = new Map(users.map(u => [u.id, u.name]))
  return rows.map(r => auditDTO(r, r.userId ? names.get(r.userId) ?? null : null))
}

/** Every calibration of the given equipment, newest first (by calibration date, then id). */
export async function calibrationsOf(type: EquipmentType, ids: readonly number[], transaction?: Transaction): Promise<Map<number, EquipmentCalibration[]>> {
  const map = new Map<number, EquipmentCalibration[]>()
  if (!ids.length) return map
  const rows = await EquipmentCalibration.findAll({
    where: { equipmentType: type, equipmentId: [...ids] },
    order: [['calibrationDate', 'DESC'], ['id', 'DESC']],
    transaction,
  })
  for (const r of rows) {
    const list = map.get(r.equipmentId) ?? []
    list.push(r)
    map.set(r.equipmentId, list)
  }
  return map
}

/** SQL for the current due date of each row of an equipment table (its latest calibration's). */
export function dueDateSql(type: EquipmentType, alias: string): string {
  const c = (column: string) => quotedColumn('c', column)
  const kind = type === 'source' ? "'source'" : "'reference'"
  return '(SELECT ' + c('dueDate') + ' FROM equipment_calibrations c WHERE ' + c('equipmentType') + ' = ' + kind
    + ' AND ' + c('equipmentId') + ' = ' + quotedColumn(alias, 'id') + ' ORDER BY ' + c('calibrationDate') + ' DESC, ' + c('id') + ' DESC LIMIT 1)'
}
