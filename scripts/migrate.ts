// npm run db:migrate — apply pending migrations to DATABASE_URL (default sqlite:./data/bandlight.sqlite).
import { closeDatabase, databasePath } from '#server/utils/db'
import { migrate } from '#server/utils/migrate'

const applied = await migrate()
console.log(applied.length ? `Applied to ${databasePath()}: ${applied.join(', ')}` : `${databasePath()} is up to date.`)
await closeDatabase()
