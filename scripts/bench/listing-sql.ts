/**
 * The raw SQL of instrument list pages, for ./listing.ts (run there in a child process, once per tree):
 *
 *   node --import tsx scripts/bench/listing-sql.ts <tree dir> <sqlite file> '<JSON array of list paths>'
 *
 * Imports that tree's own list service (`server/services/instruments/instruments.ts`, so the current
 * checkout and the baseline each run their own SQL), calls it for each path as a laboratory user after
 * a warm-up (the steady state a busy list sees: whatever the service caches is cached), captures every
 * statement it sends, and replays them through the bare sqlite3 driver on the same file: the median
 * of 15 replays per statement, summed per page. Prints JSON `{ pages: [{ path, statements, ms }] }`.
 * "Raw SQL of the page" is this sum: the database's work plus the driver's, without the server.
 */
import path from 'node:path'
import { pathToFileURL } from 'node:url'
import sqlite3 from 'sqlite3'

const [tree, file, pathsJson] = process.argv.slice(2) as [string, string, string]
process.env.DATABASE_URL = `sqlite:${file}`
const load = (p: string) => import(pathToFileURL(path.join(tree, p)).href)
const { sequelize, closeDatabase } = await load('server/utils/db.ts')
await load('server/models/index.ts')
const { listInstruments } = await load('server/services/instruments/instruments.ts')
const { instrumentQuerySchema } = await load('shared/schemas/registerQuery.ts')

const db = new sqlite3.Database(file, sqlite3.OPEN_READONLY)
const all = (sql: string, bind: Record<string, unknown>) => new Promise<unknown[]>((resolve, reject) => db.all(sql, bind, (err, rows) => (err ? reject(err) : resolve(rows))))

const user = { id: 1, name: 'Bench', email: 'bench@bandlight.test', role: 'technician', organizationId: null }
const captured: { sql: string, bind: Record<string, unknown> }[] = []
const pages: { path: string, statements: number, ms: number }[] = []
for (const p of JSON.parse(pathsJson) as string[]) {
  const query = instrumentQuerySchema.parse(Object.fromEntries(new URL(p, 'http://x').searchParams))
  await listInstruments(user, query)
  await listInstruments(user, query)
  captured.length = 0
  sequelize.options.logging = (msg: string, options?: { bind?: Record<string, unknown> }) => {
    captured.push({ sql: msg.replace(/^Executing \([^)]*\): /, '').replace(/;\s*$/, ''), bind: Object.fromEntries(Object.entries(options?.bind ?? {}).map(([k, v]) => [`$${k}`, v])) })
  }
  await listInstruments(user, query)
  sequelize.options.logging = false
  let ms = 0
  for (const s of captured) {
    await all(s.sql, s.bind)
    const times: number[] = []
    for (let i = 0; i < 15; i++) {
      const t0 = performance.now()
      await all(s.sql, s.bind)
      times.push(performance.now() - t0)
    }
    times.sort((a, b) => a - b)
    ms += times[7]!
  }
  pages.push({ path: p, statements: captured.length, ms })
}
db.close()
await closeDatabase()
console.log(JSON.stringify({ pages }))
