import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize'
import type { AttemptStatus } from '#shared/billing/constants'
import { sequelize } from '#server/utils/db'

/**
 * A customer's start of a card payment: the hosted checkout session made for an invoice's balance.
 * Its status follows verified provider events only (paid, failed with the reason, expired).
 */
export class PaymentAttempt extends Model<InferAttributes<PaymentAttempt>, InferCreationAttributes<PaymentAttempt>> {
  declare id: CreationOptional<number>
  declare invoiceId: number
  declare provider: string
  declare sessionId: string | null
  declare amountMinor: number
  declare currency: string
  declare status: CreationOptional<AttemptStatus>
  declare failure: string | null
  declare completedAt: Date | null
  declare createdBy: number
  declare version: CreationOptional<number>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
}

PaymentAttempt.init(
  {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    invoiceId: { type: DataTypes.INTEGER, allowNull: false },
    provider: { type: DataTypes.STRING(20), allowNull: false },
    sessionId: { type: DataTypes.STRING(200), allowNull: true, unique: true },
    amountMinor: { type: DataTypes.INTEGER, allowNull: false },
    currency: { type: DataTypes.STRING(3), allowNull: false },
    status: { type: DataTypes.STRING(10), allowNull: false, defaultValue: 'open' },
    failure: { type: DataTypes.TEXT, allowNull: true },
    completedAt: { type: DataTypes.DATE, allowNull: true },
    createdBy: { type: DataTypes.INTEGER, allowNull: false },
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, tableName: 'payment_attempts', version: true },
)
