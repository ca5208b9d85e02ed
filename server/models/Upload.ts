import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize'
import type { UploadPurpose } from '#shared/registers/constants'
import { sequelize } from '#server/utils/db'

/**
 * An uploaded file's metadata. The bytes live under the data directory, named by their
 * SHA-256 (`<data dir>/ab/abcdef…`), so the same content is stored once; `originalName` is kept
 * for display only and never used as a path. Uploads are never changed or deleted.
 */
export class Upload extends Model<InferAttributes<Upload>, InferCreationAttributes<Upload>> {
  declare id: CreationOptional<number>
  declare sha256: string
  declare size: number
  /** Detected from the content (magic bytes, or valid UTF-8 CSV). */
  declare mimeType: string
  declare originalName: string
  declare purpose: UploadPurpose
  /** The owning organization for instrument photos; null for the laboratory's own files. */
  declare organizationId: number | null
  declare uploadedBy: number | null
  declare version: CreationOptional<number>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
}

Upload.init(
  {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    sha256: { type: DataTypes.STRING(64), allowNull: false },
    size: { type: DataTypes.INTEGER, allowNull: false },
    mimeType: { type: DataTypes.STRING(80), allowNull: false },
    originalName: { type: DataTypes.STRING(200), allowNull: false },
    purpose: { type: DataTypes.STRING(40), allowNull: false },
    organizationId: { type: DataTypes.INTEGER, allowNull: true },
    uploadedBy: { type: DataTypes.INTEGER, allowNull: true },
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, tableName: 'uploads', version: true },
)
