import { DataTypes, type QueryInterface } from 'sequelize'
import { dialectOf } from './lib'

/**
 * What the faster lists, search, overview and session check need from the database (issue 17):
 *
 * - `change_counters` (name, value): one row per kind of change that cached figures depend on. A
 *   trigger moves the row's value in the same transaction as the change itself, so a reader that
 *   sees a value also sees every change counted in it. Rows:
 *   - `instruments`: every insert and delete of an instrument and every update of a column a list
 *     filters or searches on (server/utils/changeCounters.ts caches list totals per filter against it);
 *   - `sessions`: every update or delete of a session (revocation) and every change of a user's
 *     name, e-mail, role, organization, active flag or password (the per-session user cache of
 *     server/services/auth/sessions.ts is checked against it on every request).
 *   SQLite: row triggers (AFTER …). PostgreSQL: statement triggers that run BEFORE the statement, so
 *   every transaction that changes instruments takes the counter row's lock before any instrument
 *   row's, always in that order (no deadlock between two such transactions).
 * - search anywhere in an instrument's serial or asset tag: on SQLite the FTS5 table
 *   `instrument_search` with the trigram tokenizer over those two columns (external content: the
 *   index only, kept in step by triggers); on PostgreSQL trigram GIN indexes on lower(serial) and
 *   lower("assetTag") (pg_trgm, as migration 0011 tried; without it the search reads the table).
 * - the overview's counts for one customer: (organizationId, archived, nextDueDate).
 */
const INSTRUMENT_FILTER_COLUMNS = ['archived', 'organizationId', 'status', 'kind', 'nextDueDate', 'serial', 'assetTag', 'maker', 'model']
const USER_SESSION_COLUMNS = ['name', 'email', 'role', 'organizationId', 'active', 'passwordHash']
const quoted = (cs: readonly string[]) => cs.map(c => `"${c}"`).join(', ')

/** The counted tables: counter name, table, the events that move it (UPDATE OF the given columns). */
const COUNTED: { counter: string, table: string, update: readonly string[] | 'all', insert: boolean }[] = [
  { counter: 'instruments', table: 'instruments', update: INSTRUMENT_FILTER_COLUMNS, insert: true },
  { counter: 'sessions', table: 'user_sessions', update: 'all', insert: false },
  { counter: 'sessions', table: 'users', update: USER_SESSION_COLUMNS, insert: false },
]

export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  const q = (sql: string) => qi.sequelize.query(sql)
  await qi.createTable('change_counters', {
    name: { type: DataTypes.STRING(60), primaryKey: true },
    value: { type: DataTypes.BIGINT, allowNull: false, defaultValue: 0 },
  })
  await q(`INSERT INTO change_counters (name, value) VALUES ('instruments', 0), ('sessions', 0)`)
  await qi.addIndex('instruments', ['organizationId', 'archived', 'nextDueDate'], { name: 'instruments_org_archived_next_due' })

  if (dialectOf(qi) === 'sqlite') {
    for (const c of COUNTED) {
      const bump = `BEGIN UPDATE change_counters SET value = value + 1 WHERE name = '${c.counter}'; END`
      if (c.insert) await q(`CREATE TRIGGER ${c.table}_count_insert AFTER INSERT ON ${c.table} ${bump}`)
      await q(`CREATE TRIGGER ${c.table}_count_update AFTER UPDATE${c.update === 'all' ? '' : ` OF ${quoted(c.update)}`} ON ${c.table} ${bump}`)
      await q(`CREATE TRIGGER ${c.table}_count_delete AFTER DELETE ON ${c.table} ${bump}`)
    }
    // Search inside serials and asset tags: a trigram index of the two columns (content stays in instruments).
    await q(`CREATE VIRTUAL TABLE instrument_search USING fts5(serial, "assetTag", content='instruments', content_rowid='id', tokenize='trigram')`)
    await q(`CREATE TRIGGER instrument_search_insert AFTER INSERT ON instruments BEGIN
      INSERT INTO instrument_search (rowid, serial, "assetTag") VALUES (NEW.id, NEW.serial, NEW."assetTag"); END`)
    await q(`CREATE TRIGGER instrument_search_delete AFTER DELETE ON instruments BEGIN
      INSERT INTO instrument_search (instrument_search, rowid, serial, "assetTag") VALUES ('delete', OLD.id, OLD.serial, OLD."assetTag"); END`)
    await q(`CREATE TRIGGER instrument_search_update AFTER UPDATE OF serial, "assetTag" ON instruments BEGIN
      INSERT INTO instrument_search (instrument_search, rowid, serial, "assetTag") VALUES ('delete', OLD.id, OLD.serial, OLD."assetTag");
      INSERT INTO instrument_search (rowid, serial, "assetTag") VALUES (NEW.id, NEW.serial, NEW."assetTag"); END`)
    await q(`INSERT INTO instrument_search (instrument_search) VALUES ('rebuild')`)
    return
  }

  await q(`CREATE OR REPLACE FUNCTION bandlight_count_change() RETURNS trigger LANGUAGE plpgsql AS $count$
BEGIN
  UPDATE change_counters SET value = value + 1 WHERE name = TG_ARGV[0];
  RETURN NULL;
END
$count$`)
  for (const c of COUNTED) {
    const events = [...(c.insert ? ['INSERT'] : []), c.update === 'all' ? 'UPDATE' : `UPDATE OF ${quoted(c.update)}`, 'DELETE', 'TRUNCATE']
    await q(`CREATE TRIGGER "${c.table}_count_change" BEFORE ${events.join(' OR ')} ON "${c.table}" FOR EACH STATEMENT EXECUTE FUNCTION bandlight_count_change('${c.counter}')`)
  }
  let trigram = true
  try {
    await q('CREATE EXTENSION IF NOT EXISTS pg_trgm')
  }
  catch {
    trigram = false
  }
  if (trigram) {
    await q('CREATE INDEX instruments_serial_trgm ON instruments USING gin (lower(serial) gin_trgm_ops)')
    await q('CREATE INDEX instruments_asset_tag_trgm ON instruments USING gin (lower("assetTag") gin_trgm_ops)')
  }
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  const q = (sql: string) => qi.sequelize.query(sql)
  if (dialectOf(qi) === 'sqlite') {
    for (const name of ['instrument_search_insert', 'instrument_search_delete', 'instrument_search_update']) await q(`DROP TRIGGER IF EXISTS ${name}`)
    await q('DROP TABLE IF EXISTS instrument_search')
    for (const c of COUNTED) {
      for (const e of ['insert', 'update', 'delete']) await q(`DROP TRIGGER IF EXISTS ${c.table}_count_${e}`)
    }
  }
  else {
    await q('DROP INDEX IF EXISTS instruments_serial_trgm')
    await q('DROP INDEX IF EXISTS instruments_asset_tag_trgm')
    for (const c of COUNTED) await q(`DROP TRIGGER IF EXISTS "${c.table}_count_change" ON "${c.table}"`)
    await q('DROP FUNCTION IF EXISTS bandlight_count_change()')
  }
  await qi.removeIndex('instruments', 'instruments_org_archived_next_due')
  await qi.dropTable('change_counters')
}
