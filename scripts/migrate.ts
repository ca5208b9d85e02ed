// npm run db:migrate — apply pending migrations to DATABASE_URL (default sqlite:./data/bandlight.sqlite; postgres:// too).
import { closeDatabase, databaseDialect, databasePath } from '#server/utils/db'
import { config } from '#server/utils/config'
import { migrate } from '#server/utils/migrate'

const applied = await migrate()
// The SQLite file, or the PostgreSQL URL without its password.
const where = databaseDialect() === 'sqlite' ? databasePath() : config().databaseUrl.replace(/\/\/([^:@/]+):[^@/]*@/, '//$1:***@')
console.log(applied.length ? `Applied to ${where}: ${applied.join(', ')}` : `${where} is up to date.`)
await closeDatabase()
