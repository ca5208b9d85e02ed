import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize'
import type { CertificateStatus } from '#shared/certificates/constants'
import { sequelize } from '#server/utils/db'

/**
 * One issued revision of a calibration certificate (ISO/IEC 17025 7.8): the number (with its
 * revision suffix), the approved run it reports, the electronic signature (who, when, as what, and
 * that it means "authorized for issue"), the verification code, and the SHA-256 of the stored PDF.
 * `content` keeps the exact data the PDF was built from. The digital calibration certificate (DCC
 * XML, embedding the PDF) is stored the same way, its SHA-256 and size in `dccSha256`/`dccSize`
 * (null only for revisions issued before DCCs existed, until their DCC is first built). Never
 * deleted; after issue only the status moves (valid → superseded by an amendment, or → withdrawn),
 * and a missing DCC may be filled in once, enforced by triggers (migrations 0004 and 0012).
 */
export class Certificate extends Model<InferAttributes<Certificate>, InferCreationAttributes<Certificate>> {
  declare id: CreationOptional<number>
  declare number: string
  declare baseNumber: string
  declare revision: number
  declare counterYear: number
  declare sequence: number
  declare status: CertificateStatus
  declare runId: number
  declare instrumentId: number
  declare organizationId: number
  declare instrumentSerial: string
  declare calibrationDate: string
  declare issueDate: string
  declare issuedAt: Date
  declare signedBy: number
  declare signatoryName: string
  declare signatoryFunction: string
  declare signatureMeaning: string
  declare verificationCode: string
  declare pdfSha256: string
  declare pdfSize: number
  declare dccSha256: string | null
  declare dccSize: number | null
  declare content: unknown
  declare amendsId: number | null
  declare amendmentReason: string | null
  declare supersededById: number | null
  declare supersededAt: Date | null
  declare withdrawnAt: Date | null
  declare withdrawnBy: number | null
  declare withdrawalReason: string | null
  declare version: CreationOptional<number>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
}

Certificate.init(
  {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    number: { type: DataTypes.STRING(60), allowNull: false, unique: true },
    baseNumber: { type: DataTypes.STRING(60), allowNull: false },
    revision: { type: DataTypes.INTEGER, allowNull: false },
    counterYear: { type: DataTypes.INTEGER, allowNull: false },
    sequence: { type: DataTypes.INTEGER, allowNull: false },
    status: { type: DataTypes.STRING(20), allowNull: false },
    runId: { type: DataTypes.INTEGER, allowNull: false },
    instrumentId: { type: DataTypes.INTEGER, allowNull: false },
    organizationId: { type: DataTypes.INTEGER, allowNull: false },
    instrumentSerial: { type: DataTypes.STRING(80), allowNull: false },
    calibrationDate: { type: DataTypes.DATEONLY, allowNull: false },
    issueDate: { type: DataTypes.DATEONLY, allowNull: false },
    issuedAt: { type: DataTypes.DATE, allowNull: false },
    signedBy: { type: DataTypes.INTEGER, allowNull: false },
    signatoryName: { type: DataTypes.STRING(120), allowNull: false },
    signatoryFunction: { type: DataTypes.STRING(120), allowNull: false },
    signatureMeaning: { type: DataTypes.STRING(60), allowNull: false },
    verificationCode: { type: DataTypes.STRING(20), allowNull: false },
    pdfSha256: { type: DataTypes.STRING(64), allowNull: false },
    pdfSize: { type: DataTypes.INTEGER, allowNull: false },
    dccSha256: { type: DataTypes.STRING(64), allowNull: true },
    dccSize: { type: DataTypes.INTEGER, allowNull: true },
    content: { type: DataTypes.JSON, allowNull: false },
    amendsId: { type: DataTypes.INTEGER, allowNull: true },
    amendmentReason: { type: DataTypes.TEXT, allowNull: true },
    supersededById: { type: DataTypes.INTEGER, allowNull: true },
    supersededAt: { type: DataTypes.DATE, allowNull: true },
    withdrawnAt: { type: DataTypes.DATE, allowNull: true },
    withdrawnBy: { type: DataTypes.INTEGER, allowNull: true },
    withdrawalReason: { type: DataTypes.TEXT, allowNull: true },
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, tableName: 'certificates', version: true },
)
