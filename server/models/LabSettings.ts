import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize'
import { sequelize } from '#server/utils/db'

/**
 * The laboratory itself, as its certificates name it (one row): name and address, accreditation,
 * how certificates are numbered (`BL-2026-00042`), the functions a signatory may sign as, and the
 * standard statements printed on every certificate. Changed by an administrator, with a version.
 */
export class LabSettings extends Model<InferAttributes<LabSettings>, InferCreationAttributes<LabSettings>> {
  declare id: CreationOptional<number>
  declare name: string
  /** Street lines separated by newlines. */
  declare addressLines: string
  declare city: string
  declare postcode: string | null
  declare country: string
  declare email: string | null
  declare phone: string | null
  declare accreditationBody: string
  declare accreditationNumber: string
  declare numberPrefix: string
  declare numberIncludesYear: boolean
  declare numberDigits: number
  declare signatoryFunctions: string[]
  declare traceabilityStatement: string
  declare decisionRuleStatement: string
  declare itemsStatement: string
  declare reproductionStatement: string | null
  /** IANA time zone of the laboratory: its "today" for due dates, reminders and form defaults. */
  declare timeZone: CreationOptional<string>
  declare version: CreationOptional<number>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
}

LabSettings.init(
  {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    name: { type: DataTypes.STRING(200), allowNull: false },
    addressLines: { type: DataTypes.TEXT, allowNull: false },
    city: { type: DataTypes.STRING(120), allowNull: false },
    postcode: { type: DataTypes.STRING(20), allowNull: true },
    country: { type: DataTypes.STRING(80), allowNull: false },
    email: { type: DataTypes.STRING(254), allowNull: true },
    phone: { type: DataTypes.STRING(40), allowNull: true },
    accreditationBody: { type: DataTypes.STRING(160), allowNull: false },
    accreditationNumber: { type: DataTypes.STRING(60), allowNull: false },
    numberPrefix: { type: DataTypes.STRING(12), allowNull: false },
    numberIncludesYear: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    numberDigits: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 5 },
    signatoryFunctions: { type: DataTypes.JSON, allowNull: false },
    traceabilityStatement: { type: DataTypes.TEXT, allowNull: false },
    decisionRuleStatement: { type: DataTypes.TEXT, allowNull: false },
    itemsStatement: { type: DataTypes.TEXT, allowNull: false },
    reproductionStatement: { type: DataTypes.TEXT, allowNull: true },
    timeZone: { type: DataTypes.STRING(64), allowNull: false, defaultValue: 'Europe/London' },
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, tableName: 'lab_settings', version: true },
)
