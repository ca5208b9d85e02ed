import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize'
import { sequelize } from '#server/utils/db'

/**
 * The receipt of a customer's item for one run (ISO/IEC 17025 7.4): when and by whom it was
 * received, how it was packed, its physical condition and accessories, deviations found, and
 * whether the customer was consulted and what they decided. The certificate's "condition on
 * receipt" is this record, word for word; no certificate is issued without one.
 */
export class ItemReceipt extends Model<InferAttributes<ItemReceipt>, InferCreationAttributes<ItemReceipt>> {
  declare id: CreationOptional<number>
  declare runId: number
  declare receivedOn: string
  declare receivedBy: number
  declare packaging: string
  declare condition: string
  declare accessories: string | null
  declare deviations: string | null
  declare customerConsulted: boolean
  declare customerDecision: string | null
  declare version: CreationOptional<number>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
}

ItemReceipt.init(
  {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    runId: { type: DataTypes.INTEGER, allowNull: false, unique: true },
    receivedOn: { type: DataTypes.DATEONLY, allowNull: false },
    receivedBy: { type: DataTypes.INTEGER, allowNull: false },
    packaging: { type: DataTypes.TEXT, allowNull: false },
    condition: { type: DataTypes.TEXT, allowNull: false },
    accessories: { type: DataTypes.TEXT, allowNull: true },
    deviations: { type: DataTypes.TEXT, allowNull: true },
    customerConsulted: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    customerDecision: { type: DataTypes.TEXT, allowNull: true },
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, tableName: 'item_receipts', version: true },
)
