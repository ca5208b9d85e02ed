import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize'
import type { EquipmentType } from '#shared/registers/constants'
import type { CheckAcceptance } from '#shared/quality/constants'
import { sequelize } from '#server/utils/db'

/**
 * The plan of intermediate checks of one source or reference instrument (ISO/IEC 17025:2017
 * 6.4.10): what is checked and how, how often (every `intervalDays`, the first on `startOn`), at
 * which values (`nominalsK`, K) and how a result is judged (a limit in K, or |E_n| ≤ 1).
 * Deactivated, never deleted.
 */
export class CheckPlan extends Model<InferAttributes<CheckPlan>, InferCreationAttributes<CheckPlan>> {
  declare id: CreationOptional<number>
  declare equipmentType: EquipmentType
  declare equipmentId: number
  declare title: string
  declare method: string
  declare intervalDays: number
  declare acceptance: CheckAcceptance
  declare acceptanceLimitK: number | null
  declare nominalsK: number[]
  declare startOn: string
  declare active: CreationOptional<boolean>
  declare createdBy: number | null
  declare version: CreationOptional<number>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
}

CheckPlan.init(
  {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    equipmentType: { type: DataTypes.STRING(20), allowNull: false },
    equipmentId: { type: DataTypes.INTEGER, allowNull: false },
    title: { type: DataTypes.STRING(200), allowNull: false },
    method: { type: DataTypes.TEXT, allowNull: false },
    intervalDays: { type: DataTypes.INTEGER, allowNull: false },
    acceptance: { type: DataTypes.STRING(10), allowNull: false },
    acceptanceLimitK: { type: DataTypes.DOUBLE, allowNull: true },
    nominalsK: { type: DataTypes.JSON, allowNull: false },
    startOn: { type: DataTypes.DATEONLY, allowNull: false },
    active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    createdBy: { type: DataTypes.INTEGER, allowNull: true },
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, tableName: 'check_plans', version: true },
)
