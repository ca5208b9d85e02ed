import { DataTypes, type QueryInterface } from 'sequelize'
import { dialectOf } from './lib'

/**
 * State that several server instances on one database must share, and PostgreSQL's search indexes:
 * - `file_contents`: stored files (uploads, certificate PDFs) by SHA-256, when FILE_STORAGE is
 *   `database` (the default on PostgreSQL; server/utils/fileStore.ts);
 * - `calculation_jobs`: Monte Carlo jobs (status, progress, result), so any instance answers a poll
 *   (server/services/calculations/jobs.ts);
 * - `task_leases`: who runs a scheduled job now, until when (server/utils/lease.ts);
 * - PostgreSQL only: the case-insensitive uniqueness that SQLite's NOCASE columns give (an
 *   instrument's maker, model and serial within its organization; equipment asset tags), and
 *   case-insensitive search through `lower(column)`, and covering indexes for the instrument list. Prefix search (`LIKE 'abc%'`)
 *   uses B-tree indexes with `text_pattern_ops`; where lists search inside the text
 *   (`LIKE '%abc%'`), trigram indexes (pg_trgm, in Debian's `postgresql` package) when the
 *   extension can be created, else a sequential scan of those small tables.
 */
export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.createTable('file_contents', {
    sha256: { type: DataTypes.STRING(64), primaryKey: true },
    size: { type: DataTypes.INTEGER, allowNull: false },
    data: { type: DataTypes.BLOB, allowNull: false },
    createdAt: { type: DataTypes.DATE, allowNull: false },
  })

  await qi.createTable('calculation_jobs', {
    id: { type: DataTypes.STRING(36), primaryKey: true },
    userId: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'users', key: 'id' }, onDelete: 'RESTRICT' },
    status: { type: DataTypes.STRING(10), allowNull: false },
    done: { type: DataTypes.INTEGER, allowNull: false },
    total: { type: DataTypes.INTEGER, allowNull: false },
    result: { type: DataTypes.JSON, allowNull: true },
    error: { type: DataTypes.JSON, allowNull: true },
    /** The instance that runs it, and when it last said so. */
    instanceId: { type: DataTypes.STRING(64), allowNull: false },
    heartbeatAt: { type: DataTypes.DATE, allowNull: false },
    startedAt: { type: DataTypes.DATE, allowNull: false },
    endedAt: { type: DataTypes.DATE, allowNull: true },
  })
  await qi.addIndex('calculation_jobs', ['userId', 'status'])
  await qi.addIndex('calculation_jobs', ['endedAt'])

  await qi.createTable('task_leases', {
    name: { type: DataTypes.STRING(60), primaryKey: true },
    holder: { type: DataTypes.STRING(64), allowNull: false },
    expiresAt: { type: DataTypes.DATE, allowNull: false },
  })

  if (dialectOf(qi) !== 'postgres') return
  const q = (sql: string) => qi.sequelize.query(sql)
  // What SQLite's NOCASE columns make unique regardless of case (migration 0002).
  await q('CREATE UNIQUE INDEX instruments_identity_unique_lower ON instruments ("organizationId", lower(maker), lower(model), lower(serial))')
  await q('CREATE UNIQUE INDEX blackbody_sources_asset_tag_unique_lower ON blackbody_sources (lower("assetTag"))')
  await q('CREATE UNIQUE INDEX reference_instruments_asset_tag_unique_lower ON reference_instruments (lower("assetTag"))')
  // The instrument list's page of ids from an index alone, as SQLite's (archived, column) indexes
  // give it (SQLite's indexes end in the rowid): (archived, column, id), so ORDER BY column, id needs no sort.
  for (const c of ['serial', 'nextDueDate', 'assetTag', 'maker', 'model', 'kind', 'status', 'updatedAt']) {
    await q(`CREATE INDEX "instruments_archived_${c}_id" ON instruments (archived, "${c}", id)`)
  }
  const prefix: [string, string[]][] = [
    ['instruments', ['serial', 'assetTag', 'maker', 'model']],
    ['blackbody_sources', ['assetTag', 'maker', 'model', 'serial']],
    ['reference_instruments', ['assetTag', 'maker', 'model', 'serial']],
    ['certificates', ['number', 'instrumentSerial']],
  ]
  for (const [table, columns] of prefix) {
    for (const c of columns) await q(`CREATE INDEX "${table}_${c}_lower" ON "${table}" (lower("${c}") text_pattern_ops)`)
  }
  const contains: [string, string[]][] = [['organizations', ['name', 'city']], ['spectral_responses', ['name']]]
  let trigram = true
  try {
    await q('CREATE EXTENSION IF NOT EXISTS pg_trgm')
  }
  catch {
    trigram = false
  }
  for (const [table, columns] of contains) {
    for (const c of columns) {
      await q(trigram
        ? `CREATE INDEX "${table}_${c}_lower" ON "${table}" USING gin (lower("${c}") gin_trgm_ops)`
        : `CREATE INDEX "${table}_${c}_lower" ON "${table}" (lower("${c}") text_pattern_ops)`)
    }
  }
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.dropTable('task_leases')
  await qi.dropTable('calculation_jobs')
  await qi.dropTable('file_contents')
}
