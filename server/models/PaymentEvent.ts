import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize'
import { sequelize } from '#server/utils/db'

/**
 * A verified event from the payment provider, kept once by its id (unique): the same event again —
 * a retry or a replay — finds its row and changes nothing. `outcome` says what it did (`applied`,
 * `ignored`, `unmatched`, `amount-mismatch`). Never changed or deleted.
 */
export class PaymentEvent extends Model<InferAttributes<PaymentEvent>, InferCreationAttributes<PaymentEvent>> {
  declare id: CreationOptional<number>
  declare eventId: string
  declare type: string
  declare objectId: string | null
  declare outcome: string
  declare invoiceId: number | null
  declare receivedAt: Date
  declare createdAt: CreationOptional<Date>
}

PaymentEvent.init(
  {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    eventId: { type: DataTypes.STRING(200), allowNull: false, unique: true },
    type: { type: DataTypes.STRING(100), allowNull: false },
    objectId: { type: DataTypes.STRING(200), allowNull: true },
    outcome: { type: DataTypes.STRING(30), allowNull: false },
    invoiceId: { type: DataTypes.INTEGER, allowNull: true },
    receivedAt: { type: DataTypes.DATE, allowNull: false },
    createdAt: DataTypes.DATE,
  },
  { sequelize, tableName: 'payment_events', updatedAt: false },
)
