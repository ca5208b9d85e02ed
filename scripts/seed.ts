/**
 * `npm run db:seed`: apply pending migrations, then make sure the invented demo scenario is in the
 * database named by DATABASE_URL (idempotent: a second run changes nothing). Used by `npm run demo`
 * and the test runner before they start the server.
 */
import { seedDemo } from './demo-data'
import { closeDatabase } from '#server/utils/db'
import { migrate } from '#server/utils/migrate'
import '#server/models'

const applied = await migrate()
if (applied.length) console.log(`[bandlight] migrations applied: ${applied.join(', ')}`)
console.log(`[bandlight] demo data: ${await seedDemo()}`)
await closeDatabase()
