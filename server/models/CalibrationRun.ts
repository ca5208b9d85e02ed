import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize'
import type { RunStatus } from '#shared/calibration/constants'
import { sequelize } from '#server/utils/db'

/**
 * One calibration of a customer's instrument under one procedure version: who performed it, when,
 * in what conditions, and its review. Temperatures in K, humidity in %RH, distance in mm.
 * Status draft → submitted → approved, or → returned → submitted again; approved runs are locked.
 * Once submitted (`submittedAt` set) every change needs a reason and leaves a RunRevision.
 */
export class CalibrationRun extends Model<InferAttributes<CalibrationRun>, InferCreationAttributes<CalibrationRun>> {
  declare id: CreationOptional<number>
  declare instrumentId: number
  declare procedureVersionId: number
  declare technicianId: number
  declare receivedDate: string
  declare calibrationDate: string
  declare ambientTemperatureK: number
  declare relativeHumidityPct: number
  declare distanceMm: number
  declare emissivitySetting: number
  declare reflectedTemperatureK: number
  declare instrumentTemperatureK: number
  declare adjusted: boolean
  declare status: CreationOptional<RunStatus>
  declare submittedAt: Date | null
  declare reviewerId: number | null
  declare reviewedAt: Date | null
  declare reviewComments: string | null
  declare notes: string | null
  declare version: CreationOptional<number>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
}

CalibrationRun.init(
  {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    instrumentId: { type: DataTypes.INTEGER, allowNull: false },
    procedureVersionId: { type: DataTypes.INTEGER, allowNull: false },
    technicianId: { type: DataTypes.INTEGER, allowNull: false },
    receivedDate: { type: DataTypes.DATEONLY, allowNull: false },
    calibrationDate: { type: DataTypes.DATEONLY, allowNull: false },
    ambientTemperatureK: { type: DataTypes.DOUBLE, allowNull: false },
    relativeHumidityPct: { type: DataTypes.DOUBLE, allowNull: false },
    distanceMm: { type: DataTypes.DOUBLE, allowNull: false },
    emissivitySetting: { type: DataTypes.DOUBLE, allowNull: false },
    reflectedTemperatureK: { type: DataTypes.DOUBLE, allowNull: false },
    instrumentTemperatureK: { type: DataTypes.DOUBLE, allowNull: false },
    adjusted: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    status: { type: DataTypes.STRING(20), allowNull: false, defaultValue: 'draft' },
    submittedAt: { type: DataTypes.DATE, allowNull: true },
    reviewerId: { type: DataTypes.INTEGER, allowNull: true },
    reviewedAt: { type: DataTypes.DATE, allowNull: true },
    reviewComments: { type: DataTypes.TEXT, allowNull: true },
    notes: { type: DataTypes.TEXT, allowNull: true },
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, tableName: 'calibration_runs', version: true },
)
