import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize'
import type { PointStage } from '#shared/calibration/constants'
import type { RoiFramesInput, RoiInput } from '#shared/schemas/run'
import type { PointMonteCarloDTO, PointResult } from '#shared/types/runs'
import { sequelize } from '#server/utils/db'

/**
 * One calibration point of a run: the observations (source, set-point, reference, repeat readings,
 * K) and what was computed from them (`result`: expected reading, error, full budget, conformity,
 * with the engine version and the exact inputs). A few result values are copied into columns for
 * lists. `monteCarlo` holds the optional JCGM 101 check.
 */
export class RunPoint extends Model<InferAttributes<RunPoint>, InferCreationAttributes<RunPoint>> {
  declare id: CreationOptional<number>
  declare runId: number
  declare seq: number
  declare stage: PointStage
  declare sourceId: number
  declare referenceInstrumentId: number | null
  declare setPointK: number
  declare sourceIndicatedK: number | null
  declare referenceReadingK: number | null
  declare readingsK: number[]
  /** A thermal imager's regions of interest with their readings (migration 0014); null for other kinds. */
  declare rois: CreationOptional<RoiInput[] | null>
  /** A thermal imager's frame series on the uniform source, for the NETD (migration 0014). */
  declare netdFrames: CreationOptional<RoiFramesInput[] | null>
  declare referenceTemperatureK: number
  declare expectedReadingK: number
  declare errorK: number
  declare statedUncertaintyK: number
  declare verdict: string
  declare engineVersion: string
  declare result: PointResult
  declare monteCarlo: PointMonteCarloDTO | null
  /** A mistaken point is voided with a reason: kept and audited, never used or printed. */
  declare voidedAt: Date | null
  declare voidedBy: number | null
  declare voidReason: string | null
  declare version: CreationOptional<number>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
}

RunPoint.init(
  {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    runId: { type: DataTypes.INTEGER, allowNull: false },
    seq: { type: DataTypes.INTEGER, allowNull: false },
    stage: { type: DataTypes.STRING(10), allowNull: false },
    sourceId: { type: DataTypes.INTEGER, allowNull: false },
    referenceInstrumentId: { type: DataTypes.INTEGER, allowNull: true },
    setPointK: { type: DataTypes.DOUBLE, allowNull: false },
    sourceIndicatedK: { type: DataTypes.DOUBLE, allowNull: true },
    referenceReadingK: { type: DataTypes.DOUBLE, allowNull: true },
    readingsK: { type: DataTypes.JSON, allowNull: false },
    rois: { type: DataTypes.JSON, allowNull: true },
    netdFrames: { type: DataTypes.JSON, allowNull: true },
    referenceTemperatureK: { type: DataTypes.DOUBLE, allowNull: false },
    expectedReadingK: { type: DataTypes.DOUBLE, allowNull: false },
    errorK: { type: DataTypes.DOUBLE, allowNull: false },
    statedUncertaintyK: { type: DataTypes.DOUBLE, allowNull: false },
    verdict: { type: DataTypes.STRING(20), allowNull: false },
    engineVersion: { type: DataTypes.STRING(20), allowNull: false },
    result: { type: DataTypes.JSON, allowNull: false },
    monteCarlo: { type: DataTypes.JSON, allowNull: true },
    voidedAt: { type: DataTypes.DATE, allowNull: true },
    voidedBy: { type: DataTypes.INTEGER, allowNull: true },
    voidReason: { type: DataTypes.TEXT, allowNull: true },
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, tableName: 'run_points', version: true },
)
