import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize'
import type { PriceExtras, PriceItem } from '#shared/billing/lines'
import { sequelize } from '#server/utils/db'

/**
 * One version of the laboratory's price list: prices per procedure or kind of instrument (each with
 * the points it includes and the price of every further point), the extras, the currency, the tax
 * rate (basis points), payment terms and how long quotes stand. Every save is a new version
 * (`versionNumber` 1, 2 …); a version never changes (triggers, migration 0016). The highest is current.
 */
export class PriceList extends Model<InferAttributes<PriceList>, InferCreationAttributes<PriceList>> {
  declare id: CreationOptional<number>
  declare versionNumber: number
  declare currency: string
  declare taxRateBp: number
  declare paymentTermsDays: number
  declare quoteValidDays: number
  declare bankDetails: string | null
  declare note: string | null
  declare items: PriceItem[]
  declare extras: PriceExtras
  declare createdBy: number | null
  declare version: CreationOptional<number>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
}

PriceList.init(
  {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    versionNumber: { type: DataTypes.INTEGER, allowNull: false, unique: true },
    currency: { type: DataTypes.STRING(3), allowNull: false },
    taxRateBp: { type: DataTypes.INTEGER, allowNull: false },
    paymentTermsDays: { type: DataTypes.INTEGER, allowNull: false },
    quoteValidDays: { type: DataTypes.INTEGER, allowNull: false },
    bankDetails: { type: DataTypes.TEXT, allowNull: true },
    note: { type: DataTypes.TEXT, allowNull: true },
    items: { type: DataTypes.JSON, allowNull: false },
    extras: { type: DataTypes.JSON, allowNull: false },
    createdBy: { type: DataTypes.INTEGER, allowNull: true },
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, tableName: 'price_lists' },
)
