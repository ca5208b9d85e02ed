/**
 * npm run demo — build if needed, migrate, seed the invented demo laboratory and
 * start the built server on PORT (default 3000) with DATABASE_URL. Unless SMTP_URL is given,
 * a local mail server on 127.0.0.1:2525 receives the e-mails into <data dir>/mailbox, which the
 * admin Mail page shows. Unless STRIPE_SECRET_KEY is given, card payments go to a local payment
 * service on 127.0.0.1:12111 (scripts/lib/paymentFake.ts) that signs its events to the server.
 */
import crypto from 'node:crypto'
import fs from 'node:fs'
import path from 'node:path'
import { startMailSink, type MailSink } from './lib/mailSink'
import { fakeSecrets, startPaymentFake, type PaymentFake } from './lib/paymentFake'
import { buildIsStale, run, startServer } from './lib/server'
import { DEFAULT_DATABASE_URL } from '#server/utils/config'
import { databaseDialect, databasePath } from '#server/utils/db'

const port = Number(process.env.PORT) || 3000
const databaseUrl = process.env.DATABASE_URL || DEFAULT_DATABASE_URL
// A PostgreSQL DATABASE_URL works too (the secret and the mailbox then go to ./data).
const dbFile = databaseDialect(databaseUrl) === 'sqlite' ? databasePath(databaseUrl) : ':memory:'

if (buildIsStale()) {
  console.log('Building Bandlight (the sources are newer than .output)…')
  const code = await run('npx', ['nuxt', 'build'])
  if (code !== 0) process.exit(code)
}

// A session secret that survives restarts, kept beside the database unless one is given.
let sessionPassword = process.env.NUXT_SESSION_PASSWORD
if (!sessionPassword) {
  const secretFile = path.join(dbFile === ':memory:' ? path.resolve('data') : path.dirname(dbFile), '.session-secret')
  fs.mkdirSync(path.dirname(secretFile), { recursive: true })
  if (!fs.existsSync(secretFile)) fs.writeFileSync(secretFile, crypto.randomBytes(32).toString('hex'), { mode: 0o600 })
  sessionPassword = fs.readFileSync(secretFile, 'utf8').trim()
}

const dataDir = dbFile === ':memory:' ? path.resolve('data') : path.dirname(dbFile)
let sink: MailSink | null = null
const mailEnv: Record<string, string> = {}
if (!process.env.SMTP_URL) {
  const mailbox = process.env.BANDLIGHT_MAILBOX_DIR || path.join(dataDir, 'mailbox')
  sink = await startMailSink({ port: 2525, dir: mailbox })
  mailEnv.SMTP_URL = `smtp://127.0.0.1:${sink.port}`
  mailEnv.BANDLIGHT_MAILBOX_DIR = mailbox
}

// Card payment against the local payment service, unless a real one is configured.
let payments: PaymentFake | null = null
const paymentEnv: Record<string, string> = {}
if (!process.env.STRIPE_SECRET_KEY) {
  const secrets = fakeSecrets()
  const webhookUrl = `http://127.0.0.1:${port}/api/payments/webhook`
  payments = await startPaymentFake({ port: 12111, webhookUrl, ...secrets }).catch(() => startPaymentFake({ port: 0, webhookUrl, ...secrets }))
  Object.assign(paymentEnv, { STRIPE_SECRET_KEY: secrets.secretKey, STRIPE_WEBHOOK_SECRET: secrets.webhookSecret, STRIPE_API_BASE: payments.url })
}

const env = { ...process.env, DATABASE_URL: databaseUrl, NUXT_SESSION_PASSWORD: sessionPassword, ...mailEnv, ...paymentEnv }
const seeded = await run(process.execPath, ['--import', 'tsx', 'scripts/seed.ts'], env)
if (seeded !== 0) process.exit(seeded)
const server = await startServer(env, port)

console.log(`
  Bandlight demo is running at http://localhost:${port}
  Database: ${dbFile === ':memory:' ? databaseUrl.replace(/\/\/([^:@/]+):[^@/]*@/, '//$1:***@') : dbFile}
  Mail: ${sink ? `local mail server on 127.0.0.1:${sink.port}, messages in ${sink.dir} (admin → Mail)` : `sent to ${process.env.SMTP_URL}`}
  Card payments: ${payments ? `local test payment service on ${payments.url} (no real money)` : 'the configured payment provider'}

  Demo accounts (password for each: bandlight-demo — demo only, change them on a real installation)
    admin@bandlight.test        administrator
    technician@bandlight.test   technician
    quality@bandlight.test      quality manager
    customer@bandlight.test     customer (Kestrelmoor Foundry Ltd)

  Press Ctrl+C to stop.
`)

for (const sig of ['SIGINT', 'SIGTERM'] as const) process.on(sig, () => server.kill(sig))
server.on('exit', async (code) => {
  await sink?.close()
  await payments?.close()
  process.exit(code ?? 0)
})
