import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes } from 'sequelize'
import { sequelize } from '#server/utils/db'
import type { User } from './User'

/**
 * One signed-in browser. The sealed session cookie carries the id; every request checks that the
 * record exists, has not expired and has not been revoked (server/utils/sessions.ts).
 */
export class UserSession extends Model<InferAttributes<UserSession>, InferCreationAttributes<UserSession>> {
  /** 32 random bytes, base64url. */
  declare id: string
  declare userId: ForeignKey<User['id']>
  declare createdAt: CreationOptional<Date>
  declare expiresAt: Date
  declare revokedAt: Date | null
  /** `sign-out`, `password-reset`, `deactivated`, `role-changed` … */
  declare revokedReason: string | null
  declare address: string | null
  declare userAgent: string | null
}

UserSession.init(
  {
    id: { type: DataTypes.STRING(64), primaryKey: true },
    userId: { type: DataTypes.INTEGER, allowNull: false },
    createdAt: DataTypes.DATE,
    expiresAt: { type: DataTypes.DATE, allowNull: false },
    revokedAt: { type: DataTypes.DATE, allowNull: true },
    revokedReason: { type: DataTypes.STRING(40), allowNull: true },
    address: { type: DataTypes.STRING(100), allowNull: true },
    userAgent: { type: DataTypes.STRING(300), allowNull: true },
  },
  { sequelize, tableName: 'user_sessions', updatedAt: false },
)
