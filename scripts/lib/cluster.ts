/**
 * Several Bandlight server instances on one throw-away PostgreSQL cluster (./postgres.ts), as a lab
 * group would run them behind a load balancer: one database, one session secret, one mail server
 * (./mailSink.ts), and each instance with its own port and its own local folder (files go to the
 * database, so no instance reads another's disk). Used by `npm run demo:cluster`, the cluster tests
 * (scripts/test-cluster.ts) and the benchmark.
 */
import type { ChildProcess } from 'node:child_process'
import crypto from 'node:crypto'
import fs from 'node:fs'
import os from 'node:os'
import path from 'node:path'
import { startMailSink, type MailSink } from './mailSink'
import { startPostgres, type PostgresCluster } from './postgres'
import { freePort, run, startServer } from './server'

export interface BandlightCluster {
  pg: PostgresCluster
  databaseUrl: string
  /** `http://127.0.0.1:port` of each instance. */
  urls: string[]
  servers: ChildProcess[]
  sink: MailSink
  /** The environment every instance shares. */
  env: NodeJS.ProcessEnv
  stop(): Promise<void>
}

export interface ClusterOptions {
  instances?: number
  /** Write the demo data before the instances start (default true). */
  seed?: boolean
  quiet?: boolean
  /** Ports for the instances (default: free ones). */
  ports?: number[]
  /** Port of the mail server (default: a free one). */
  mailPort?: number
  /** Folder for the mailbox and the instances' local folders (default: a new temporary one, removed at stop). */
  dir?: string
  env?: NodeJS.ProcessEnv
}

export async function startBandlightCluster(opts: ClusterOptions = {}): Promise<BandlightCluster> {
  const n = opts.instances ?? 2
  const ownDir = !opts.dir
  const dir = opts.dir ?? fs.mkdtempSync(path.join(os.tmpdir(), 'bandlight-cluster-'))
  fs.mkdirSync(dir, { recursive: true })
  const pg = await startPostgres()
  const servers: ChildProcess[] = []
  let sink: MailSink | null = null
  const stop = async () => {
    for (const s of servers) s.kill('SIGTERM')
    await Promise.all(servers.map(s => s.exitCode === null ? new Promise(r => s.once('exit', r)) : null))
    await sink?.close()
    await pg.stop()
    if (ownDir) fs.rmSync(dir, { recursive: true, force: true })
  }
  try {
    const databaseUrl = await pg.createDatabase('bandlight')
    const mailbox = path.join(dir, 'mailbox')
    // The port asked for, or any free one when it is taken (another demo's mail server).
    const mail: MailSink = await startMailSink({ port: opts.mailPort ?? 0, dir: mailbox, quiet: true })
      .catch(err => opts.mailPort ? startMailSink({ port: 0, dir: mailbox, quiet: true }) : Promise.reject(err))
    sink = mail
    const env: NodeJS.ProcessEnv = {
      ...process.env,
      DATABASE_URL: databaseUrl,
      NUXT_SESSION_PASSWORD: process.env.NUXT_SESSION_PASSWORD || crypto.randomBytes(32).toString('hex'),
      SMTP_URL: `smtp://127.0.0.1:${mail.port}`,
      BANDLIGHT_MAILBOX_DIR: mailbox,
      ...opts.env,
    }
    if (opts.seed !== false && (await run(process.execPath, ['--import', 'tsx', 'scripts/seed.ts'], env)) !== 0) throw new Error('seeding the cluster database failed')
    const urls: string[] = []
    for (let i = 0; i < n; i++) {
      const port = opts.ports?.[i] ?? await freePort()
      // Each instance its own local folder: nothing may depend on a disk that another instance shares.
      const local = path.join(dir, `instance-${i + 1}`)
      servers.push(await startServer({ ...env, BANDLIGHT_DATA_DIR: path.join(local, 'files') }, port, { quiet: opts.quiet }))
      urls.push(`http://127.0.0.1:${port}`)
    }
    return { pg, databaseUrl, urls, servers, sink: mail, env, stop }
  }
  catch (err) {
    await stop()
    throw err
  }
}
