/**
 * Helpers for the few schema changes whose SQL differs between the engines, kept side by side.
 */
import type { QueryInterface } from 'sequelize'

/** 'sqlite' or 'postgres'. */
export function dialectOf(qi: QueryInterface): string {
  return qi.sequelize.getDialect()
}

/**
 * Let columns hold NULL. PostgreSQL: `ALTER COLUMN … DROP NOT NULL`. SQLite cannot alter a
 * column, so the table is rebuilt the way SQLite documents it (ALTER TABLE, "Making Other Kinds Of
 * Table Schema Changes"): with foreign keys off, a copy with the new definition takes the rows,
 * replaces the table, and gets the table's indexes and triggers back; the foreign keys are checked
 * before the change commits.
 */
export async function allowNull(qi: QueryInterface, table: string, columns: readonly string[]): Promise<void> {
  const q = (sql: string) => qi.sequelize.query(sql)
  if (dialectOf(qi) === 'postgres') {
    for (const c of columns) await q(`ALTER TABLE "${table}" ALTER COLUMN "${c}" DROP NOT NULL`)
    return
  }
  const [rows] = await q(`SELECT type, name, sql FROM sqlite_master WHERE tbl_name = '${table}' AND sql IS NOT NULL`) as [{ type: string, name: string, sql: string }[], unknown]
  const create = rows.find(r => r.type === 'table')
  if (!create) throw new Error(`no table ${table}`)
  let sql = create.sql
  for (const c of columns) {
    const re = new RegExp('([`"]' + c + '[`"] [^,]*?) NOT NULL')
    if (!re.test(sql)) throw new Error(`column ${table}.${c} is not NOT NULL (or not found)`)
    sql = sql.replace(re, '$1')
  }
  const temp = `${table}__rebuild`
  sql = sql.replace(/^CREATE TABLE [`"]?[\w]+[`"]?/, `CREATE TABLE \`${temp}\``)
  const others = rows.filter(r => r.type === 'index' || r.type === 'trigger')
  await q('PRAGMA foreign_keys = OFF')
  try {
    await q('BEGIN IMMEDIATE')
    try {
      await q(sql)
      await q(`INSERT INTO \`${temp}\` SELECT * FROM \`${table}\``)
      await q(`DROP TABLE \`${table}\``)
      await q(`ALTER TABLE \`${temp}\` RENAME TO \`${table}\``)
      for (const o of others) await q(o.sql)
      const [broken] = await q('PRAGMA foreign_key_check') as [unknown[], unknown]
      if (broken.length) throw new Error(`foreign keys broken after rebuilding ${table}`)
      await q('COMMIT')
    }
    catch (err) {
      await q('ROLLBACK')
      throw err
    }
  }
  finally {
    await q('PRAGMA foreign_keys = ON')
  }
}

/**
 * An identifier of ours (a table, trigger or function name written in a migration), double-quoted.
 * DDL cannot take bound parameters, so names are checked instead: anything but letters, digits and
 * underscores is refused before it reaches SQL.
 */
export function sqlIdentifier(name: string): string {
  if (!/^[A-Za-z_][A-Za-z0-9_]*$/.test(name)) throw new Error(`not a plain SQL identifier: ${JSON.stringify(name)}`)
  return `"${name}"`
}

/** A text as an SQL string literal (quotes doubled), for the messages of guards. */
export function sqlText(text: string): string {
  return `'${text.replace(/'/g, "''")}'`
}

/**
 * A row-level guard: a trigger that refuses a change to a table. `when` (PostgreSQL) and `sqliteWhen`
 * are SQL conditions over OLD/NEW written in the migration itself (constant code, never input);
 * omitted, the guard always refuses.
 */
export interface PgGuard {
  /** Name of the trigger and of its PL/pgSQL function. */
  name: string
  table: string
  event: 'INSERT' | 'UPDATE' | 'DELETE'
  /** When to refuse, in SQL over OLD/NEW (subqueries allowed); omitted = always. */
  when?: string
  message: string
}

/** A guard for both engines: the PostgreSQL condition and SQLite's. */
export interface Guard extends PgGuard {
  sqliteWhen?: string
}

/**
 * PostgreSQL's counterpart of SQLite's `CREATE TRIGGER … BEGIN SELECT RAISE(ABORT, '…'); END`:
 * a PL/pgSQL function that raises the message when `when` holds, and a BEFORE … FOR EACH ROW
 * trigger that calls it. (A PostgreSQL trigger's own WHEN clause cannot hold a subquery, so the
 * condition lives in the function.)
 */
export async function createPgGuard(qi: QueryInterface, g: PgGuard): Promise<void> {
  const name = sqlIdentifier(g.name)
  await qi.sequelize.query(`CREATE OR REPLACE FUNCTION ${name}() RETURNS trigger LANGUAGE plpgsql AS $guard$
BEGIN
  IF ${g.when ?? 'TRUE'} THEN
    RAISE EXCEPTION ${sqlText(g.message)} USING ERRCODE = 'restrict_violation';
  END IF;
  IF TG_OP = 'DELETE' THEN RETURN OLD; END IF;
  RETURN NEW;
END
$guard$`)
  await qi.sequelize.query(`CREATE TRIGGER ${name} BEFORE ${g.event} ON ${sqlIdentifier(g.table)} FOR EACH ROW EXECUTE FUNCTION ${name}()`)
}

/** Create a guard on the engine of `qi`: the PostgreSQL function and trigger, or SQLite's RAISE(ABORT) trigger. */
export async function createGuard(qi: QueryInterface, g: Guard): Promise<void> {
  if (dialectOf(qi) === 'postgres') return createPgGuard(qi, g)
  await qi.sequelize.query(`CREATE TRIGGER ${sqlIdentifier(g.name)} BEFORE ${g.event} ON ${sqlIdentifier(g.table)}${g.sqliteWhen ? ` WHEN ${g.sqliteWhen}` : ''}
    BEGIN SELECT RAISE(ABORT, ${sqlText(g.message)}); END`)
}

/** Drop a guard on either engine (SQLite: the trigger; PostgreSQL: the trigger and its function). */
export async function dropGuard(qi: QueryInterface, name: string, table: string): Promise<void> {
  if (dialectOf(qi) === 'postgres') {
    await qi.sequelize.query(`DROP TRIGGER IF EXISTS ${sqlIdentifier(name)} ON ${sqlIdentifier(table)}`)
    await qi.sequelize.query(`DROP FUNCTION IF EXISTS ${sqlIdentifier(name)}()`)
    return
  }
  await qi.sequelize.query(`DROP TRIGGER IF EXISTS ${sqlIdentifier(name)}`)
}

/** PostgreSQL: a condition true when any of the columns differs between OLD and NEW (compared as text, so JSON columns compare too). */
export function pgAnyChanged(columns: readonly string[]): string {
  return columns.map(sqlIdentifier).map(c => `NEW.${c}::text IS DISTINCT FROM OLD.${c}::text`).join(' OR ')
}

/** SQLite: a condition true when any of the columns differs between OLD and NEW. */
export function sqliteAnyChanged(columns: readonly string[]): string {
  return columns.map(sqlIdentifier).map(c => `NEW.${c} IS NOT OLD.${c}`).join(' OR ')
}

/**
 * Drop columns on either engine with the database's own `ALTER TABLE … DROP COLUMN` (SQLite ≥ 3.35,
 * PostgreSQL). Sequelize's SQLite `removeColumn` rebuilds the table from a description that loses
 * composite unique indexes and triggers; the native statement keeps them. A column still named by
 * an index or trigger must have it dropped first (SQLite refuses, which is the safe answer).
 */
export async function dropColumns(qi: QueryInterface, table: string, columns: readonly string[]): Promise<void> {
  for (const c of columns) await qi.sequelize.query(`ALTER TABLE "${table}" DROP COLUMN "${c}"`)
}
