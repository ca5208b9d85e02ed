import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize'
import { sequelize } from '#server/utils/db'

/**
 * A calibration procedure of the laboratory (the method, ISO/IEC 17025 7.2). Its content — decision
 * rule, budget template, CMC — lives in ProcedureVersion rows: an edit adds a version, and
 * `currentVersionId` points at the newest. `version` is the optimistic lock. Archived, never deleted.
 */
export class Procedure extends Model<InferAttributes<Procedure>, InferCreationAttributes<Procedure>> {
  declare id: CreationOptional<number>
  declare name: string
  declare documentReference: string
  declare currentVersionId: number | null
  declare archived: CreationOptional<boolean>
  declare version: CreationOptional<number>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
}

Procedure.init(
  {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    name: { type: DataTypes.STRING(160), allowNull: false, unique: true },
    documentReference: { type: DataTypes.STRING(120), allowNull: false },
    currentVersionId: { type: DataTypes.INTEGER, allowNull: true },
    archived: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, tableName: 'procedures', version: true },
)
