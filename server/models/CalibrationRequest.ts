import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize'
import type { AccuracySpec } from '#shared/schemas/instrument'
import type { AgreementMethod, RequestStatus } from '#shared/schemas/request'
import type { RequestTerms } from '#shared/types/requests'
import { sequelize } from '#server/utils/db'

/**
 * A customer's request to have instruments calibrated, and its contract review (ISO/IEC 17025
 * 7.1): the customer's requirements, the terms the laboratory offers after reviewing them (with
 * its capability check), and the agreement — given by the customer in the portal, or recorded by
 * the laboratory with how it was given. Only agreed requests become runs. `response` is what the
 * customer reads; nothing lab-internal is stored here.
 */
export class CalibrationRequest extends Model<InferAttributes<CalibrationRequest>, InferCreationAttributes<CalibrationRequest>> {
  declare id: CreationOptional<number>
  declare organizationId: number
  declare requestedBy: number
  declare instrumentIds: number[]
  declare preferredDate: string | null
  declare notes: string | null
  declare requirements: string | null
  declare specification: AccuracySpec | null
  declare terms: RequestTerms | null
  /** Increases with every review; an agreement names the version it agreed to. */
  declare termsVersion: CreationOptional<number>
  declare reviewedBy: number | null
  declare reviewedAt: Date | null
  declare agreedTermsVersion: number | null
  declare agreedAt: Date | null
  declare agreedBy: number | null
  declare agreementMethod: AgreementMethod | null
  declare agreementNote: string | null
  declare status: CreationOptional<RequestStatus>
  declare handledBy: number | null
  declare handledAt: Date | null
  declare response: string | null
  /** Runs opened when the request was accepted. */
  declare runIds: CreationOptional<number[]>
  declare version: CreationOptional<number>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
}

CalibrationRequest.init(
  {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    organizationId: { type: DataTypes.INTEGER, allowNull: false },
    requestedBy: { type: DataTypes.INTEGER, allowNull: false },
    instrumentIds: { type: DataTypes.JSON, allowNull: false },
    preferredDate: { type: DataTypes.DATEONLY, allowNull: true },
    notes: { type: DataTypes.TEXT, allowNull: true },
    requirements: { type: DataTypes.TEXT, allowNull: true },
    specification: { type: DataTypes.JSON, allowNull: true },
    terms: { type: DataTypes.JSON, allowNull: true },
    termsVersion: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    reviewedBy: { type: DataTypes.INTEGER, allowNull: true },
    reviewedAt: { type: DataTypes.DATE, allowNull: true },
    agreedTermsVersion: { type: DataTypes.INTEGER, allowNull: true },
    agreedAt: { type: DataTypes.DATE, allowNull: true },
    agreedBy: { type: DataTypes.INTEGER, allowNull: true },
    agreementMethod: { type: DataTypes.STRING(20), allowNull: true },
    agreementNote: { type: DataTypes.TEXT, allowNull: true },
    status: { type: DataTypes.STRING(20), allowNull: false, defaultValue: 'open' },
    handledBy: { type: DataTypes.INTEGER, allowNull: true },
    handledAt: { type: DataTypes.DATE, allowNull: true },
    response: { type: DataTypes.TEXT, allowNull: true },
    runIds: { type: DataTypes.JSON, allowNull: false, defaultValue: [] },
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, tableName: 'calibration_requests', version: true },
)
