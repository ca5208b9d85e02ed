/** The lab's own equipment calibrations: the history of each item and its current due date. */
import type { Transaction } from 'sequelize'
import type { EquipmentType } from '#shared/registers/constants'
import { EquipmentCalibration } from '#server/models/EquipmentCalibration'
import { quotedColumn } from '#server/utils/search'

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
