import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize'
import type { ComplaintChannel, ComplaintStatus } from '#shared/quality/constants'
import { sequelize } from '#server/utils/db'

/**
 * A complaint (ISO/IEC 17025:2017 7.9): submitted by a customer in the portal or recorded by the
 * laboratory, about a certificate, an instrument or the service. Acknowledged by mail; investigated;
 * its outcome proposed and then approved by someone not involved in the work complained about
 * (`involvedUserIds`: who performed, changed, reviewed or signed that work, fixed when the complaint
 * was received); closed with a notice by mail. Never deleted.
 */
export class Complaint extends Model<InferAttributes<Complaint>, InferCreationAttributes<Complaint>> {
  declare id: CreationOptional<number>
  /** CP-YYYY-NNN. */
  declare number: string
  declare organizationId: number | null
  declare certificateId: number | null
  declare instrumentId: number | null
  declare channel: ComplaintChannel
  declare submittedBy: number
  declare receivedOn: string
  declare subject: string
  declare description: string
  declare status: CreationOptional<ComplaintStatus>
  declare involvedUserIds: CreationOptional<number[]>
  declare acknowledgedAt: Date | null
  declare investigation: string | null
  declare investigatedBy: number | null
  declare outcome: string | null
  declare outcomeProposedBy: number | null
  declare outcomeProposedAt: Date | null
  declare approvedBy: number | null
  declare approvedAt: Date | null
  declare closedAt: Date | null
  declare nonconformityId: number | null
  declare version: CreationOptional<number>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
}

Complaint.init(
  {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    number: { type: DataTypes.STRING(30), allowNull: false, unique: true },
    organizationId: { type: DataTypes.INTEGER, allowNull: true },
    certificateId: { type: DataTypes.INTEGER, allowNull: true },
    instrumentId: { type: DataTypes.INTEGER, allowNull: true },
    channel: { type: DataTypes.STRING(20), allowNull: false },
    submittedBy: { type: DataTypes.INTEGER, allowNull: false },
    receivedOn: { type: DataTypes.DATEONLY, allowNull: false },
    subject: { type: DataTypes.STRING(200), allowNull: false },
    description: { type: DataTypes.TEXT, allowNull: false },
    status: { type: DataTypes.STRING(20), allowNull: false, defaultValue: 'received' },
    involvedUserIds: { type: DataTypes.JSON, allowNull: false, defaultValue: [] },
    acknowledgedAt: { type: DataTypes.DATE, allowNull: true },
    investigation: { type: DataTypes.TEXT, allowNull: true },
    investigatedBy: { type: DataTypes.INTEGER, allowNull: true },
    outcome: { type: DataTypes.TEXT, allowNull: true },
    outcomeProposedBy: { type: DataTypes.INTEGER, allowNull: true },
    outcomeProposedAt: { type: DataTypes.DATE, allowNull: true },
    approvedBy: { type: DataTypes.INTEGER, allowNull: true },
    approvedAt: { type: DataTypes.DATE, allowNull: true },
    closedAt: { type: DataTypes.DATE, allowNull: true },
    nonconformityId: { type: DataTypes.INTEGER, allowNull: true },
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, tableName: 'complaints', version: true },
)
