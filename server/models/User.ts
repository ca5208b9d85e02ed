import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type NonAttribute } from 'sequelize'
import type { Role } from '#shared/roles'
import { sequelize } from '#server/utils/db'
import { Organization } from './Organization'

/** A person who signs in. Never hard-deleted: deactivate instead. */
export class User extends Model<InferAttributes<User>, InferCreationAttributes<User>> {
  declare id: CreationOptional<number>
  declare email: string
  declare name: string
  declare role: Role
  /** scrypt hash (server/utils/password.ts, the scheme nuxt-auth-utils uses). */
  declare passwordHash: string
  declare organizationId: ForeignKey<Organization['id']> | null
  declare active: CreationOptional<boolean>
  declare version: CreationOptional<number>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
  declare organization?: NonAttribute<Organization | null>
}

User.init(
  {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    email: { type: DataTypes.STRING(254), allowNull: false, unique: true },
    name: { type: DataTypes.STRING(120), allowNull: false },
    role: { type: DataTypes.STRING(20), allowNull: false },
    passwordHash: { type: DataTypes.STRING(400), allowNull: false },
    organizationId: { type: DataTypes.INTEGER, allowNull: true },
    active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, tableName: 'users', version: true },
)

User.belongsTo(Organization, { as: 'organization', foreignKey: 'organizationId' })
Organization.hasMany(User, { as: 'users', foreignKey: 'organizationId' })
