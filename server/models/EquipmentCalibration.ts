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
  /**
   * As found, before any adjustment (from the certificate): rows `[temperatureK, correctionK]`, the
   * correction the item needed = true value − value the laboratory was using, K. Null when not recorded.
   */
  declare asFoundCorrections: CreationOptional<[number, number][] | null>
  /** Standard uncertainty (k = 1) of those corrections, K. */
  declare asFoundUncertaintyK: CreationOptional<number | null>
  /** The largest |correction| the laboratory accepts for the item (its tolerance), K. */
  declare asFoundToleranceK: CreationOptional<number | null>
  /** Every |correction| ≤ tolerance; null when no as-found data were recorded. */
  declare asFoundInTolerance: CreationOptional<boolean | null>
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
    asFoundCorrections: { type: DataTypes.JSON, allowNull: true },
    asFoundUncertaintyK: { type: DataTypes.DOUBLE, allowNull: true },
    asFoundToleranceK: { type: DataTypes.DOUBLE, allowNull: true },
    asFoundInTolerance: { type: DataTypes.BOOLEAN, allowNull: true },
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, tableName: 'equipment_calibrations', version: true },
)
