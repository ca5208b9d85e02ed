/**
 * What every quality record needs: its number (`NC-2026-001`, `CP-…`, `CA-…`), the names of the
 * people on it, and the equipment it is about (by type and id, with its asset tag).
 */
import { Op, type Model, type ModelStatic, type Transaction } from 'sequelize'
import type { EquipmentType } from '#shared/registers/constants'
import { BlackbodySource } from '#server/models/BlackbodySource'
import { ReferenceInstrument } from '#server/models/ReferenceInstrument'
import { User } from '#server/models/User'
import { readTogether } from '#server/utils/db'

/**
 * The next number of a yearly series, `PREFIX-YYYY-NNN`, allocated in the caller's transaction
 * (write transactions are serialized, and `number` is unique: a clash cannot commit).
 */
export async function nextRecordNumber(t: Transaction, model: ModelStatic<Model & { number: string }>, prefix: string, date: string): Promise<string> {
  const year = date.slice(0, 4)
  const head = `${prefix}-${year}-`
  const rows = await model.findAll({ where: { number: { [Op.like]: `${head}%` } } as never, attributes: ['number'], transaction: t })
  const last = rows.reduce((m, r) => Math.max(m, Number(r.number.slice(head.length)) || 0), 0)
  return `${head}${String(last + 1).padStart(3, '0')}`
}

/** Names of users by id (missing ids are left out). */
export async function userNames(ids: readonly (number | null | undefined)[], transaction?: Transaction): Promise<Map<number, string>> {
  const wanted = [...new Set(ids.filter((v): v is number => typeof v === 'number'))]
  if (!wanted.length) return new Map()
  const users = await User.findAll({ where: { id: wanted }, attributes: ['id', 'name'], transaction })
  return new Map(users.map(u => [u.id, u.name]))
}

export type EquipmentRow = BlackbodySource | ReferenceInstrument

/** A source or reference instrument by type and id, or null. */
export async function findEquipment(type: EquipmentType, id: number, transaction?: Transaction): Promise<EquipmentRow | null> {
  return type === 'source' ? BlackbodySource.findByPk(id, { transaction }) : ReferenceInstrument.findByPk(id, { transaction })
}

/** Asset tags of equipment, keyed `source:12` / `reference:3`. */
export async function equipmentTags(pairs: readonly { type: EquipmentType | null, id: number | null }[], transaction?: Transaction): Promise<Map<string, string>> {
  const of = (type: EquipmentType) => [...new Set(pairs.filter(p => p.type === type && p.id !== null).map(p => p.id!))]
  const [sources, refs] = await readTogether(transaction, [
    () => of('source').length ? BlackbodySource.findAll({ where: { id: of('source') }, attributes: ['id', 'assetTag'], transaction }) : [],
    () => of('reference').length ? ReferenceInstrument.findAll({ where: { id: of('reference') }, attributes: ['id', 'assetTag'], transaction }) : [],
  ])
  return new Map([...sources.map(s => [`source:${s.id}`, s.assetTag] as const), ...refs.map(r => [`reference:${r.id}`, r.assetTag] as const)])
}

/** The label of a kind of equipment, for messages ("No such source"). */
export function equipmentLabel(type: EquipmentType): string {
  return type === 'source' ? 'source' : 'reference instrument'
}

/** ISO string of a date, or null. */
export function iso(d: Date | null | undefined): string | null {
  return d ? d.toISOString() : null
}
