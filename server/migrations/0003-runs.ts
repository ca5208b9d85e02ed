import { DataTypes, type QueryInterface } from 'sequelize'
import { createPgGuard, dialectOf, dropGuard } from './lib'

/**
 * Calibration procedures (versioned), runs, their points and the revisions of submitted runs.
 * Run revisions are append-only, like the audit trail.
 */
export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  const stamps = {
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    createdAt: { type: DataTypes.DATE, allowNull: false },
    updatedAt: { type: DataTypes.DATE, allowNull: false },
  }
  const user = { type: DataTypes.INTEGER, references: { model: 'users', key: 'id' }, onDelete: 'RESTRICT' }

  await qi.createTable('procedures', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    name: { type: DataTypes.STRING(160), allowNull: false, unique: true },
    documentReference: { type: DataTypes.STRING(120), allowNull: false },
    currentVersionId: { type: DataTypes.INTEGER, allowNull: true },
    archived: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    ...stamps,
  })

  await qi.createTable('procedure_versions', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    procedureId: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'procedures', key: 'id' }, onDelete: 'RESTRICT' },
    versionNumber: { type: DataTypes.INTEGER, allowNull: false },
    name: { type: DataTypes.STRING(160), allowNull: false },
    documentReference: { type: DataTypes.STRING(120), allowNull: false },
    decisionRule: { type: DataTypes.STRING(30), allowNull: false },
    guardBandFactor: { type: DataTypes.DOUBLE, allowNull: true },
    template: { type: DataTypes.JSON, allowNull: false },
    cmc: { type: DataTypes.JSON, allowNull: false },
    changeNote: { type: DataTypes.TEXT, allowNull: true },
    createdBy: { ...user, allowNull: true },
    createdAt: { type: DataTypes.DATE, allowNull: false },
  })
  await qi.addIndex('procedure_versions', ['procedureId', 'versionNumber'], { unique: true, name: 'procedure_versions_number_unique' })

  await qi.createTable('calibration_runs', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    instrumentId: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'instruments', key: 'id' }, onDelete: 'RESTRICT' },
    procedureVersionId: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'procedure_versions', key: 'id' }, onDelete: 'RESTRICT' },
    technicianId: { ...user, allowNull: false },
    receivedDate: { type: DataTypes.DATEONLY, allowNull: false },
    calibrationDate: { type: DataTypes.DATEONLY, allowNull: false },
    ambientTemperatureK: { type: DataTypes.DOUBLE, allowNull: false },
    relativeHumidityPct: { type: DataTypes.DOUBLE, allowNull: false },
    distanceMm: { type: DataTypes.DOUBLE, allowNull: false },
    emissivitySetting: { type: DataTypes.DOUBLE, allowNull: false },
    reflectedTemperatureK: { type: DataTypes.DOUBLE, allowNull: false },
    instrumentTemperatureK: { type: DataTypes.DOUBLE, allowNull: false },
    adjusted: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    status: { type: DataTypes.STRING(20), allowNull: false, defaultValue: 'draft' },
    submittedAt: { type: DataTypes.DATE, allowNull: true },
    reviewerId: { ...user, allowNull: true },
    reviewedAt: { type: DataTypes.DATE, allowNull: true },
    reviewComments: { type: DataTypes.TEXT, allowNull: true },
    notes: { type: DataTypes.TEXT, allowNull: true },
    ...stamps,
  })
  await qi.addIndex('calibration_runs', ['instrumentId', 'calibrationDate'], { name: 'calibration_runs_instrument' })
  await qi.addIndex('calibration_runs', ['status', 'calibrationDate'], { name: 'calibration_runs_status' })
  await qi.addIndex('calibration_runs', ['technicianId'], { name: 'calibration_runs_technician' })
  await qi.addIndex('calibration_runs', ['calibrationDate'], { name: 'calibration_runs_date' })

  await qi.createTable('run_points', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    runId: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'calibration_runs', key: 'id' }, onDelete: 'RESTRICT' },
    seq: { type: DataTypes.INTEGER, allowNull: false },
    stage: { type: DataTypes.STRING(10), allowNull: false },
    sourceId: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'blackbody_sources', key: 'id' }, onDelete: 'RESTRICT' },
    referenceInstrumentId: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'reference_instruments', key: 'id' }, onDelete: 'RESTRICT' },
    setPointK: { type: DataTypes.DOUBLE, allowNull: false },
    sourceIndicatedK: { type: DataTypes.DOUBLE, allowNull: true },
    referenceReadingK: { type: DataTypes.DOUBLE, allowNull: true },
    readingsK: { type: DataTypes.JSON, allowNull: false },
    referenceTemperatureK: { type: DataTypes.DOUBLE, allowNull: false },
    expectedReadingK: { type: DataTypes.DOUBLE, allowNull: false },
    errorK: { type: DataTypes.DOUBLE, allowNull: false },
    statedUncertaintyK: { type: DataTypes.DOUBLE, allowNull: false },
    verdict: { type: DataTypes.STRING(20), allowNull: false },
    engineVersion: { type: DataTypes.STRING(20), allowNull: false },
    result: { type: DataTypes.JSON, allowNull: false },
    monteCarlo: { type: DataTypes.JSON, allowNull: true },
    ...stamps,
  })
  await qi.addIndex('run_points', ['runId', 'seq'], { name: 'run_points_run' })
  await qi.addIndex('run_points', ['sourceId'], { name: 'run_points_source' })
  await qi.addIndex('run_points', ['referenceInstrumentId'], { name: 'run_points_reference' })

  await qi.createTable('run_revisions', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    runId: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'calibration_runs', key: 'id' }, onDelete: 'RESTRICT' },
    pointId: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'run_points', key: 'id' }, onDelete: 'RESTRICT' },
    userId: { ...user, allowNull: false },
    at: { type: DataTypes.DATE, allowNull: false },
    reason: { type: DataTypes.TEXT, allowNull: false },
    before: { type: DataTypes.JSON, allowNull: true },
    after: { type: DataTypes.JSON, allowNull: true },
  })
  await qi.addIndex('run_revisions', ['runId', 'at'], { name: 'run_revisions_run' })
  if (dialectOf(qi) === 'postgres') {
    await createPgGuard(qi, { name: 'run_revisions_no_update', table: 'run_revisions', event: 'UPDATE', message: 'run revisions cannot be changed' })
    await createPgGuard(qi, { name: 'run_revisions_no_delete', table: 'run_revisions', event: 'DELETE', message: 'run revisions cannot be deleted' })
    return
  }
  await qi.sequelize.query(`CREATE TRIGGER run_revisions_no_update BEFORE UPDATE ON run_revisions
    BEGIN SELECT RAISE(ABORT, 'run revisions cannot be changed'); END`)
  await qi.sequelize.query(`CREATE TRIGGER run_revisions_no_delete BEFORE DELETE ON run_revisions
    BEGIN SELECT RAISE(ABORT, 'run revisions cannot be deleted'); END`)
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  await dropGuard(qi, 'run_revisions_no_delete', 'run_revisions')
  await dropGuard(qi, 'run_revisions_no_update', 'run_revisions')
  await qi.dropTable('run_revisions')
  await qi.dropTable('run_points')
  await qi.dropTable('calibration_runs')
  await qi.dropTable('procedure_versions')
  await qi.dropTable('procedures')
}
