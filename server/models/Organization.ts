import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize'
import { sequelize } from '#server/utils/db'

/** A customer company. The laboratory itself is configured once and is not a row here. */
export class Organization extends Model<InferAttributes<Organization>, InferCreationAttributes<Organization>> {
  declare id: CreationOptional<number>
  declare name: string
  /** Addresses that receive certificates and reminders. */
  declare contactEmails: CreationOptional<string[]>
  /** Address printed on certificates (migration 0002): street lines separated by newlines. */
  declare addressLines: CreationOptional<string | null>
  declare city: CreationOptional<string | null>
  declare postcode: CreationOptional<string | null>
  declare country: CreationOptional<string | null>
  declare active: CreationOptional<boolean>
  declare version: CreationOptional<number>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
}

Organization.init(
  {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    name: { type: DataTypes.STRING(160), allowNull: false, unique: true },
    contactEmails: { type: DataTypes.JSON, allowNull: false, defaultValue: [] },
    addressLines: { type: DataTypes.TEXT, allowNull: true },
    city: { type: DataTypes.STRING(120), allowNull: true },
    postcode: { type: DataTypes.STRING(20), allowNull: true },
    country: { type: DataTypes.STRING(80), allowNull: true },
    active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, tableName: 'organizations', version: true },
)
