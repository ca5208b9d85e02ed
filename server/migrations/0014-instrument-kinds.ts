import { DataTypes, type QueryInterface } from 'sequelize'
import { dropColumns } from './lib'

/**
 * Every kind of instrument the laboratory calibrates (issue 16):
 * - instruments: a ratio (two-colour) pyrometer's second band — rectangular (`band2Lambda1Um`,
 *   `band2Lambda2Um`, µm) or a stored responsivity table (`band2SpectralResponseId`) — and its
 *   emissivity-ratio ("slope") setting `emissivityRatioSetting`; null for every other kind. Ratio
 *   pyrometers recorded before this have one band: their points cannot be computed with the
 *   two-colour model until the second band is entered (the run refuses naming it);
 * - calibration_runs: the ratio setting used in the run (`emissivityRatioSetting`, a measured
 *   condition of a ratio run, null until entered), a thermal imager's settings (`imagerSettings`
 *   JSON: lens, field of view, range setting, non-uniformity correction done) and the temperatures
 *   of the calibration-equation table a certificate states (`calibrationEquation` JSON);
 * - run_points: a thermal imager's readings in named regions of interest (`rois` JSON: name,
 *   position and size in pixels, readings in K) and a frame series on the uniform source for the
 *   NETD (`netdFrames` JSON).
 * Plain added columns, the same on SQLite and PostgreSQL; existing rows read null (nothing assumed).
 */
const INSTRUMENT_COLUMNS = ['band2Lambda1Um', 'band2Lambda2Um', 'band2SpectralResponseId', 'emissivityRatioSetting'] as const
const RUN_COLUMNS = ['emissivityRatioSetting', 'imagerSettings', 'calibrationEquation'] as const
const POINT_COLUMNS = ['rois', 'netdFrames'] as const

export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.addColumn('instruments', 'band2Lambda1Um', { type: DataTypes.DOUBLE, allowNull: true })
  await qi.addColumn('instruments', 'band2Lambda2Um', { type: DataTypes.DOUBLE, allowNull: true })
  await qi.addColumn('instruments', 'band2SpectralResponseId', { type: DataTypes.INTEGER, allowNull: true })
  await qi.addColumn('instruments', 'emissivityRatioSetting', { type: DataTypes.DOUBLE, allowNull: true })
  await qi.addColumn('calibration_runs', 'emissivityRatioSetting', { type: DataTypes.DOUBLE, allowNull: true })
  await qi.addColumn('calibration_runs', 'imagerSettings', { type: DataTypes.JSON, allowNull: true })
  await qi.addColumn('calibration_runs', 'calibrationEquation', { type: DataTypes.JSON, allowNull: true })
  await qi.addColumn('run_points', 'rois', { type: DataTypes.JSON, allowNull: true })
  await qi.addColumn('run_points', 'netdFrames', { type: DataTypes.JSON, allowNull: true })
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  await dropColumns(qi, 'run_points', POINT_COLUMNS)
  await dropColumns(qi, 'calibration_runs', RUN_COLUMNS)
  await dropColumns(qi, 'instruments', INSTRUMENT_COLUMNS)
}
