import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize'
import { sequelize } from '#server/utils/db'

/** One counted event of a rate limit (server/utils/rateLimit.ts): a key and when it happened. */
export class ThrottleHit extends Model<InferAttributes<ThrottleHit>, InferCreationAttributes<ThrottleHit>> {
  declare id: CreationOptional<number>
  declare key: string
  /** Milliseconds since the epoch. */
  declare at: number
}

ThrottleHit.init(
  {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    key: { type: DataTypes.STRING(300), allowNull: false },
    at: { type: DataTypes.BIGINT, allowNull: false },
  },
  { sequelize, tableName: 'throttle_hits', timestamps: false },
)
