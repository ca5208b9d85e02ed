import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize'
import type { RequestStatus } from '#shared/schemas/request'
import { sequelize } from '#server/utils/db'

/**
 * A customer's request to have instruments calibrated. It lands in the laboratory's queue;
 * a technician accepts it (a draft run is opened for each instrument) or declines it with a
 * message. `response` is what the customer reads; nothing lab-internal is stored here.
 */
export class CalibrationRequest extends Model<InferAttributes<CalibrationRequest>, InferCreationAttributes<CalibrationRequest>> {
  declare id: CreationOptional<number>
  declare organizationId: number
  declare requestedBy: number
  declare instrumentIds: number[]
  declare preferredDate: string | null
  declare notes: string | null
  declare status: CreationOptional<RequestStatus>
  declare handledBy: number | null
  declare handledAt: Date | null
  declare response: string | null
  /** Runs opened when the request was accepted. */
  declare runIds: CreationOptional<number[]>
  declare version: CreationOptional<number>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
}

CalibrationRequest.init(
  {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    organizationId: { type: DataTypes.INTEGER, allowNull: false },
    requestedBy: { type: DataTypes.INTEGER, allowNull: false },
    instrumentIds: { type: DataTypes.JSON, allowNull: false },
    preferredDate: { type: DataTypes.DATEONLY, allowNull: true },
    notes: { type: DataTypes.TEXT, allowNull: true },
    status: { type: DataTypes.STRING(20), allowNull: false, defaultValue: 'open' },
    handledBy: { type: DataTypes.INTEGER, allowNull: true },
    handledAt: { type: DataTypes.DATE, allowNull: true },
    response: { type: DataTypes.TEXT, allowNull: true },
    runIds: { type: DataTypes.JSON, allowNull: false, defaultValue: [] },
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, tableName: 'calibration_requests', version: true },
)
