import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize'
import { sequelize } from '#server/utils/db'

/**
 * The bytes of a stored file, by their SHA-256, when files are kept in the database
 * (FILE_STORAGE=database, the default on PostgreSQL; server/utils/fileStore.ts). Written once, never changed.
 */
export class FileContent extends Model<InferAttributes<FileContent>, InferCreationAttributes<FileContent>> {
  declare sha256: string
  declare size: number
  declare data: Buffer
  declare createdAt: CreationOptional<Date>
}

FileContent.init(
  {
    sha256: { type: DataTypes.STRING(64), primaryKey: true },
    size: { type: DataTypes.INTEGER, allowNull: false },
    data: { type: DataTypes.BLOB, allowNull: false },
    createdAt: DataTypes.DATE,
  },
  { sequelize, tableName: 'file_contents', updatedAt: false },
)
