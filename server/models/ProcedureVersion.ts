import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize'
import type { DecisionRuleName } from '#shared/calibration/constants'
import type { CmcEntry, ProcedureApplicability, TemplateComponent, TemplateCorrelation } from '#shared/types/runs'
import { sequelize } from '#server/utils/db'

/**
 * One version of a procedure, never changed once written (a run keeps the version it used):
 * name and document reference as of that version, the decision rule with its guard-band factor r,
 * the uncertainty-budget template with its correlated pairs, whether points also take the reference
 * equipment's lines from the registers, the margin of source aperture over the instrument's spot, and
 * the CMC table (K, k = 2).
 */
export class ProcedureVersion extends Model<InferAttributes<ProcedureVersion>, InferCreationAttributes<ProcedureVersion>> {
  declare id: CreationOptional<number>
  declare procedureId: number
  declare versionNumber: number
  declare name: string
  declare documentReference: string
  declare decisionRule: DecisionRuleName
  declare guardBandFactor: number | null
  declare template: TemplateComponent[]
  declare correlations: CreationOptional<TemplateCorrelation[]>
  declare budgetFromEquipment: CreationOptional<boolean>
  declare spotMargin: number | null
  declare cmc: CmcEntry[]
  declare applicability: ProcedureApplicability | null
  declare changeNote: string | null
  declare createdBy: number | null
  declare createdAt: CreationOptional<Date>
}

ProcedureVersion.init(
  {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    procedureId: { type: DataTypes.INTEGER, allowNull: false },
    versionNumber: { type: DataTypes.INTEGER, allowNull: false },
    name: { type: DataTypes.STRING(160), allowNull: false },
    documentReference: { type: DataTypes.STRING(120), allowNull: false },
    decisionRule: { type: DataTypes.STRING(30), allowNull: false },
    guardBandFactor: { type: DataTypes.DOUBLE, allowNull: true },
    template: { type: DataTypes.JSON, allowNull: false },
    correlations: { type: DataTypes.JSON, allowNull: false, defaultValue: [] },
    budgetFromEquipment: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    spotMargin: { type: DataTypes.DOUBLE, allowNull: true },
    cmc: { type: DataTypes.JSON, allowNull: false },
    applicability: { type: DataTypes.JSON, allowNull: true },
    changeNote: { type: DataTypes.TEXT, allowNull: true },
    createdBy: { type: DataTypes.INTEGER, allowNull: true },
    createdAt: DataTypes.DATE,
  },
  { sequelize, tableName: 'procedure_versions', updatedAt: false },
)
