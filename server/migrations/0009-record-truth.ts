import { DataTypes, type QueryInterface } from 'sequelize'
import { allowNull, createPgGuard, dialectOf, dropGuard } from './lib'

/**
 * A record that tells the truth (ISO/IEC 17025 7.1, 7.4, 7.5, 7.8):
 * - runs keep only measured conditions (no defaults: the columns may be empty until entered), two
 *   kinds of notes (internal, and remarks printed on the certificate), the place of calibration,
 *   deviations from the method, the request and terms they come from, who changed their data,
 *   voiding with a reason, and the run they correct (a revision after a certificate was issued);
 * - points can be voided with a reason (kept, never printed);
 * - each run's item has a receipt record (received on, by, packaging, condition, accessories,
 *   deviations, whether the customer was consulted and what they decided);
 * - calibration requests carry the customer's requirements, the laboratory's review (terms and
 *   capability) and the agreement (in the portal, or recorded by the laboratory);
 * - procedure versions state what they apply to (source kinds, band, temperature range).
 */
export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  const q = (sql: string) => qi.sequelize.query(sql)
  const sqlite = dialectOf(qi) === 'sqlite'

  await allowNull(qi, 'calibration_runs', ['receivedDate', 'ambientTemperatureK', 'relativeHumidityPct', 'distanceMm', 'emissivitySetting', 'reflectedTemperatureK', 'instrumentTemperatureK'])
  await q('ALTER TABLE calibration_runs RENAME COLUMN "notes" TO "internalNotes"')
  const runColumns = {
    certificateRemarks: { type: DataTypes.TEXT, allowNull: true },
    methodDeviations: { type: DataTypes.TEXT, allowNull: true },
    placeOfCalibration: { type: DataTypes.STRING(20), allowNull: false, defaultValue: 'laboratory' },
    siteAddress: { type: DataTypes.TEXT, allowNull: true },
    requestId: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'calibration_requests', key: 'id' }, onDelete: 'RESTRICT' },
    ambientInstrumentId: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'reference_instruments', key: 'id' }, onDelete: 'RESTRICT' },
    voidedAt: { type: DataTypes.DATE, allowNull: true },
    voidedBy: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'RESTRICT' },
    voidReason: { type: DataTypes.TEXT, allowNull: true },
    revisionOf: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'calibration_runs', key: 'id' }, onDelete: 'RESTRICT' },
    revisionReason: { type: DataTypes.TEXT, allowNull: true },
    contributorIds: { type: DataTypes.JSON, allowNull: false, defaultValue: '[]' },
    lastReviewedVersion: { type: DataTypes.INTEGER, allowNull: true },
  }
  for (const [name, def] of Object.entries(runColumns)) await qi.addColumn('calibration_runs', name, def)
  await qi.addIndex('calibration_runs', ['requestId'])
  await qi.addIndex('calibration_runs', ['revisionOf'])

  // Who changed each existing run's data: its technician and everyone who recorded a revision.
  // (Runs with a certificate are guarded by a trigger; it is set aside for this one fill.)
  if (sqlite) await q('DROP TRIGGER IF EXISTS calibration_runs_certified_no_update')
  else await q('ALTER TABLE calibration_runs DISABLE TRIGGER calibration_runs_certified_no_update')
  const [runs] = await q('SELECT id, "technicianId" FROM calibration_runs') as [{ id: number, technicianId: number }[], unknown]
  const [revs] = await q('SELECT DISTINCT "runId", "userId" FROM run_revisions') as [{ runId: number, userId: number }[], unknown]
  for (const r of runs) {
    const ids = [...new Set([r.technicianId, ...revs.filter(v => v.runId === r.id).map(v => v.userId)])]
    await qi.sequelize.query('UPDATE calibration_runs SET "contributorIds" = :ids WHERE id = :id', { replacements: { ids: JSON.stringify(ids), id: r.id } })
  }
  if (sqlite) {
    await q(`CREATE TRIGGER calibration_runs_certified_no_update BEFORE UPDATE ON calibration_runs WHEN EXISTS (SELECT 1 FROM certificates c WHERE c.runId = OLD.id)
    BEGIN SELECT RAISE(ABORT, 'a run with a certificate cannot change'); END`)
  }
  else {
    await q('ALTER TABLE calibration_runs ENABLE TRIGGER calibration_runs_certified_no_update')
  }

  await qi.addColumn('run_points', 'voidedAt', { type: DataTypes.DATE, allowNull: true })
  await qi.addColumn('run_points', 'voidedBy', { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'RESTRICT' })
  await qi.addColumn('run_points', 'voidReason', { type: DataTypes.TEXT, allowNull: true })

  await qi.createTable('item_receipts', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    runId: { type: DataTypes.INTEGER, allowNull: false, unique: true, references: { model: 'calibration_runs', key: 'id' }, onDelete: 'RESTRICT' },
    receivedOn: { type: DataTypes.DATEONLY, allowNull: false },
    receivedBy: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'users', key: 'id' }, onDelete: 'RESTRICT' },
    packaging: { type: DataTypes.TEXT, allowNull: false },
    condition: { type: DataTypes.TEXT, allowNull: false },
    accessories: { type: DataTypes.TEXT, allowNull: true },
    deviations: { type: DataTypes.TEXT, allowNull: true },
    customerConsulted: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    customerDecision: { type: DataTypes.TEXT, allowNull: true },
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    createdAt: { type: DataTypes.DATE, allowNull: false },
    updatedAt: { type: DataTypes.DATE, allowNull: false },
  })
  if (sqlite) {
    // The receipt of a certified run is part of what the certificate states.
    await q(`CREATE TRIGGER item_receipts_certified_no_update BEFORE UPDATE ON item_receipts WHEN EXISTS (SELECT 1 FROM certificates c WHERE c.runId = OLD.runId)
    BEGIN SELECT RAISE(ABORT, 'the receipt of a run with a certificate cannot change'); END`)
    await q(`CREATE TRIGGER item_receipts_certified_no_delete BEFORE DELETE ON item_receipts WHEN EXISTS (SELECT 1 FROM certificates c WHERE c.runId = OLD.runId)
    BEGIN SELECT RAISE(ABORT, 'the receipt of a run with a certificate cannot be deleted'); END`)
  }
  else {
    const certified = 'EXISTS (SELECT 1 FROM certificates c WHERE c."runId" = OLD."runId")'
    await createPgGuard(qi, { name: 'item_receipts_certified_no_update', table: 'item_receipts', event: 'UPDATE', message: 'the receipt of a run with a certificate cannot change', when: certified })
    await createPgGuard(qi, { name: 'item_receipts_certified_no_delete', table: 'item_receipts', event: 'DELETE', message: 'the receipt of a run with a certificate cannot be deleted', when: certified })
  }

  const requestColumns = {
    requirements: { type: DataTypes.TEXT, allowNull: true },
    specification: { type: DataTypes.JSON, allowNull: true },
    terms: { type: DataTypes.JSON, allowNull: true },
    termsVersion: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    reviewedBy: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'RESTRICT' },
    reviewedAt: { type: DataTypes.DATE, allowNull: true },
    agreedTermsVersion: { type: DataTypes.INTEGER, allowNull: true },
    agreedAt: { type: DataTypes.DATE, allowNull: true },
    agreedBy: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'RESTRICT' },
    agreementMethod: { type: DataTypes.STRING(20), allowNull: true },
    agreementNote: { type: DataTypes.TEXT, allowNull: true },
  }
  for (const [name, def] of Object.entries(requestColumns)) await qi.addColumn('calibration_requests', name, def)

  await qi.addColumn('procedure_versions', 'applicability', { type: DataTypes.JSON, allowNull: true })
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  await dropGuard(qi, 'item_receipts_certified_no_update', 'item_receipts')
  await dropGuard(qi, 'item_receipts_certified_no_delete', 'item_receipts')
  await qi.dropTable('item_receipts')
  throw new Error('0009 is not reversible beyond dropping item_receipts: restore a backup instead')
}
