/**
 * npm run dev — the Nuxt development server with a local mail server: messages sent to
 * 127.0.0.1:2525 are kept as JSON in data/mailbox (or BANDLIGHT_MAILBOX_DIR) and shown on the
 * admin Mail page. When SMTP_URL is set, mail goes there and no local server is started. Unless
 * STRIPE_SECRET_KEY is set, card payments go to the local payment service (scripts/lib/paymentFake.ts)
 * on 127.0.0.1:12111 (or a free port), which signs its events to this server's webhook.
 * Arguments are passed on to `nuxt dev`.
 */
import path from 'node:path'
import { spawn } from 'node:child_process'
import { startMailSink, type MailSink } from './lib/mailSink'
import { fakeSecrets, startPaymentFake, type PaymentFake } from './lib/paymentFake'
import { ROOT } from './lib/server'

const env: NodeJS.ProcessEnv = { ...process.env }
let sink: MailSink | null = null
if (!process.env.SMTP_URL) {
  const mailbox = process.env.BANDLIGHT_MAILBOX_DIR || path.join(ROOT, 'data', 'mailbox')
  try {
    sink = await startMailSink({ port: 2525, dir: mailbox })
    console.log(`Local mail server on 127.0.0.1:${sink.port}, messages in ${mailbox}`)
  }
  catch (err) {
    // Another dev server or demo may already run one on 2525: mail still arrives there.
    console.warn(`No local mail server started (${(err as Error).message}); mail goes to 127.0.0.1:2525.`)
  }
  env.SMTP_URL = 'smtp://127.0.0.1:2525'
  env.BANDLIGHT_MAILBOX_DIR = mailbox
}

// Card payment against the local payment service, unless a real one is configured.
let payments: PaymentFake | null = null
if (!process.env.STRIPE_SECRET_KEY) {
  const secrets = fakeSecrets()
  const webhookUrl = `http://127.0.0.1:${Number(process.env.PORT) || 3000}/api/payments/webhook`
  payments = await startPaymentFake({ port: 12111, webhookUrl, ...secrets }).catch(() => startPaymentFake({ port: 0, webhookUrl, ...secrets }))
  Object.assign(env, { STRIPE_SECRET_KEY: secrets.secretKey, STRIPE_WEBHOOK_SECRET: secrets.webhookSecret, STRIPE_API_BASE: payments.url })
  console.log(`Local payment service on ${payments.url} (events to ${webhookUrl})`)
}

const child = spawn('npx', ['nuxt', 'dev', ...process.argv.slice(2)], { cwd: ROOT, env, stdio: 'inherit' })
for (const sig of ['SIGINT', 'SIGTERM'] as const) process.on(sig, () => child.kill(sig))
child.on('exit', async (code) => {
  await sink?.close()
  await payments?.close()
  process.exit(code ?? 0)
})
