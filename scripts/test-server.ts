/**
 * Runs the API and browser tests against one built server on a free port with a
 * temporary database seeded with the demo scenario (scripts/seed.ts, before the server starts), and a local mail server on another free
 * port whose messages land in <temp dir>/mailbox (BANDLIGHT_MAILBOX_DIR, also given to the
 * tests). `npm test` builds first.
 */
import crypto from 'node:crypto'
import fs from 'node:fs'
import os from 'node:os'
import path from 'node:path'
import { startMailSink } from './lib/mailSink'
import { SERVER_ENTRY, freePort, run, startServer } from './lib/server'

if (!fs.existsSync(SERVER_ENTRY)) {
  console.error('No .output — run `npm run build` first.')
  process.exit(1)
}

const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'bandlight-test-'))
const port = await freePort()
const mailbox = path.join(dir, 'mailbox')
const sink = await startMailSink({ port: 0, dir: mailbox, quiet: true })
const env = {
  ...process.env,
  DATABASE_URL: `sqlite:${path.join(dir, 'test.sqlite')}`,
  NUXT_SESSION_PASSWORD: crypto.randomBytes(32).toString('hex'),
  TRUST_PROXY: '1',
  BANDLIGHT_DATA_DIR: path.join(dir, 'files'),
  SMTP_URL: `smtp://127.0.0.1:${sink.port}`,
  BANDLIGHT_MAILBOX_DIR: mailbox,
  MAIL_SEND_INTERVAL_MS: '500',
}
if ((await run(process.execPath, ['--import', 'tsx', 'scripts/seed.ts'], env)) !== 0) process.exit(1)
const server = await startServer(env, port, { quiet: true })
let code = 1
try {
  // Arguments: project names (api, e2e) and/or test file filters (tests/e2e/runs).
  const args = process.argv.slice(2)
  const files = args.filter(a => a.includes('/'))
  const named = args.filter(a => !a.includes('/'))
  const projects = named.length ? named : ['api', 'e2e']
  code = await run('npx', ['vitest', 'run', ...projects.flatMap(p => ['--project', p]), ...files], {
    ...env,
    BANDLIGHT_TEST_URL: `http://127.0.0.1:${port}`,
    TEST_DATA_DIR: dir,
  })
}
finally {
  server.kill('SIGTERM')
  await new Promise(r => setTimeout(r, 300))
  await sink.close()
  fs.rmSync(dir, { recursive: true, force: true })
}
process.exit(code)
