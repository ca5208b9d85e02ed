import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize'
import type { CorrectiveActionStatus } from '#shared/quality/constants'
import { sequelize } from '#server/utils/db'

/**
 * A corrective action (ISO/IEC 17025:2017 8.7), linked to a nonconformity or a complaint: the cause
 * found, the actions taken (CorrectiveActionItem rows, each with an owner and a due date), and the
 * effectiveness check that must be recorded — and found effective — before it can close.
 * Never deleted.
 */
export class CorrectiveAction extends Model<InferAttributes<CorrectiveAction>, InferCreationAttributes<CorrectiveAction>> {
  declare id: CreationOptional<number>
  /** CA-YYYY-NNN. */
  declare number: string
  declare nonconformityId: number | null
  declare complaintId: number | null
  declare title: string
  declare cause: string
  declare openedOn: string
  declare openedBy: number
  /** When the effectiveness is to be checked. */
  declare effectivenessDueOn: string | null
  /** What was looked at, and what it showed. */
  declare effectivenessCheck: string | null
  declare effective: boolean | null
  declare effectivenessCheckedBy: number | null
  declare effectivenessCheckedAt: Date | null
  declare status: CreationOptional<CorrectiveActionStatus>
  declare closedAt: Date | null
  declare closedBy: number | null
  declare version: CreationOptional<number>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
}

CorrectiveAction.init(
  {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    number: { type: DataTypes.STRING(30), allowNull: false, unique: true },
    nonconformityId: { type: DataTypes.INTEGER, allowNull: true },
    complaintId: { type: DataTypes.INTEGER, allowNull: true },
    title: { type: DataTypes.STRING(200), allowNull: false },
    cause: { type: DataTypes.TEXT, allowNull: false },
    openedOn: { type: DataTypes.DATEONLY, allowNull: false },
    openedBy: { type: DataTypes.INTEGER, allowNull: false },
    effectivenessDueOn: { type: DataTypes.DATEONLY, allowNull: true },
    effectivenessCheck: { type: DataTypes.TEXT, allowNull: true },
    effective: { type: DataTypes.BOOLEAN, allowNull: true },
    effectivenessCheckedBy: { type: DataTypes.INTEGER, allowNull: true },
    effectivenessCheckedAt: { type: DataTypes.DATE, allowNull: true },
    status: { type: DataTypes.STRING(10), allowNull: false, defaultValue: 'open' },
    closedAt: { type: DataTypes.DATE, allowNull: true },
    closedBy: { type: DataTypes.INTEGER, allowNull: true },
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, tableName: 'corrective_actions', version: true },
)
