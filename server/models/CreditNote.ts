import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize'
import type { CreditCause } from '#shared/billing/constants'
import type { CreditLine } from '#shared/billing/lines'
import { sequelize } from '#server/utils/db'

/**
 * A credit note against an invoice, numbered gap-free in its own series: issued when a withdrawal
 * or an amendment of a certificate lowers what is owed, or by hand. Lines name the invoice line
 * they give back; amounts are positive (what is given back). Never changed or deleted.
 */
export class CreditNote extends Model<InferAttributes<CreditNote>, InferCreationAttributes<CreditNote>> {
  declare id: CreationOptional<number>
  declare number: string
  declare counterYear: number
  declare sequence: number
  declare invoiceId: number
  declare organizationId: number
  declare issueDate: string
  declare cause: CreditCause
  declare reason: string
  declare certificateId: number | null
  declare lines: CreditLine[]
  declare netMinor: number
  declare taxMinor: number
  declare grossMinor: number
  declare currency: string
  declare pdfSha256: string
  declare pdfSize: number
  declare createdBy: number | null
  declare version: CreationOptional<number>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
}

CreditNote.init(
  {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    number: { type: DataTypes.STRING(30), allowNull: false, unique: true },
    counterYear: { type: DataTypes.INTEGER, allowNull: false },
    sequence: { type: DataTypes.INTEGER, allowNull: false },
    invoiceId: { type: DataTypes.INTEGER, allowNull: false },
    organizationId: { type: DataTypes.INTEGER, allowNull: false },
    issueDate: { type: DataTypes.DATEONLY, allowNull: false },
    cause: { type: DataTypes.STRING(12), allowNull: false },
    reason: { type: DataTypes.TEXT, allowNull: false },
    certificateId: { type: DataTypes.INTEGER, allowNull: true },
    lines: { type: DataTypes.JSON, allowNull: false },
    netMinor: { type: DataTypes.INTEGER, allowNull: false },
    taxMinor: { type: DataTypes.INTEGER, allowNull: false },
    grossMinor: { type: DataTypes.INTEGER, allowNull: false },
    currency: { type: DataTypes.STRING(3), allowNull: false },
    pdfSha256: { type: DataTypes.STRING(64), allowNull: false },
    pdfSize: { type: DataTypes.INTEGER, allowNull: false },
    createdBy: { type: DataTypes.INTEGER, allowNull: true },
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, tableName: 'credit_notes' },
)
