import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize'
import type { ProficiencySchemeType, ProficiencyVerdict } from '#shared/quality/constants'
import { sequelize } from '#server/utils/db'

/**
 * One result of a proficiency test or interlaboratory comparison (ISO/IEC 17025:2017 7.7.2): the
 * scheme and round, the artefact and point, the laboratory's value and expanded uncertainty, the
 * reference (assigned) value and its expanded uncertainty (K), σ_pt when the scheme reports z
 * scores, E_n and z with their verdicts, the overall verdict, and the nonconformity an
 * unsatisfactory result opened. Never changed.
 */
export class ProficiencyResult extends Model<InferAttributes<ProficiencyResult>, InferCreationAttributes<ProficiencyResult>> {
  declare id: CreationOptional<number>
  declare schemeType: ProficiencySchemeType
  declare scheme: string
  declare round: string
  declare artefact: string
  declare pointK: number
  declare labValueK: number
  declare labUncertaintyK: number
  declare referenceValueK: number
  declare referenceUncertaintyK: number
  declare sigmaPtK: number | null
  declare en: number
  declare enVerdict: ProficiencyVerdict
  declare z: number | null
  declare zVerdict: ProficiencyVerdict | null
  declare verdict: ProficiencyVerdict
  declare reportedOn: string
  declare notes: string | null
  declare nonconformityId: number | null
  declare recordedBy: number
  declare version: CreationOptional<number>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
}

ProficiencyResult.init(
  {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    schemeType: { type: DataTypes.STRING(30), allowNull: false },
    scheme: { type: DataTypes.STRING(200), allowNull: false },
    round: { type: DataTypes.STRING(120), allowNull: false },
    artefact: { type: DataTypes.STRING(200), allowNull: false },
    pointK: { type: DataTypes.DOUBLE, allowNull: false },
    labValueK: { type: DataTypes.DOUBLE, allowNull: false },
    labUncertaintyK: { type: DataTypes.DOUBLE, allowNull: false },
    referenceValueK: { type: DataTypes.DOUBLE, allowNull: false },
    referenceUncertaintyK: { type: DataTypes.DOUBLE, allowNull: false },
    sigmaPtK: { type: DataTypes.DOUBLE, allowNull: true },
    en: { type: DataTypes.DOUBLE, allowNull: false },
    enVerdict: { type: DataTypes.STRING(20), allowNull: false },
    z: { type: DataTypes.DOUBLE, allowNull: true },
    zVerdict: { type: DataTypes.STRING(20), allowNull: true },
    verdict: { type: DataTypes.STRING(20), allowNull: false },
    reportedOn: { type: DataTypes.DATEONLY, allowNull: false },
    notes: { type: DataTypes.TEXT, allowNull: true },
    nonconformityId: { type: DataTypes.INTEGER, allowNull: true },
    recordedBy: { type: DataTypes.INTEGER, allowNull: false },
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, tableName: 'proficiency_results', version: true },
)
