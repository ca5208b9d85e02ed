/**
 * Runs the API and browser tests against one built server on a free port with a
 * temporary database seeded with the demo scenario (scripts/seed.ts, before the server starts), and a local mail server on another free
 * port whose messages land in <temp dir>/mailbox (BANDLIGHT_MAILBOX_DIR, also given to the
 * tests), and a local payment service (scripts/lib/paymentFake.ts; STRIPE_* for the server,
 * BANDLIGHT_TEST_PAYMENT_URL and the secrets for the tests). `npm test` builds first.
 *
 * The engine: SQLite (a file in the temporary folder) unless `--db=postgres` is given or
 * BANDLIGHT_TEST_DB=postgres is set; then a throw-away PostgreSQL cluster (scripts/lib/postgres.ts)
 * holds the server's database, and the integration tests, when asked for, make their own databases
 * in it (BANDLIGHT_TEST_PG_URL, tests/support/database.ts).
 *
 * Arguments: project names (integration, api, e2e; default api and e2e), file filters
 * (tests/e2e/runs) and `--db=sqlite|postgres`.
 */
import crypto from 'node:crypto'
import fs from 'node:fs'
import os from 'node:os'
import path from 'node:path'
import type { ChildProcess } from 'node:child_process'
import { startMailSink } from './lib/mailSink'
import { fakeSecrets, startPaymentFake, type PaymentFake } from './lib/paymentFake'
import { startPostgres, type PostgresCluster } from './lib/postgres'
import { SERVER_ENTRY, freePort, run, startServer } from './lib/server'

const args = process.argv.slice(2)
const dbArg = args.find(a => a.startsWith('--db='))?.slice(5) ?? process.env.BANDLIGHT_TEST_DB ?? 'sqlite'
if (dbArg !== 'sqlite' && dbArg !== 'postgres') {
  console.error(`--db must be sqlite or postgres (got ${dbArg})`)
  process.exit(2)
}
const rest = args.filter(a => !a.startsWith('--db='))
const files = rest.filter(a => a.includes('/'))
const named = rest.filter(a => !a.includes('/'))
const projects = named.length ? named : ['api', 'e2e']
const needsServer = projects.some(p => p !== 'integration')

if (needsServer && !fs.existsSync(SERVER_ENTRY)) {
  console.error('No .output — run `npm run build` first.')
  process.exit(1)
}

const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'bandlight-test-'))
let pg: PostgresCluster | null = null
let server: ChildProcess | null = null
let payments: PaymentFake | null = null
let code = 1
const sink = await startMailSink({ port: 0, dir: path.join(dir, 'mailbox'), quiet: true })
try {
  let databaseUrl = `sqlite:${path.join(dir, 'test.sqlite')}`
  const engineEnv: Record<string, string> = {}
  if (dbArg === 'postgres') {
    pg = await startPostgres()
    databaseUrl = await pg.createDatabase('bandlight')
    engineEnv.BANDLIGHT_TEST_PG_URL = pg.url('postgres')
  }
  console.log(`[test-server] ${projects.join(', ')} on ${dbArg === 'postgres' ? `PostgreSQL (throw-away cluster on port ${pg!.port})` : 'SQLite'}`)
  const mailbox = path.join(dir, 'mailbox')
  const env = {
    ...process.env,
    DATABASE_URL: databaseUrl,
    NUXT_SESSION_PASSWORD: crypto.randomBytes(32).toString('hex'),
    TRUST_PROXY: '1',
    BANDLIGHT_DATA_DIR: path.join(dir, 'files'),
    SMTP_URL: `smtp://127.0.0.1:${sink.port}`,
    BANDLIGHT_MAILBOX_DIR: mailbox,
    MAIL_SEND_INTERVAL_MS: '500',
    ...engineEnv,
  }
  const testEnv: NodeJS.ProcessEnv = { ...env, TEST_DATA_DIR: dir }
  if (needsServer) {
    if ((await run(process.execPath, ['--import', 'tsx', 'scripts/seed.ts'], env)) !== 0) throw new Error('seeding failed')
    const port = await freePort()
    // The local payment service: the SDK calls it, it signs events to this server's webhook.
    const secrets = fakeSecrets()
    payments = await startPaymentFake({ port: 0, webhookUrl: `http://127.0.0.1:${port}/api/payments/webhook`, ...secrets, quiet: true })
    const paymentEnv = { STRIPE_SECRET_KEY: secrets.secretKey, STRIPE_WEBHOOK_SECRET: secrets.webhookSecret, STRIPE_API_BASE: payments.url }
    server = await startServer({ ...env, ...paymentEnv }, port, { quiet: true })
    testEnv.BANDLIGHT_TEST_URL = `http://127.0.0.1:${port}`
    Object.assign(testEnv, paymentEnv, { BANDLIGHT_TEST_PAYMENT_URL: payments.url })
  }
  // The integration tests choose their own databases (tests/support/database.ts), not the server's.
  if (projects.includes('integration')) delete testEnv.DATABASE_URL
  code = await run('npx', ['vitest', 'run', ...projects.flatMap(p => ['--project', p]), ...files], testEnv)
}
catch (err) {
  console.error(err)
  code = 1
}
finally {
  server?.kill('SIGTERM')
  await new Promise(r => setTimeout(r, 300))
  await sink.close()
  await payments?.close()
  await pg?.stop()
  fs.rmSync(dir, { recursive: true, force: true })
}
process.exit(code)
