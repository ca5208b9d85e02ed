import { DataTypes, Model, type InferAttributes, type InferCreationAttributes } from 'sequelize'
import { sequelize } from '#server/utils/db'

/**
 * Who runs a scheduled job now (server/utils/lease.ts): one row per job, held by one server instance
 * until `expiresAt`. A holder that stops (or crashes) stops renewing, and the lease expires.
 */
export class TaskLease extends Model<InferAttributes<TaskLease>, InferCreationAttributes<TaskLease>> {
  declare name: string
  declare holder: string
  declare expiresAt: Date
}

TaskLease.init(
  {
    name: { type: DataTypes.STRING(60), primaryKey: true },
    holder: { type: DataTypes.STRING(64), allowNull: false },
    expiresAt: { type: DataTypes.DATE, allowNull: false },
  },
  { sequelize, tableName: 'task_leases', timestamps: false },
)
