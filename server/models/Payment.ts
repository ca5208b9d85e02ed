import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize'
import type { PaymentMethod } from '#shared/billing/constants'
import { sequelize } from '#server/utils/db'

/**
 * Money received against an invoice: a card payment, written only from a verified provider event
 * (`providerReference` = the checkout session, unique — one payment per session however many events
 * say so), or a bank transfer the laboratory recorded by hand. Never changed or deleted.
 */
export class Payment extends Model<InferAttributes<Payment>, InferCreationAttributes<Payment>> {
  declare id: CreationOptional<number>
  declare invoiceId: number
  declare organizationId: number
  declare method: PaymentMethod
  declare amountMinor: number
  declare currency: string
  declare receivedOn: string
  declare reference: string
  declare provider: string | null
  declare providerReference: string | null
  declare eventId: string | null
  declare recordedBy: number | null
  declare version: CreationOptional<number>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
}

Payment.init(
  {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    invoiceId: { type: DataTypes.INTEGER, allowNull: false },
    organizationId: { type: DataTypes.INTEGER, allowNull: false },
    method: { type: DataTypes.STRING(20), allowNull: false },
    amountMinor: { type: DataTypes.INTEGER, allowNull: false },
    currency: { type: DataTypes.STRING(3), allowNull: false },
    receivedOn: { type: DataTypes.DATEONLY, allowNull: false },
    reference: { type: DataTypes.STRING(200), allowNull: false },
    provider: { type: DataTypes.STRING(20), allowNull: true },
    providerReference: { type: DataTypes.STRING(200), allowNull: true, unique: true },
    eventId: { type: DataTypes.STRING(200), allowNull: true },
    recordedBy: { type: DataTypes.INTEGER, allowNull: true },
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, tableName: 'payments' },
)
