import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize'
import { sequelize } from '#server/utils/db'

/** Why a job failed, as the poll answers it. */
export interface CalculationJobError {
  statusCode: number
  message: string
  fields?: Record<string, string>
}

/**
 * A long calculation (a Monte Carlo run) that reports progress (server/services/calculations/jobs.ts).
 * The instance that started it runs it and writes its progress here, so a poll answered by any
 * instance sees it; `heartbeatAt` tells whether that instance is still alive.
 */
export class CalculationJob extends Model<InferAttributes<CalculationJob>, InferCreationAttributes<CalculationJob>> {
  declare id: string
  declare userId: number
  declare status: 'running' | 'done' | 'failed'
  declare done: number
  declare total: number
  declare result: unknown
  declare error: CreationOptional<CalculationJobError | null>
  declare instanceId: string
  declare heartbeatAt: Date
  declare startedAt: Date
  declare endedAt: CreationOptional<Date | null>
}

CalculationJob.init(
  {
    id: { type: DataTypes.STRING(36), primaryKey: true },
    userId: { type: DataTypes.INTEGER, allowNull: false },
    status: { type: DataTypes.STRING(10), allowNull: false },
    done: { type: DataTypes.INTEGER, allowNull: false },
    total: { type: DataTypes.INTEGER, allowNull: false },
    result: { type: DataTypes.JSON, allowNull: true },
    error: { type: DataTypes.JSON, allowNull: true },
    instanceId: { type: DataTypes.STRING(64), allowNull: false },
    heartbeatAt: { type: DataTypes.DATE, allowNull: false },
    startedAt: { type: DataTypes.DATE, allowNull: false },
    endedAt: { type: DataTypes.DATE, allowNull: true },
  },
  { sequelize, tableName: 'calculation_jobs', timestamps: false },
)
