import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize'
import type { InvoiceOrigin, InvoiceStatus } from '#shared/billing/constants'
import type { BillingLine } from '#shared/billing/lines'
import { sequelize } from '#server/utils/db'

/**
 * An invoice for an order (one per order): numbered gap-free in its own series per year, its lines
 * and totals as issued, the due date from the payment terms, and its PDF stored by SHA-256. What it
 * states never changes (triggers, migration 0016): a change of what is owed is a credit note. Only
 * `status` (open → paid or credited) and `paidAt` move.
 */
export class Invoice extends Model<InferAttributes<Invoice>, InferCreationAttributes<Invoice>> {
  declare id: CreationOptional<number>
  declare number: string
  declare counterYear: number
  declare sequence: number
  declare orderId: number
  declare organizationId: number
  declare issueDate: string
  declare dueDate: string
  declare currency: string
  declare taxRateBp: number
  declare lines: BillingLine[]
  declare netMinor: number
  declare taxMinor: number
  declare grossMinor: number
  declare purchaseOrder: string | null
  declare origin: InvoiceOrigin
  declare pdfSha256: string
  declare pdfSize: number
  declare status: CreationOptional<InvoiceStatus>
  declare paidAt: Date | null
  declare createdBy: number | null
  declare version: CreationOptional<number>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
}

Invoice.init(
  {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    number: { type: DataTypes.STRING(30), allowNull: false, unique: true },
    counterYear: { type: DataTypes.INTEGER, allowNull: false },
    sequence: { type: DataTypes.INTEGER, allowNull: false },
    orderId: { type: DataTypes.INTEGER, allowNull: false, unique: true },
    organizationId: { type: DataTypes.INTEGER, allowNull: false },
    issueDate: { type: DataTypes.DATEONLY, allowNull: false },
    dueDate: { type: DataTypes.DATEONLY, allowNull: false },
    currency: { type: DataTypes.STRING(3), allowNull: false },
    taxRateBp: { type: DataTypes.INTEGER, allowNull: false },
    lines: { type: DataTypes.JSON, allowNull: false },
    netMinor: { type: DataTypes.INTEGER, allowNull: false },
    taxMinor: { type: DataTypes.INTEGER, allowNull: false },
    grossMinor: { type: DataTypes.INTEGER, allowNull: false },
    purchaseOrder: { type: DataTypes.STRING(80), allowNull: true },
    origin: { type: DataTypes.STRING(10), allowNull: false },
    pdfSha256: { type: DataTypes.STRING(64), allowNull: false },
    pdfSize: { type: DataTypes.INTEGER, allowNull: false },
    status: { type: DataTypes.STRING(10), allowNull: false, defaultValue: 'open' },
    paidAt: { type: DataTypes.DATE, allowNull: true },
    createdBy: { type: DataTypes.INTEGER, allowNull: true },
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, tableName: 'invoices', version: true },
)
