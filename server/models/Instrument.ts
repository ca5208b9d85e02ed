import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute } from 'sequelize'
import type { InstrumentKind, InstrumentStatus } from '#shared/registers/constants'
import type { AccuracySpec } from '#shared/schemas/instrument'
import { sequelize } from '#server/utils/db'
import { Organization } from './Organization'
import { SpectralResponse } from './SpectralResponse'

/**
 * A customer's radiation thermometer. The spectral band is either rectangular
 * (bandLambda1Um–bandLambda2Um, µm) or a stored tabulated responsivity (spectralResponseId); a ratio
 * pyrometer has a second band the same way (band2…) and its emissivity-ratio setting.
 * Temperatures in kelvin. `serial`, `assetTag`, `maker` and `model` compare without regard to
 * ASCII case (COLLATE NOCASE, migration 0002), so prefix search and sorting use their indexes.
 * Archived, never deleted.
 */
export class Instrument extends Model<InferAttributes<Instrument>, InferCreationAttributes<Instrument>> {
  declare id: CreationOptional<number>
  declare organizationId: number
  declare serial: string
  declare assetTag: string | null
  declare maker: string
  declare model: string
  declare kind: InstrumentKind
  declare bandLambda1Um: number | null
  declare bandLambda2Um: number | null
  declare spectralResponseId: number | null
  /** A ratio pyrometer's second band: rectangular (µm) or a stored table (migration 0014); null for other kinds. */
  declare band2Lambda1Um: CreationOptional<number | null>
  declare band2Lambda2Um: CreationOptional<number | null>
  declare band2SpectralResponseId: CreationOptional<number | null>
  /** A ratio pyrometer's emissivity-ratio ("slope") setting k (migration 0014). */
  declare emissivityRatioSetting: CreationOptional<number | null>
  /** Distance-to-spot ratio D:S. */
  declare distanceToSpot: number | null
  declare rangeMinK: number
  declare rangeMaxK: number
  declare defaultEmissivity: number
  declare resolutionK: number
  declare accuracy: AccuracySpec
  declare calibrationIntervalMonths: number
  declare status: CreationOptional<InstrumentStatus>
  declare nextDueDate: string | null
  declare photoUploadId: number | null
  declare notes: string | null
  declare archived: CreationOptional<boolean>
  declare version: CreationOptional<number>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
  declare organization?: NonAttribute<Organization | null>
  declare spectralResponse?: NonAttribute<SpectralResponse | null>
}

Instrument.init(
  {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    organizationId: { type: DataTypes.INTEGER, allowNull: false },
    serial: { type: DataTypes.STRING(80), allowNull: false },
    assetTag: { type: DataTypes.STRING(60), allowNull: true },
    maker: { type: DataTypes.STRING(120), allowNull: false },
    model: { type: DataTypes.STRING(120), allowNull: false },
    kind: { type: DataTypes.STRING(40), allowNull: false },
    bandLambda1Um: { type: DataTypes.DOUBLE, allowNull: true },
    bandLambda2Um: { type: DataTypes.DOUBLE, allowNull: true },
    spectralResponseId: { type: DataTypes.INTEGER, allowNull: true },
    band2Lambda1Um: { type: DataTypes.DOUBLE, allowNull: true },
    band2Lambda2Um: { type: DataTypes.DOUBLE, allowNull: true },
    band2SpectralResponseId: { type: DataTypes.INTEGER, allowNull: true },
    emissivityRatioSetting: { type: DataTypes.DOUBLE, allowNull: true },
    distanceToSpot: { type: DataTypes.DOUBLE, allowNull: true },
    rangeMinK: { type: DataTypes.DOUBLE, allowNull: false },
    rangeMaxK: { type: DataTypes.DOUBLE, allowNull: false },
    defaultEmissivity: { type: DataTypes.DOUBLE, allowNull: false },
    resolutionK: { type: DataTypes.DOUBLE, allowNull: false },
    accuracy: { type: DataTypes.JSON, allowNull: false },
    calibrationIntervalMonths: { type: DataTypes.INTEGER, allowNull: false },
    status: { type: DataTypes.STRING(20), allowNull: false, defaultValue: 'active' },
    nextDueDate: { type: DataTypes.DATEONLY, allowNull: true },
    photoUploadId: { type: DataTypes.INTEGER, allowNull: true },
    notes: { type: DataTypes.TEXT, allowNull: true },
    archived: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, tableName: 'instruments', version: true },
)

Instrument.belongsTo(Organization, { as: 'organization', foreignKey: 'organizationId' })
Organization.hasMany(Instrument, { as: 'instruments', foreignKey: 'organizationId' })
Instrument.belongsTo(SpectralResponse, { as: 'spectralResponse', foreignKey: 'spectralResponseId' })
