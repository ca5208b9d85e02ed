/**
 * Runs pending schema migrations with umzug and its Sequelize storage (table `SequelizeMeta`).
 * Called by the server at start (server/plugins/00.database.ts) and by `npm run db:migrate`.
 */
import { Umzug, SequelizeStorage } from 'umzug'
import type { QueryInterface } from 'sequelize'
import { sequelize } from './db'
import { migrations } from '#server/migrations'

export function migrator() {
  return new Umzug<QueryInterface>({
    migrations: migrations.map(m => ({
      name: m.name,
      up: ({ context }) => m.up({ context }),
      down: ({ context }) => m.down({ context }),
    })),
    context: sequelize.getQueryInterface(),
    storage: new SequelizeStorage({ sequelize }),
    logger: undefined,
  })
}

/** The key of the PostgreSQL advisory lock under which one instance at a time migrates (any constant). */
const MIGRATION_LOCK = 7_301_914

/**
 * Apply every pending migration; returns the names applied. On PostgreSQL, instances that start
 * together take turns (a transaction-scoped advisory lock, held on a connection of its own while
 * the migrations run): the first applies them, the others then find nothing pending.
 */
export async function migrate(): Promise<string[]> {
  if (sequelize.getDialect() !== 'postgres') return (await migrator().up()).map(m => m.name)
  return sequelize.transaction(async (t) => {
    await sequelize.query(`SELECT pg_advisory_xact_lock(${MIGRATION_LOCK})`, { transaction: t })
    return (await migrator().up()).map(m => m.name)
  })
}
