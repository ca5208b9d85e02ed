import { DataTypes, type QueryInterface } from 'sequelize'
import { createPgGuard, dialectOf, dropGuard, pgAnyChanged } from './lib'

/**
 * Laboratory settings (one row), certificate counters (one per year of issue) and certificates.
 * Database triggers keep the record of issue intact whatever code runs against it:
 * - a certificate cannot be deleted, and once issued only its status columns may change, and only
 *   from `valid` (to `superseded` or `withdrawn`);
 * - a counter moves by exactly one at a time and is never deleted (no gaps, no reuse);
 * - a run with a certificate, and its points, cannot be changed or deleted, nor points added.
 */
export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  const user = { type: DataTypes.INTEGER, references: { model: 'users', key: 'id' }, onDelete: 'RESTRICT' }

  await qi.createTable('lab_settings', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    name: { type: DataTypes.STRING(200), allowNull: false },
    addressLines: { type: DataTypes.TEXT, allowNull: false },
    city: { type: DataTypes.STRING(120), allowNull: false },
    postcode: { type: DataTypes.STRING(20), allowNull: true },
    country: { type: DataTypes.STRING(80), allowNull: false },
    email: { type: DataTypes.STRING(254), allowNull: true },
    phone: { type: DataTypes.STRING(40), allowNull: true },
    accreditationBody: { type: DataTypes.STRING(160), allowNull: false },
    accreditationNumber: { type: DataTypes.STRING(60), allowNull: false },
    numberPrefix: { type: DataTypes.STRING(12), allowNull: false },
    numberIncludesYear: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    numberDigits: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 5 },
    signatoryFunctions: { type: DataTypes.JSON, allowNull: false },
    traceabilityStatement: { type: DataTypes.TEXT, allowNull: false },
    decisionRuleStatement: { type: DataTypes.TEXT, allowNull: false },
    itemsStatement: { type: DataTypes.TEXT, allowNull: false },
    reproductionStatement: { type: DataTypes.TEXT, allowNull: true },
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    createdAt: { type: DataTypes.DATE, allowNull: false },
    updatedAt: { type: DataTypes.DATE, allowNull: false },
  })

  await qi.createTable('certificate_counters', {
    year: { type: DataTypes.INTEGER, primaryKey: true },
    lastSequence: { type: DataTypes.INTEGER, allowNull: false },
  })

  await qi.createTable('certificates', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    number: { type: DataTypes.STRING(60), allowNull: false, unique: true },
    baseNumber: { type: DataTypes.STRING(60), allowNull: false },
    revision: { type: DataTypes.INTEGER, allowNull: false },
    counterYear: { type: DataTypes.INTEGER, allowNull: false },
    sequence: { type: DataTypes.INTEGER, allowNull: false },
    status: { type: DataTypes.STRING(20), allowNull: false },
    runId: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'calibration_runs', key: 'id' }, onDelete: 'RESTRICT' },
    instrumentId: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'instruments', key: 'id' }, onDelete: 'RESTRICT' },
    organizationId: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'organizations', key: 'id' }, onDelete: 'RESTRICT' },
    instrumentSerial: { type: DataTypes.STRING(80), allowNull: false },
    calibrationDate: { type: DataTypes.DATEONLY, allowNull: false },
    issueDate: { type: DataTypes.DATEONLY, allowNull: false },
    issuedAt: { type: DataTypes.DATE, allowNull: false },
    signedBy: { ...user, allowNull: false },
    signatoryName: { type: DataTypes.STRING(120), allowNull: false },
    signatoryFunction: { type: DataTypes.STRING(120), allowNull: false },
    signatureMeaning: { type: DataTypes.STRING(60), allowNull: false },
    verificationCode: { type: DataTypes.STRING(20), allowNull: false },
    pdfSha256: { type: DataTypes.STRING(64), allowNull: false },
    pdfSize: { type: DataTypes.INTEGER, allowNull: false },
    content: { type: DataTypes.JSON, allowNull: false },
    amendsId: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'certificates', key: 'id' }, onDelete: 'RESTRICT' },
    amendmentReason: { type: DataTypes.TEXT, allowNull: true },
    supersededById: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'certificates', key: 'id' }, onDelete: 'RESTRICT' },
    supersededAt: { type: DataTypes.DATE, allowNull: true },
    withdrawnAt: { type: DataTypes.DATE, allowNull: true },
    withdrawnBy: { ...user, allowNull: true },
    withdrawalReason: { type: DataTypes.TEXT, allowNull: true },
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    createdAt: { type: DataTypes.DATE, allowNull: false },
    updatedAt: { type: DataTypes.DATE, allowNull: false },
  })
  await qi.addIndex('certificates', ['baseNumber', 'revision'], { unique: true, name: 'certificates_revision_unique' })
  await qi.addIndex('certificates', ['counterYear', 'sequence', 'revision'], { unique: true, name: 'certificates_sequence_unique' })
  await qi.addIndex('certificates', ['runId'], { name: 'certificates_run' })
  await qi.addIndex('certificates', ['organizationId', 'issuedAt'], { name: 'certificates_organization' })
  await qi.addIndex('certificates', ['issuedAt'], { name: 'certificates_issued' })
  await qi.addIndex('certificates', ['pdfSha256'], { name: 'certificates_sha256' })

  const fixed = ['number', 'baseNumber', 'revision', 'counterYear', 'sequence', 'runId', 'instrumentId', 'organizationId', 'instrumentSerial', 'calibrationDate',
    'issueDate', 'issuedAt', 'signedBy', 'signatoryName', 'signatoryFunction', 'signatureMeaning', 'verificationCode', 'pdfSha256', 'pdfSize', 'content',
    'amendsId', 'amendmentReason', 'createdAt']
  if (dialectOf(qi) === 'postgres') return guardsPg(qi, fixed)
  const q = (sql: string) => qi.sequelize.query(sql)
  await q(`CREATE TRIGGER certificates_no_delete BEFORE DELETE ON certificates
    BEGIN SELECT RAISE(ABORT, 'certificates cannot be deleted'); END`)
  await q(`CREATE TRIGGER certificates_fixed BEFORE UPDATE ON certificates
    WHEN OLD.status <> 'valid' OR NEW.status NOT IN ('valid', 'superseded', 'withdrawn')
      OR ${fixed.map(c => `NEW."${c}" IS NOT OLD."${c}"`).join(' OR ')}
    BEGIN SELECT RAISE(ABORT, 'an issued certificate cannot change: amend or withdraw it'); END`)
  await q(`CREATE TRIGGER certificate_counters_no_delete BEFORE DELETE ON certificate_counters
    BEGIN SELECT RAISE(ABORT, 'certificate counters cannot be deleted'); END`)
  await q(`CREATE TRIGGER certificate_counters_step BEFORE UPDATE ON certificate_counters
    WHEN NEW.year IS NOT OLD.year OR NEW.lastSequence IS NOT OLD.lastSequence + 1
    BEGIN SELECT RAISE(ABORT, 'certificate numbers advance by one: no gaps, no reuse'); END`)
  await q(`CREATE TRIGGER certificate_counters_start BEFORE INSERT ON certificate_counters
    WHEN NEW.lastSequence IS NOT 1
    BEGIN SELECT RAISE(ABORT, 'a certificate counter starts at 1'); END`)
  const certified = (col: string) => `EXISTS (SELECT 1 FROM certificates c WHERE c.runId = ${col})`
  await q(`CREATE TRIGGER calibration_runs_certified_no_update BEFORE UPDATE ON calibration_runs WHEN ${certified('OLD.id')}
    BEGIN SELECT RAISE(ABORT, 'a run with a certificate cannot change'); END`)
  await q(`CREATE TRIGGER calibration_runs_certified_no_delete BEFORE DELETE ON calibration_runs WHEN ${certified('OLD.id')}
    BEGIN SELECT RAISE(ABORT, 'a run with a certificate cannot be deleted'); END`)
  await q(`CREATE TRIGGER run_points_certified_no_update BEFORE UPDATE ON run_points WHEN ${certified('OLD.runId')} OR ${certified('NEW.runId')}
    BEGIN SELECT RAISE(ABORT, 'the points of a run with a certificate cannot change'); END`)
  await q(`CREATE TRIGGER run_points_certified_no_insert BEFORE INSERT ON run_points WHEN ${certified('NEW.runId')}
    BEGIN SELECT RAISE(ABORT, 'a run with a certificate takes no new points'); END`)
  await q(`CREATE TRIGGER run_points_certified_no_delete BEFORE DELETE ON run_points WHEN ${certified('OLD.runId')}
    BEGIN SELECT RAISE(ABORT, 'the points of a run with a certificate cannot be deleted'); END`)
}

