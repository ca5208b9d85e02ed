import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize'
import { sequelize } from '#server/utils/db'

/**
 * An order: made when the customer accepts a quote with its purchase-order number; one per request.
 * Where it stands is read from the records of its runs (receipt, points, review, certificate —
 * shared/billing/orderProgress.ts); the return is recorded here, with the carrier's tracking reference.
 */
export class Order extends Model<InferAttributes<Order>, InferCreationAttributes<Order>> {
  declare id: CreationOptional<number>
  declare number: string
  declare quoteId: number
  declare requestId: number
  declare organizationId: number
  declare purchaseOrder: string
  declare placedAt: Date
  declare placedBy: number
  declare returnedOn: string | null
  declare carrier: string | null
  declare trackingReference: string | null
  declare returnedBy: number | null
  declare version: CreationOptional<number>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
}

Order.init(
  {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    number: { type: DataTypes.STRING(30), allowNull: false, unique: true },
    quoteId: { type: DataTypes.INTEGER, allowNull: false, unique: true },
    requestId: { type: DataTypes.INTEGER, allowNull: false, unique: true },
    organizationId: { type: DataTypes.INTEGER, allowNull: false },
    purchaseOrder: { type: DataTypes.STRING(80), allowNull: false },
    placedAt: { type: DataTypes.DATE, allowNull: false },
    placedBy: { type: DataTypes.INTEGER, allowNull: false },
    returnedOn: { type: DataTypes.DATEONLY, allowNull: true },
    carrier: { type: DataTypes.STRING(80), allowNull: true },
    trackingReference: { type: DataTypes.STRING(120), allowNull: true },
    returnedBy: { type: DataTypes.INTEGER, allowNull: true },
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, tableName: 'orders', version: true },
)
