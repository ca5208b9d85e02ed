import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize'
import type { IntervalItemType, IntervalMethod } from '#shared/quality/constants'
import { sequelize } from '#server/utils/db'

/**
 * A decision on the calibration interval of one of the laboratory's sources or reference
 * instruments (ISO/IEC 17025:2017 6.4.7; ILAC-G24 / OIML D10): the method, the proposal it gave,
 * the interval decided (months), the reason, and the analysis it was based on (inputs and
 * results, as shown). Never changed; a new decision is a new row.
 */
export class IntervalDecision extends Model<InferAttributes<IntervalDecision>, InferCreationAttributes<IntervalDecision>> {
  declare id: CreationOptional<number>
  declare itemType: IntervalItemType
  declare itemId: number
  declare method: IntervalMethod
  declare proposedMonths: number | null
  declare decidedMonths: number
  declare reason: string
  declare analysis: unknown
  declare decidedOn: string
  declare decidedBy: number
  declare version: CreationOptional<number>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
}

IntervalDecision.init(
  {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    itemType: { type: DataTypes.STRING(20), allowNull: false },
    itemId: { type: DataTypes.INTEGER, allowNull: false },
    method: { type: DataTypes.STRING(20), allowNull: false },
    proposedMonths: { type: DataTypes.INTEGER, allowNull: true },
    decidedMonths: { type: DataTypes.INTEGER, allowNull: false },
    reason: { type: DataTypes.TEXT, allowNull: false },
    analysis: { type: DataTypes.JSON, allowNull: true },
    decidedOn: { type: DataTypes.DATEONLY, allowNull: false },
    decidedBy: { type: DataTypes.INTEGER, allowNull: false },
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, tableName: 'interval_decisions', version: true },
)
