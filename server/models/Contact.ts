import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize'
import { sequelize } from '#server/utils/db'
import { Organization } from './Organization'

/** A person at a customer organization. Deactivated, never deleted. */
export class Contact extends Model<InferAttributes<Contact>, InferCreationAttributes<Contact>> {
  declare id: CreationOptional<number>
  declare organizationId: number
  declare name: string
  declare email: string
  declare phone: string | null
  /** Receives recalibration reminders by e-mail. */
  declare receivesReminders: CreationOptional<boolean>
  declare active: CreationOptional<boolean>
  declare version: CreationOptional<number>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
}

Contact.init(
  {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    organizationId: { type: DataTypes.INTEGER, allowNull: false },
    name: { type: DataTypes.STRING(120), allowNull: false },
    email: { type: DataTypes.STRING(254), allowNull: false },
    phone: { type: DataTypes.STRING(40), allowNull: true },
    receivesReminders: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, tableName: 'contacts', version: true },
)

Contact.belongsTo(Organization, { as: 'organization', foreignKey: 'organizationId' })
Organization.hasMany(Contact, { as: 'contacts', foreignKey: 'organizationId' })
