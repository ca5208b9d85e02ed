import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize'
import { sequelize } from '#server/utils/db'

/**
 * One row per change (ISO/IEC 17025 7.5: who did what and when). Written only by
 * `recordAudit` inside the transaction of the change; no route updates or deletes it,
 * and database triggers (migration 0001) refuse UPDATE and DELETE outright.
 */
export class AuditEvent extends Model<InferAttributes<AuditEvent>, InferCreationAttributes<AuditEvent>> {
  declare id: CreationOptional<number>
  declare at: Date
  declare userId: number | null
  declare action: string
  declare entity: string
  declare entityId: number | null
  declare before: unknown
  declare after: unknown
}

AuditEvent.init(
  {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    at: { type: DataTypes.DATE, allowNull: false },
    userId: { type: DataTypes.INTEGER, allowNull: true },
    action: { type: DataTypes.STRING(60), allowNull: false },
    entity: { type: DataTypes.STRING(60), allowNull: false },
    entityId: { type: DataTypes.INTEGER, allowNull: true },
    before: { type: DataTypes.JSON, allowNull: true },
    after: { type: DataTypes.JSON, allowNull: true },
  },
  { sequelize, tableName: 'audit_events', timestamps: false },
)
