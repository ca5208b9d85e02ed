import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize'
import type { EquipmentStatus, RangeUnit, ReferenceKind } from '#shared/registers/constants'
import { sequelize } from '#server/utils/db'

/**
 * A reference thermometer or ambient sensor of the laboratory (ISO/IEC 17025 6.4): contact
 * thermometers, transfer radiation thermometers, hygrometers, ambient sensors. Range and
 * uncertainty in `rangeUnit` (K or %RH). Calibrations are `EquipmentCalibration` rows with
 * equipmentType 'reference'. Archived, never deleted.
 */
export class ReferenceInstrument extends Model<InferAttributes<ReferenceInstrument>, InferCreationAttributes<ReferenceInstrument>> {
  declare id: CreationOptional<number>
  declare assetTag: string
  declare kind: ReferenceKind
  declare maker: string
  declare model: string
  declare serial: string
  declare rangeMin: number
  declare rangeMax: number
  declare rangeUnit: RangeUnit
  declare standardUncertainty: number
  declare uncertaintyUnit: RangeUnit
  declare status: CreationOptional<EquipmentStatus>
  /** Why the item is out of service or quarantined (a failed check and its nonconformity …); null in service. */
  declare statusReason: CreationOptional<string | null>
  declare notes: string | null
  declare archived: CreationOptional<boolean>
  declare version: CreationOptional<number>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
}

ReferenceInstrument.init(
  {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    assetTag: { type: DataTypes.STRING(60), allowNull: false, unique: true },
    kind: { type: DataTypes.STRING(40), allowNull: false },
    maker: { type: DataTypes.STRING(120), allowNull: false },
    model: { type: DataTypes.STRING(120), allowNull: false },
    serial: { type: DataTypes.STRING(80), allowNull: false },
    rangeMin: { type: DataTypes.DOUBLE, allowNull: false },
    rangeMax: { type: DataTypes.DOUBLE, allowNull: false },
    rangeUnit: { type: DataTypes.STRING(8), allowNull: false },
    standardUncertainty: { type: DataTypes.DOUBLE, allowNull: false },
    uncertaintyUnit: { type: DataTypes.STRING(8), allowNull: false },
    status: { type: DataTypes.STRING(20), allowNull: false, defaultValue: 'in-service' },
    statusReason: { type: DataTypes.TEXT, allowNull: true },
    notes: { type: DataTypes.TEXT, allowNull: true },
    archived: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, tableName: 'reference_instruments', version: true },
)
