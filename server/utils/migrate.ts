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

/** Apply every pending migration; returns the names applied. */
export async function migrate(): Promise<string[]> {
  const applied = await migrator().up()
  return applied.map(m => m.name)
}
