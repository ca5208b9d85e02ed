import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize'
import type { CertificateDecision } from '#shared/quality/constants'
import { sequelize } from '#server/utils/db'

/**
 * What the laboratory decided for one certificate affected by a nonconformity (ISO/IEC 17025 7.10.1):
 * keep it (with the reason), amend it (the certificate is reopened: `revisionRunId` is the revision
 * run, whose certificate will be the amendment) or withdraw it. One decision per certificate and
 * nonconformity; never changed.
 */
export class NonconformityDecision extends Model<InferAttributes<NonconformityDecision>, InferCreationAttributes<NonconformityDecision>> {
  declare id: CreationOptional<number>
  declare nonconformityId: number
  declare certificateId: number
  declare decision: CertificateDecision
  declare reason: string
  declare revisionRunId: number | null
  declare decidedBy: number
  declare decidedAt: Date
  declare version: CreationOptional<number>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
}

NonconformityDecision.init(
  {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    nonconformityId: { type: DataTypes.INTEGER, allowNull: false },
    certificateId: { type: DataTypes.INTEGER, allowNull: false },
    decision: { type: DataTypes.STRING(10), allowNull: false },
    reason: { type: DataTypes.TEXT, allowNull: false },
    revisionRunId: { type: DataTypes.INTEGER, allowNull: true },
    decidedBy: { type: DataTypes.INTEGER, allowNull: false },
    decidedAt: { type: DataTypes.DATE, allowNull: false },
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, tableName: 'nonconformity_decisions', version: true },
)
