import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize'
import { DEFAULT_CERTIFIED_BASIS, type CertifiedBasis, type EquipmentStatus, type SourceKind, type WavelengthMediumName } from '#shared/registers/constants'
import { sequelize } from '#server/utils/db'

/**
 * A blackbody reference source of the laboratory (ISO/IEC 17025 6.4). Temperatures in kelvin,
 * the aperture in mm, the emissivity with its standard uncertainty over the band it applies to (and,
 * optionally, a table of emissivity over wavelength). The certified data of its current certificate:
 * the correction table, the basis of the corrected value (cavity, surface or radiance temperature; for a
 * radiance temperature its band and the surroundings' temperature T_w0 at calibration) and the certified
 * expanded uncertainty U with its k. Its calibrations are `EquipmentCalibration` rows with equipmentType
 * 'source'. Archived, never deleted.
 */
export class BlackbodySource extends Model<InferAttributes<BlackbodySource>, InferCreationAttributes<BlackbodySource>> {
  declare id: CreationOptional<number>
  declare assetTag: string
  declare kind: SourceKind
  declare maker: string
  declare model: string
  declare serial: string
  declare apertureMm: number
  declare minTemperatureK: number
  declare maxTemperatureK: number
  declare emissivity: number
  declare emissivityU: number
  declare emissivityBandLambda1Um: number | null
  declare emissivityBandLambda2Um: number | null
  declare uniformityK: number
  declare stabilityK: number
  /** Emissivity over wavelength: rows [λ µm, ε, u(ε) k = 1], λ increasing; null when none is recorded. */
  declare emissivityTable: [number, number, number][] | null
  /** `[setPointK, correctionK]` rows from the source's certificate. */
  declare corrections: CreationOptional<[number, number][]>
  /**
   * What the corrected value is. Not given: the kind's own temperature (DEFAULT_CERTIFIED_BASIS), as
   * migration 0010 recorded for earlier sources.
   */
  declare certifiedBasis: CreationOptional<CertifiedBasis>
  /** A radiance temperature's band, µm, and whether its wavelengths are in vacuum or in air; null otherwise. */
  declare certifiedBandLambda1Um: number | null
  declare certifiedBandLambda2Um: number | null
  declare certifiedBandMedium: WavelengthMediumName | null
  /** The surroundings' temperature when the radiance temperature was certified (T_w0), K; null otherwise. */
  declare certifiedReflectedTemperatureK: number | null
  /** The certified expanded uncertainty U of the corrected value, K, and its coverage factor k (null: not recorded). */
  declare certifiedExpandedUncertaintyK: number | null
  declare certifiedCoverageFactor: number | null
  declare status: CreationOptional<EquipmentStatus>
  /** Why the item is out of service or quarantined (a failed check and its nonconformity …); null in service. */
  declare statusReason: CreationOptional<string | null>
  declare notes: string | null
  declare archived: CreationOptional<boolean>
  declare version: CreationOptional<number>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
}

BlackbodySource.init(
  {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    assetTag: { type: DataTypes.STRING(60), allowNull: false, unique: true },
    kind: { type: DataTypes.STRING(20), allowNull: false },
    maker: { type: DataTypes.STRING(120), allowNull: false },
    model: { type: DataTypes.STRING(120), allowNull: false },
    serial: { type: DataTypes.STRING(80), allowNull: false },
    apertureMm: { type: DataTypes.DOUBLE, allowNull: false },
    minTemperatureK: { type: DataTypes.DOUBLE, allowNull: false },
    maxTemperatureK: { type: DataTypes.DOUBLE, allowNull: false },
    emissivity: { type: DataTypes.DOUBLE, allowNull: false },
    emissivityU: { type: DataTypes.DOUBLE, allowNull: false },
    emissivityBandLambda1Um: { type: DataTypes.DOUBLE, allowNull: true },
    emissivityBandLambda2Um: { type: DataTypes.DOUBLE, allowNull: true },
    uniformityK: { type: DataTypes.DOUBLE, allowNull: false },
    stabilityK: { type: DataTypes.DOUBLE, allowNull: false },
    emissivityTable: { type: DataTypes.JSON, allowNull: true },
    corrections: { type: DataTypes.JSON, allowNull: false, defaultValue: [] },
    certifiedBasis: { type: DataTypes.STRING(30), allowNull: false },
    certifiedBandLambda1Um: { type: DataTypes.DOUBLE, allowNull: true },
    certifiedBandLambda2Um: { type: DataTypes.DOUBLE, allowNull: true },
    certifiedBandMedium: { type: DataTypes.STRING(10), allowNull: true },
    certifiedReflectedTemperatureK: { type: DataTypes.DOUBLE, allowNull: true },
    certifiedExpandedUncertaintyK: { type: DataTypes.DOUBLE, allowNull: true },
    certifiedCoverageFactor: { type: DataTypes.DOUBLE, allowNull: true },
    status: { type: DataTypes.STRING(20), allowNull: false, defaultValue: 'in-service' },
    statusReason: { type: DataTypes.TEXT, allowNull: true },
    notes: { type: DataTypes.TEXT, allowNull: true },
    archived: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  {
    sequelize,
    tableName: 'blackbody_sources',
    version: true,
    hooks: {
      beforeValidate: (s: BlackbodySource) => {
        if (s.certifiedBasis == null && s.kind) s.certifiedBasis = DEFAULT_CERTIFIED_BASIS[s.kind]
      },
    },
  },
)