/** The same guards on PostgreSQL (PL/pgSQL functions; see ./lib.ts). */
async function guardsPg(qi: QueryInterface, fixed: string[]): Promise<void> {
  const certified = (col: string) => `EXISTS (SELECT 1 FROM certificates c WHERE c."runId" = ${col})`
  const guards = [
    { name: 'certificates_no_delete', table: 'certificates', event: 'DELETE', message: 'certificates cannot be deleted' },
    { name: 'certificates_fixed', table: 'certificates', event: 'UPDATE', message: 'an issued certificate cannot change: amend or withdraw it',
      when: `OLD.status <> 'valid' OR NEW.status NOT IN ('valid', 'superseded', 'withdrawn') OR ${pgAnyChanged(fixed)}` },
    { name: 'certificate_counters_no_delete', table: 'certificate_counters', event: 'DELETE', message: 'certificate counters cannot be deleted' },
    { name: 'certificate_counters_step', table: 'certificate_counters', event: 'UPDATE', message: 'certificate numbers advance by one: no gaps, no reuse',
      when: 'NEW.year IS DISTINCT FROM OLD.year OR NEW."lastSequence" IS DISTINCT FROM OLD."lastSequence" + 1' },
    { name: 'certificate_counters_start', table: 'certificate_counters', event: 'INSERT', message: 'a certificate counter starts at 1',
      when: 'NEW."lastSequence" IS DISTINCT FROM 1' },
    { name: 'calibration_runs_certified_no_update', table: 'calibration_runs', event: 'UPDATE', message: 'a run with a certificate cannot change', when: certified('OLD.id') },
    { name: 'calibration_runs_certified_no_delete', table: 'calibration_runs', event: 'DELETE', message: 'a run with a certificate cannot be deleted', when: certified('OLD.id') },
    { name: 'run_points_certified_no_update', table: 'run_points', event: 'UPDATE', message: 'the points of a run with a certificate cannot change',
      when: `${certified('OLD."runId"')} OR ${certified('NEW."runId"')}` },
    { name: 'run_points_certified_no_insert', table: 'run_points', event: 'INSERT', message: 'a run with a certificate takes no new points', when: certified('NEW."runId"') },
    { name: 'run_points_certified_no_delete', table: 'run_points', event: 'DELETE', message: 'the points of a run with a certificate cannot be deleted', when: certified('OLD."runId"') },
  ] as const
  for (const g of guards) await createPgGuard(qi, g)
}

const TABLE_OF = (name: string) => name.startsWith('run_points') ? 'run_points' : name.startsWith('calibration_runs') ? 'calibration_runs' : name.startsWith('certificate_counters') ? 'certificate_counters' : 'certificates'

const TRIGGERS = ['run_points_certified_no_delete', 'run_points_certified_no_insert', 'run_points_certified_no_update', 'calibration_runs_certified_no_delete',
  'calibration_runs_certified_no_update', 'certificate_counters_start', 'certificate_counters_step', 'certificate_counters_no_delete', 'certificates_fixed', 'certificates_no_delete']

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  for (const name of TRIGGERS) await dropGuard(qi, name, TABLE_OF(name))
  await qi.dropTable('certificates')
  await qi.dropTable('certificate_counters')
  await qi.dropTable('lab_settings')
}
