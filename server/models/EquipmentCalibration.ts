import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize'
import type { EquipmentType } from '#shared/registers/constants'
import { sequelize } from '#server/utils/db'

/**
 * One external calibration of the laboratory's reference equipment (ISO/IEC 17025 6.4.13 e):
 * a blackbody source (equipmentType 'source') or a reference instrument ('reference').
 * Dates are date-only `YYYY-MM-DD`. The equipment's current due date is the due date of its
 * latest calibration. Calibrations are records of what a certificate said: never changed or deleted.
 */
export class EquipmentCalibration extends Model<InferAttributes<EquipmentCalibration>, InferCreationAttributes<EquipmentCalibration>> {
  declare id: CreationOptional<number>
  declare equipmentType: EquipmentType
  declare equipmentId: number
  declare provider: string
  declare certificateNumber: string
  declare calibrationDate: string
  declare dueDate: string
  declare results: string | null
  declare uploadId: number | null
  declare createdBy: number | null
  declare version: CreationOptional<number>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
}

EquipmentCalibration.init(
  {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    equipmentType: { type: DataTypes.STRING(20), allowNull: false },
    equipmentId: { type: DataTypes.INTEGER, allowNull: false },
    provider: { type: DataTypes.STRING(160), allowNull: false },
    certificateNumber: { type: DataTypes.STRING(80), allowNull: false },
    calibrationDate: { type: DataTypes.DATEONLY, allowNull: false },
    dueDate: { type: DataTypes.DATEONLY, allowNull: false },
    results: { type: DataTypes.TEXT, allowNull: true },
    uploadId: { type: DataTypes.INTEGER, allowNull: true },
    createdBy: { type: DataTypes.INTEGER, allowNull: true },
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, tableName: 'equipment_calibrations', version: true },
)
