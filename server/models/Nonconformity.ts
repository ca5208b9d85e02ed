import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize'
import type { EquipmentType } from '#shared/registers/constants'
import type { NonconformityOrigin, NonconformityStatus, RiskLevel } from '#shared/quality/constants'
import type { AffectedWorkDTO, NonconformityNoticeDTO } from '#shared/types/quality'
import { sequelize } from '#server/utils/db'

/**
 * Nonconforming work (ISO/IEC 17025:2017 7.10): raised by hand or by an event (a failed check, an
 * unsatisfactory proficiency result, a reference found out of tolerance at its calibration, a
 * complaint). It names the affected item and the period since the last good evidence, the
 * corrections found for the reference (to re-evaluate affected points), the affected work as it was
 * when raised, the "withhold" switch that blocks issuing certificates from affected runs, the
 * customers told (through the outbox), who authorised resuming work, and its closing.
 * Decisions per certificate are NonconformityDecision rows. Never deleted.
 */
export class Nonconformity extends Model<InferAttributes<Nonconformity>, InferCreationAttributes<Nonconformity>> {
  declare id: CreationOptional<number>
  /** NC-YYYY-NNN. */
  declare number: string
  declare raisedOn: string
  declare raisedBy: number | null
  declare origin: NonconformityOrigin
  /** The check result, proficiency result, equipment calibration or complaint that raised it. */
  declare originId: number | null
  declare title: string
  declare description: string
  declare risk: RiskLevel
  declare withhold: CreationOptional<boolean>
  declare equipmentType: EquipmentType | null
  declare equipmentId: number | null
  /** First and last calibration dates of the affected work (inclusive). */
  declare affectedFrom: string | null
  declare affectedTo: string | null
  /** `[temperatureK, correctionK]`: what the reference needed (true − value used), K. */
  declare referenceCorrections: [number, number][] | null
  /** The affected work as it stood when the record was raised. */
  declare affectedWork: AffectedWorkDTO | null
  declare notifications: CreationOptional<NonconformityNoticeDTO[]>
  declare status: CreationOptional<NonconformityStatus>
  declare resumedAt: Date | null
  declare resumedBy: number | null
  declare resumeNote: string | null
  declare closedAt: Date | null
  declare closedBy: number | null
  declare closeNote: string | null
  declare version: CreationOptional<number>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
}

Nonconformity.init(
  {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    number: { type: DataTypes.STRING(30), allowNull: false, unique: true },
    raisedOn: { type: DataTypes.DATEONLY, allowNull: false },
    raisedBy: { type: DataTypes.INTEGER, allowNull: true },
    origin: { type: DataTypes.STRING(20), allowNull: false },
    originId: { type: DataTypes.INTEGER, allowNull: true },
    title: { type: DataTypes.STRING(200), allowNull: false },
    description: { type: DataTypes.TEXT, allowNull: false },
    risk: { type: DataTypes.STRING(10), allowNull: false },
    withhold: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    equipmentType: { type: DataTypes.STRING(20), allowNull: true },
    equipmentId: { type: DataTypes.INTEGER, allowNull: true },
    affectedFrom: { type: DataTypes.DATEONLY, allowNull: true },
    affectedTo: { type: DataTypes.DATEONLY, allowNull: true },
    referenceCorrections: { type: DataTypes.JSON, allowNull: true },
    affectedWork: { type: DataTypes.JSON, allowNull: true },
    notifications: { type: DataTypes.JSON, allowNull: false, defaultValue: [] },
    status: { type: DataTypes.STRING(10), allowNull: false, defaultValue: 'open' },
    resumedAt: { type: DataTypes.DATE, allowNull: true },
    resumedBy: { type: DataTypes.INTEGER, allowNull: true },
    resumeNote: { type: DataTypes.TEXT, allowNull: true },
    closedAt: { type: DataTypes.DATE, allowNull: true },
    closedBy: { type: DataTypes.INTEGER, allowNull: true },
    closeNote: { type: DataTypes.TEXT, allowNull: true },
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, tableName: 'nonconformities', version: true },
)
