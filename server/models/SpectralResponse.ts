import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize'
import { sequelize } from '#server/utils/db'

/**
 * A tabulated relative spectral responsivity R(λ), stored once and shared by every instrument
 * of a model. `points` are normalized (peak 1, see shared/registers/responsivity.ts) and
 * `sha256` is the hash of their canonical text: the same curve posted twice is one row.
 */
export class SpectralResponse extends Model<InferAttributes<SpectralResponse>, InferCreationAttributes<SpectralResponse>> {
  declare id: CreationOptional<number>
  declare name: string
  declare sha256: string
  /** `[wavelengthUm, relativeResponse]`, wavelengths strictly increasing. */
  declare points: [number, number][]
  declare archived: CreationOptional<boolean>
  declare version: CreationOptional<number>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
}

SpectralResponse.init(
  {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    name: { type: DataTypes.STRING(120), allowNull: false, unique: true },
    sha256: { type: DataTypes.STRING(64), allowNull: false, unique: true },
    points: { type: DataTypes.JSON, allowNull: false },
    archived: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, tableName: 'spectral_responses', version: true },
)
