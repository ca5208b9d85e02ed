import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize'
import type { EquipmentType } from '#shared/registers/constants'
import type { CheckVerdict } from '#shared/quality/constants'
import { sequelize } from '#server/utils/db'

/**
 * One intermediate check of an item under its plan: the nominal value and what was measured, each
 * with its expanded uncertainty (K), who checked and when, the deviation measured − nominal (K),
 * E_n where the plan judges by it, the verdict, and the nonconformity a failure opened.
 * A record of what happened: never changed or deleted.
 */
export class CheckResult extends Model<InferAttributes<CheckResult>, InferCreationAttributes<CheckResult>> {
  declare id: CreationOptional<number>
  declare planId: number
  declare equipmentType: EquipmentType
  declare equipmentId: number
  declare checkedOn: string
  declare nominalK: number
  declare nominalUncertaintyK: number | null
  declare measuredK: number
  declare expandedUncertaintyK: number | null
  declare deviationK: number
  declare en: number | null
  declare verdict: CheckVerdict
  declare statement: string
  declare performedBy: number
  declare notes: string | null
  declare nonconformityId: number | null
  declare version: CreationOptional<number>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
}

CheckResult.init(
  {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    planId: { type: DataTypes.INTEGER, allowNull: false },
    equipmentType: { type: DataTypes.STRING(20), allowNull: false },
    equipmentId: { type: DataTypes.INTEGER, allowNull: false },
    checkedOn: { type: DataTypes.DATEONLY, allowNull: false },
    nominalK: { type: DataTypes.DOUBLE, allowNull: false },
    nominalUncertaintyK: { type: DataTypes.DOUBLE, allowNull: true },
    measuredK: { type: DataTypes.DOUBLE, allowNull: false },
    expandedUncertaintyK: { type: DataTypes.DOUBLE, allowNull: true },
    deviationK: { type: DataTypes.DOUBLE, allowNull: false },
    en: { type: DataTypes.DOUBLE, allowNull: true },
    verdict: { type: DataTypes.STRING(10), allowNull: false },
    statement: { type: DataTypes.TEXT, allowNull: false },
    performedBy: { type: DataTypes.INTEGER, allowNull: false },
    notes: { type: DataTypes.TEXT, allowNull: true },
    nonconformityId: { type: DataTypes.INTEGER, allowNull: true },
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, tableName: 'check_results', version: true },
)
