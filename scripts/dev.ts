/**
 * npm run dev — the Nuxt development server with a local mail server: messages sent to
 * 127.0.0.1:2525 are kept as JSON in data/mailbox (or BANDLIGHT_MAILBOX_DIR) and shown on the
 * admin Mail page. When SMTP_URL is set, mail goes there and no local server is started.
 * Arguments are passed on to `nuxt dev`.
 */
import path from 'node:path'
import { spawn } from 'node:child_process'
import { startMailSink, type MailSink } from './lib/mailSink'
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

const child = spawn('npx', ['nuxt', 'dev', ...process.argv.slice(2)], { cwd: ROOT, env, stdio: 'inherit' })
for (const sig of ['SIGINT', 'SIGTERM'] as const) process.on(sig, () => child.kill(sig))
child.on('exit', async (code) => {
  await sink?.close()
  process.exit(code ?? 0)
})
