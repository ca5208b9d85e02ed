/**
 * Checks on the laboratory's reference equipment before it is used in a calibration.
 */
import type { Transaction } from 'sequelize'
import { usabilityReason } from '#shared/registers/usability'
import { BlackbodySource } from '#server/models/BlackbodySource'
import { EquipmentCalibration } from '#server/models/EquipmentCalibration'
import type { ReferenceInstrument } from '#server/models/ReferenceInstrument'

/**
 * Whether a source or reference instrument may be used on `dateISO` (`YYYY-MM-DD`): not archived,
 * in service (an item out of service is refused with the reason recorded for it), and its latest calibration on or before that date is not yet due.
 * @returns the reason it is refused, or `null` when it is usable
 */
export async function assertUsableOn(equipment: BlackbodySource | ReferenceInstrument, dateISO: string, transaction?: Transaction): Promise<string | null> {
  const equipmentType = equipment instanceof BlackbodySource ? 'source' : 'reference'
  const calibrations = await EquipmentCalibration.findAll({
    where: { equipmentType, equipmentId: equipment.id },
    attributes: ['calibrationDate', 'dueDate'],
    transaction,
  })
  return usabilityReason(
    { status: equipment.status, statusReason: equipment.statusReason ?? null, archived: !!equipment.archived, calibrations: calibrations.map(c => ({ calibrationDate: c.calibrationDate, dueDate: c.dueDate })) },
    dateISO,
  )
}
