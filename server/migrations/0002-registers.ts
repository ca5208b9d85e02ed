import { DataTypes, type QueryInterface } from 'sequelize'
import { dialectOf, dropColumns } from './lib'

/**
 * The registers: uploads, spectral responsivity tables, blackbody sources, reference
 * instruments, their calibrations, customer contacts and addresses, customers' instruments.
 *
 * Text columns that lists search by prefix and sort by (serial, asset tag, maker, model) are
 * declared `COLLATE NOCASE`, so `LIKE 'abc%'` (SQLite's LIKE ignores ASCII case) and ORDER BY
 * both use their indexes (SQLite query planner, "The LIKE optimization").
 */
const NOCASE_SQLITE = (n: number) => `VARCHAR(${n}) COLLATE NOCASE`

export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  // PostgreSQL has no NOCASE: plain text columns, sorted by the database's collation, searched through
  // lower(column) with the indexes of migration 0011.
  const NOCASE = dialectOf(qi) === 'postgres' ? (n: number) => DataTypes.STRING(n) : NOCASE_SQLITE
  const stamps = {
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    createdAt: { type: DataTypes.DATE, allowNull: false },
    updatedAt: { type: DataTypes.DATE, allowNull: false },
  }

  await qi.addColumn('organizations', 'addressLines', { type: DataTypes.TEXT, allowNull: true })
  await qi.addColumn('organizations', 'city', { type: DataTypes.STRING(120), allowNull: true })
  await qi.addColumn('organizations', 'postcode', { type: DataTypes.STRING(20), allowNull: true })
  await qi.addColumn('organizations', 'country', { type: DataTypes.STRING(80), allowNull: true })

  await qi.createTable('uploads', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    sha256: { type: DataTypes.STRING(64), allowNull: false },
    size: { type: DataTypes.INTEGER, allowNull: false },
    mimeType: { type: DataTypes.STRING(80), allowNull: false },
    originalName: { type: DataTypes.STRING(200), allowNull: false },
    purpose: { type: DataTypes.STRING(40), allowNull: false },
    organizationId: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'organizations', key: 'id' }, onDelete: 'RESTRICT' },
    uploadedBy: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'RESTRICT' },
    ...stamps,
  })
  await qi.addIndex('uploads', ['sha256'])
  await qi.addIndex('uploads', ['organizationId'])

  await qi.createTable('spectral_responses', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    name: { type: DataTypes.STRING(120), allowNull: false, unique: true },
    sha256: { type: DataTypes.STRING(64), allowNull: false, unique: true },
    points: { type: DataTypes.JSON, allowNull: false },
    archived: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    ...stamps,
  })

  await qi.createTable('blackbody_sources', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    assetTag: { type: NOCASE(60), allowNull: false, unique: true },
    kind: { type: DataTypes.STRING(20), allowNull: false },
    maker: { type: NOCASE(120), allowNull: false },
    model: { type: NOCASE(120), allowNull: false },
    serial: { type: NOCASE(80), allowNull: false },
    apertureMm: { type: DataTypes.DOUBLE, allowNull: false },
    minTemperatureK: { type: DataTypes.DOUBLE, allowNull: false },
    maxTemperatureK: { type: DataTypes.DOUBLE, allowNull: false },
    emissivity: { type: DataTypes.DOUBLE, allowNull: false },
    emissivityU: { type: DataTypes.DOUBLE, allowNull: false },
    emissivityBandLambda1Um: { type: DataTypes.DOUBLE, allowNull: true },
    emissivityBandLambda2Um: { type: DataTypes.DOUBLE, allowNull: true },
    uniformityK: { type: DataTypes.DOUBLE, allowNull: false },
    stabilityK: { type: DataTypes.DOUBLE, allowNull: false },
    corrections: { type: DataTypes.JSON, allowNull: false, defaultValue: '[]' },
    status: { type: DataTypes.STRING(20), allowNull: false, defaultValue: 'in-service' },
    notes: { type: DataTypes.TEXT, allowNull: true },
    archived: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    ...stamps,
  })

  await qi.createTable('reference_instruments', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    assetTag: { type: NOCASE(60), allowNull: false, unique: true },
    kind: { type: DataTypes.STRING(40), allowNull: false },
    maker: { type: NOCASE(120), allowNull: false },
    model: { type: NOCASE(120), allowNull: false },
    serial: { type: NOCASE(80), allowNull: false },
    rangeMin: { type: DataTypes.DOUBLE, allowNull: false },
    rangeMax: { type: DataTypes.DOUBLE, allowNull: false },
    rangeUnit: { type: DataTypes.STRING(8), allowNull: false },
    standardUncertainty: { type: DataTypes.DOUBLE, allowNull: false },
    uncertaintyUnit: { type: DataTypes.STRING(8), allowNull: false },
    status: { type: DataTypes.STRING(20), allowNull: false, defaultValue: 'in-service' },
    notes: { type: DataTypes.TEXT, allowNull: true },
    archived: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    ...stamps,
  })

  await qi.createTable('equipment_calibrations', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    equipmentType: { type: DataTypes.STRING(20), allowNull: false },
    equipmentId: { type: DataTypes.INTEGER, allowNull: false },
    provider: { type: DataTypes.STRING(160), allowNull: false },
    certificateNumber: { type: DataTypes.STRING(80), allowNull: false },
    calibrationDate: { type: DataTypes.DATEONLY, allowNull: false },
    dueDate: { type: DataTypes.DATEONLY, allowNull: false },
    results: { type: DataTypes.TEXT, allowNull: true },
    uploadId: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'uploads', key: 'id' }, onDelete: 'RESTRICT' },
    createdBy: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'RESTRICT' },
    ...stamps,
  })
  await qi.addIndex('equipment_calibrations', ['equipmentType', 'equipmentId', 'calibrationDate'])
  await qi.addIndex('equipment_calibrations', ['equipmentType', 'equipmentId', 'certificateNumber'], { unique: true, name: 'equipment_calibrations_certificate_unique' })

  await qi.createTable('contacts', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    organizationId: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'organizations', key: 'id' }, onDelete: 'RESTRICT' },
    name: { type: DataTypes.STRING(120), allowNull: false },
    email: { type: DataTypes.STRING(254), allowNull: false },
    phone: { type: DataTypes.STRING(40), allowNull: true },
    receivesReminders: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    ...stamps,
  })
  await qi.addIndex('contacts', ['organizationId'])

  await qi.createTable('instruments', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    organizationId: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'organizations', key: 'id' }, onDelete: 'RESTRICT' },
    serial: { type: NOCASE(80), allowNull: false },
    assetTag: { type: NOCASE(60), allowNull: true },
    maker: { type: NOCASE(120), allowNull: false },
    model: { type: NOCASE(120), allowNull: false },
    kind: { type: DataTypes.STRING(40), allowNull: false },
    bandLambda1Um: { type: DataTypes.DOUBLE, allowNull: true },
    bandLambda2Um: { type: DataTypes.DOUBLE, allowNull: true },
    spectralResponseId: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'spectral_responses', key: 'id' }, onDelete: 'RESTRICT' },
    distanceToSpot: { type: DataTypes.DOUBLE, allowNull: true },
    rangeMinK: { type: DataTypes.DOUBLE, allowNull: false },
    rangeMaxK: { type: DataTypes.DOUBLE, allowNull: false },
    defaultEmissivity: { type: DataTypes.DOUBLE, allowNull: false },
    resolutionK: { type: DataTypes.DOUBLE, allowNull: false },
    accuracy: { type: DataTypes.JSON, allowNull: false },
    calibrationIntervalMonths: { type: DataTypes.INTEGER, allowNull: false },
    status: { type: DataTypes.STRING(20), allowNull: false, defaultValue: 'active' },
    nextDueDate: { type: DataTypes.DATEONLY, allowNull: true },
    photoUploadId: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'uploads', key: 'id' }, onDelete: 'RESTRICT' },
    notes: { type: DataTypes.TEXT, allowNull: true },
    archived: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    ...stamps,
  })
  // One instrument per maker, model and serial within an organization.
  await qi.addIndex('instruments', ['organizationId', 'maker', 'model', 'serial'], { unique: true, name: 'instruments_identity_unique' })
  // Sorting and prefix search (the NOCASE columns' indexes inherit their collation).
  await qi.addIndex('instruments', ['serial'], { name: 'instruments_serial' })
  await qi.addIndex('instruments', ['assetTag'], { name: 'instruments_asset_tag' })
  await qi.addIndex('instruments', ['maker'], { name: 'instruments_maker' })
  await qi.addIndex('instruments', ['model'], { name: 'instruments_model' })
  await qi.addIndex('instruments', ['nextDueDate'], { name: 'instruments_next_due' })
  // The default list hides archived rows: these give the page of ids (and the count) from the index alone.
  await qi.addIndex('instruments', ['archived', 'serial'], { name: 'instruments_archived_serial' })
  await qi.addIndex('instruments', ['archived', 'nextDueDate'], { name: 'instruments_archived_next_due' })
  for (const column of ['assetTag', 'maker', 'model', 'kind', 'status', 'updatedAt']) {
    await qi.addIndex('instruments', ['archived', column], { name: `instruments_archived_${column}` })
  }
  // A customer's list and the filters by organization and status.
  await qi.addIndex('instruments', ['organizationId', 'status', 'serial'], { name: 'instruments_org_status_serial' })
  await qi.addIndex('instruments', ['spectralResponseId'], { name: 'instruments_spectral_response' })
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.dropTable('instruments')
  await qi.dropTable('contacts')
  await qi.dropTable('equipment_calibrations')
  await qi.dropTable('reference_instruments')
  await qi.dropTable('blackbody_sources')
  await qi.dropTable('spectral_responses')
  await qi.dropTable('uploads')
  await dropColumns(qi, 'organizations', ['country'])
  await dropColumns(qi, 'organizations', ['postcode'])
  await dropColumns(qi, 'organizations', ['city'])
  await dropColumns(qi, 'organizations', ['addressLines'])
}
