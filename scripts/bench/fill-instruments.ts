/**
 * Adds invented instruments to the database named by DATABASE_URL (after `npm run db:seed`), for the
 * listing benchmark through the built server (./listing.ts): `node --import tsx
 * scripts/bench/fill-instruments.ts 100000`. 50 invented customers, rows from ./registers.ts, then
 * ANALYZE (VACUUM ANALYZE on PostgreSQL) so the planner knows the table's size.
 */
import { benchInstrumentRows } from './registers'
import { closeDatabase, sequelize } from '#server/utils/db'
import { Instrument } from '#server/models/Instrument'
import { Organization } from '#server/models/Organization'

const count = Number(process.argv[2] ?? 100_000)
const orgs = await Organization.bulkCreate(Array.from({ length: 50 }, (_, i) => ({ name: `Bench Customer ${i + 1}`, contactEmails: [] })))
const orgIds = orgs.map(o => o.id)
const CHUNK = 2000
for (let start = 0; start < count; start += CHUNK) {
  const batch = benchInstrumentRows(start, Math.min(count, start + CHUNK), orgIds)
  await sequelize.transaction(async t => Instrument.bulkCreate(batch, { transaction: t }))
}
// PostgreSQL: VACUUM too, as autovacuum would soon, so index-only scans need not visit the table.
await sequelize.query(sequelize.getDialect() === 'postgres' ? 'VACUUM ANALYZE' : 'ANALYZE')
await closeDatabase()
