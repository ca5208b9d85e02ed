import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize'
import type { QuoteStatus } from '#shared/billing/constants'
import type { BillingLine } from '#shared/billing/lines'
import { sequelize } from '#server/utils/db'

/**
 * A quote for a reviewed calibration request: lines first taken from the price list and edited by
 * the laboratory while a draft, the currency and tax rate of that list, the totals. Sent, the
 * customer sees it and accepts it with a purchase-order number (which makes the order) or declines
 * it. It prices the request's terms of `termsVersion`: new terms make it stale.
 */
export class Quote extends Model<InferAttributes<Quote>, InferCreationAttributes<Quote>> {
  declare id: CreationOptional<number>
  declare number: string
  declare requestId: number
  declare organizationId: number
  declare termsVersion: number
  declare status: CreationOptional<QuoteStatus>
  declare priceListId: number | null
  declare currency: string
  declare taxRateBp: number
  declare lines: BillingLine[]
  declare netMinor: number
  declare taxMinor: number
  declare grossMinor: number
  declare message: string | null
  declare validUntil: string | null
  declare pdfSha256: string | null
  declare sentAt: Date | null
  declare sentBy: number | null
  declare respondedAt: Date | null
  declare respondedBy: number | null
  declare purchaseOrder: string | null
  declare declineReason: string | null
  declare createdBy: number | null
  declare version: CreationOptional<number>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
}

Quote.init(
  {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    number: { type: DataTypes.STRING(30), allowNull: false, unique: true },
    requestId: { type: DataTypes.INTEGER, allowNull: false },
    organizationId: { type: DataTypes.INTEGER, allowNull: false },
    termsVersion: { type: DataTypes.INTEGER, allowNull: false },
    status: { type: DataTypes.STRING(12), allowNull: false, defaultValue: 'draft' },
    priceListId: { type: DataTypes.INTEGER, allowNull: true },
    currency: { type: DataTypes.STRING(3), allowNull: false },
    taxRateBp: { type: DataTypes.INTEGER, allowNull: false },
    lines: { type: DataTypes.JSON, allowNull: false },
    netMinor: { type: DataTypes.INTEGER, allowNull: false },
    taxMinor: { type: DataTypes.INTEGER, allowNull: false },
    grossMinor: { type: DataTypes.INTEGER, allowNull: false },
    message: { type: DataTypes.TEXT, allowNull: true },
    validUntil: { type: DataTypes.DATEONLY, allowNull: true },
    pdfSha256: { type: DataTypes.STRING(64), allowNull: true },
    sentAt: { type: DataTypes.DATE, allowNull: true },
    sentBy: { type: DataTypes.INTEGER, allowNull: true },
    respondedAt: { type: DataTypes.DATE, allowNull: true },
    respondedBy: { type: DataTypes.INTEGER, allowNull: true },
    purchaseOrder: { type: DataTypes.STRING(80), allowNull: true },
    declineReason: { type: DataTypes.TEXT, allowNull: true },
    createdBy: { type: DataTypes.INTEGER, allowNull: true },
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, tableName: 'quotes', version: true },
)
