import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize'
import { sequelize } from '#server/utils/db'

/**
 * An amendment to a submitted run (ISO/IEC 17025 7.5.2: every change traceable to the original,
 * with date and person): the earlier and the new values, who, when and why. `pointId` is null for
 * a change of the run header. Append-only: migration 0003 refuses UPDATE and DELETE.
 */
export class RunRevision extends Model<InferAttributes<RunRevision>, InferCreationAttributes<RunRevision>> {
  declare id: CreationOptional<number>
  declare runId: number
  declare pointId: number | null
  declare userId: number
  declare at: Date
  declare reason: string
  declare before: unknown
  declare after: unknown
}

RunRevision.init(
  {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    runId: { type: DataTypes.INTEGER, allowNull: false },
    pointId: { type: DataTypes.INTEGER, allowNull: true },
    userId: { type: DataTypes.INTEGER, allowNull: false },
    at: { type: DataTypes.DATE, allowNull: false },
    reason: { type: DataTypes.TEXT, allowNull: false },
    before: { type: DataTypes.JSON, allowNull: true },
    after: { type: DataTypes.JSON, allowNull: true },
  },
  { sequelize, tableName: 'run_revisions', timestamps: false },
)
