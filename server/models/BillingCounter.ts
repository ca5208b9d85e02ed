import { DataTypes, Model, type InferAttributes, type InferCreationAttributes } from 'sequelize'
import { sequelize } from '#server/utils/db'

/**
 * The last number used in a billing series (`quote`, `order`, `invoice`, `credit-note`) per year.
 * Advanced by one inside the transaction that issues the document (server/services/billing/counters.ts),
 * so invoice and credit-note numbers have no gaps and are never reused; triggers (migration 0016)
 * refuse any other change.
 */
export class BillingCounter extends Model<InferAttributes<BillingCounter>, InferCreationAttributes<BillingCounter>> {
  declare series: string
  declare year: number
  declare lastSequence: number
}

BillingCounter.init(
  {
    series: { type: DataTypes.STRING(20), primaryKey: true },
    year: { type: DataTypes.INTEGER, primaryKey: true },
    lastSequence: { type: DataTypes.INTEGER, allowNull: false },
  },
  { sequelize, tableName: 'billing_counters', timestamps: false },
)
