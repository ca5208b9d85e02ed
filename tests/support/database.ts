/**
 * The database an integration test file runs against: a new SQLite file in the test's temporary
 * folder, or — when BANDLIGHT_TEST_PG_URL names the maintenance database of a throw-away PostgreSQL
 * cluster (scripts/test-server.ts --db=postgres) — a new, empty database in that cluster.
 */
import crypto from 'node:crypto'
import path from 'node:path'
import pg from 'pg'

/** A `DATABASE_URL` for a fresh database named after `name` (letters, digits and `_`). */
export async function testDatabaseUrl(dir: string, name: string): Promise<string> {
  const admin = process.env.BANDLIGHT_TEST_PG_URL
  if (!admin) return `sqlite:${path.join(dir, `${name}.sqlite`)}`
  const database = `${name}_${crypto.randomBytes(4).toString('hex')}`
  const client = new pg.Client({ connectionString: admin })
  await client.connect()
  try {
    await client.query(`CREATE DATABASE ${database} TEMPLATE template0 ENCODING 'UTF8' LOCALE_PROVIDER icu ICU_LOCALE 'und' LOCALE 'C.UTF-8'`)
  }
  finally {
    await client.end()
  }
  const url = new URL(admin)
  url.pathname = `/${database}`
  return url.toString()
}
