import { DataTypes, Model, type InferAttributes, type InferCreationAttributes } from 'sequelize'
import { sequelize } from '#server/utils/db'

/**
 * The last certificate sequence used, per year of issue (year 0 when numbers carry no year).
 * Advanced by one inside the issuing transaction (BEGIN IMMEDIATE), so numbers have no gaps and
 * are never reused; triggers (migration 0004) refuse any other change.
 */
export class CertificateCounter extends Model<InferAttributes<CertificateCounter>, InferCreationAttributes<CertificateCounter>> {
  declare year: number
  declare lastSequence: number
}

CertificateCounter.init(
  {
    year: { type: DataTypes.INTEGER, primaryKey: true },
    lastSequence: { type: DataTypes.INTEGER, allowNull: false },
  },
  { sequelize, tableName: 'certificate_counters', timestamps: false },
)
