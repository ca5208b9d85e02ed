import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize'
import type { PlaceOfCalibration, RunStatus } from '#shared/calibration/constants'
import type { CalibrationEquationSettings, ImagerSettings } from '#shared/schemas/run'
import { sequelize } from '#server/utils/db'

/**
 * One calibration of a customer's instrument under one procedure version: who performed it, when,
 * in what measured conditions (empty until entered: nothing is assumed), under which agreed terms,
 * and its review. Temperatures in K, humidity in %RH, distance in mm.
 * Status draft → submitted → approved, or → returned → submitted again; a draft (or returned) run
 * can be voided. A submitted run is frozen for everyone; approved runs are locked. After the first
 * submission every change needs a reason and leaves a RunRevision. A run that corrects an issued
 * certificate is a new run with `revisionOf` and its reason.
 */
export class CalibrationRun extends Model<InferAttributes<CalibrationRun>, InferCreationAttributes<CalibrationRun>> {
  declare id: CreationOptional<number>
  declare instrumentId: number
  declare procedureVersionId: number
  declare technicianId: number
  /** From the receipt record (null until the item is received). */
  declare receivedDate: string | null
  declare calibrationDate: string
  declare ambientTemperatureK: number | null
  declare relativeHumidityPct: number | null
  declare distanceMm: number | null
  /** A spot diameter stated for the run at its distance, mm (fixed-focus instruments); null: from the instrument's D:S. */
  declare spotDiameterMm: number | null
  declare emissivitySetting: number | null
  declare reflectedTemperatureK: number | null
  declare instrumentTemperatureK: number | null
  /** A ratio pyrometer's emissivity-ratio setting in the run (migration 0014). */
  declare emissivityRatioSetting: CreationOptional<number | null>
  /** A thermal imager's lens, field of view, range setting and NUC (migration 0014). */
  declare imagerSettings: CreationOptional<ImagerSettings | null>
  /** The calibration equation's table temperatures and the points' correlation (migration 0014). */
  declare calibrationEquation: CreationOptional<CalibrationEquationSettings | null>
  declare adjusted: boolean
  declare status: CreationOptional<RunStatus>
  declare submittedAt: Date | null
  declare reviewerId: number | null
  declare reviewedAt: Date | null
  declare reviewComments: string | null
  /** The laboratory's own notes: never printed, never shown to customers. */
  declare internalNotes: string | null
  /** Remarks printed on the certificate. */
  declare certificateRemarks: string | null
  /** Deviations from the method (printed). */
  declare methodDeviations: string | null
  declare placeOfCalibration: CreationOptional<PlaceOfCalibration>
  /** Where, when on site. */
  declare siteAddress: string | null
  /** The calibration request (and its agreed terms) this run comes from. */
  declare requestId: number | null
  /** The reference instrument that measured the ambient conditions. */
  declare ambientInstrumentId: number | null
  declare voidedAt: Date | null
  declare voidedBy: number | null
  declare voidReason: string | null
  /** The run whose certificate this run corrects. */
  declare revisionOf: number | null
  declare revisionReason: string | null
  /** Everyone who entered or changed the run's data (none of them may approve it). */
  declare contributorIds: CreationOptional<number[]>
  /** The version the last review (return) saw. */
  declare lastReviewedVersion: number | null
  declare version: CreationOptional<number>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
}

CalibrationRun.init(
  {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    instrumentId: { type: DataTypes.INTEGER, allowNull: false },
    procedureVersionId: { type: DataTypes.INTEGER, allowNull: false },
    technicianId: { type: DataTypes.INTEGER, allowNull: false },
    receivedDate: { type: DataTypes.DATEONLY, allowNull: true },
    calibrationDate: { type: DataTypes.DATEONLY, allowNull: false },
    ambientTemperatureK: { type: DataTypes.DOUBLE, allowNull: true },
    relativeHumidityPct: { type: DataTypes.DOUBLE, allowNull: true },
    distanceMm: { type: DataTypes.DOUBLE, allowNull: true },
    spotDiameterMm: { type: DataTypes.DOUBLE, allowNull: true },
    emissivitySetting: { type: DataTypes.DOUBLE, allowNull: true },
    reflectedTemperatureK: { type: DataTypes.DOUBLE, allowNull: true },
    instrumentTemperatureK: { type: DataTypes.DOUBLE, allowNull: true },
    emissivityRatioSetting: { type: DataTypes.DOUBLE, allowNull: true },
    imagerSettings: { type: DataTypes.JSON, allowNull: true },
    calibrationEquation: { type: DataTypes.JSON, allowNull: true },
    adjusted: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    status: { type: DataTypes.STRING(20), allowNull: false, defaultValue: 'draft' },
    submittedAt: { type: DataTypes.DATE, allowNull: true },
    reviewerId: { type: DataTypes.INTEGER, allowNull: true },
    reviewedAt: { type: DataTypes.DATE, allowNull: true },
    reviewComments: { type: DataTypes.TEXT, allowNull: true },
    internalNotes: { type: DataTypes.TEXT, allowNull: true },
    certificateRemarks: { type: DataTypes.TEXT, allowNull: true },
    methodDeviations: { type: DataTypes.TEXT, allowNull: true },
    placeOfCalibration: { type: DataTypes.STRING(20), allowNull: false, defaultValue: 'laboratory' },
    siteAddress: { type: DataTypes.TEXT, allowNull: true },
    requestId: { type: DataTypes.INTEGER, allowNull: true },
    ambientInstrumentId: { type: DataTypes.INTEGER, allowNull: true },
    voidedAt: { type: DataTypes.DATE, allowNull: true },
    voidedBy: { type: DataTypes.INTEGER, allowNull: true },
    voidReason: { type: DataTypes.TEXT, allowNull: true },
    revisionOf: { type: DataTypes.INTEGER, allowNull: true },
    revisionReason: { type: DataTypes.TEXT, allowNull: true },
    contributorIds: { type: DataTypes.JSON, allowNull: false, defaultValue: [] },
    lastReviewedVersion: { type: DataTypes.INTEGER, allowNull: true },
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, tableName: 'calibration_runs', version: true },
)
