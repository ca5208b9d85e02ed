/**
 * A throw-away PostgreSQL cluster for tests, the cluster demo and the benchmark: Debian's
 * `postgresql` package (`initdb`, `pg_ctl`), a data folder under the system's temporary folder, a
 * free port on 127.0.0.1 and the Unix socket in that folder, trust authentication for local
 * connections only. PostgreSQL refuses to run as root: as root, the cluster runs as the unprivileged
 * `postgres` user the package creates (`runuser`). Stopped and removed by `stop()`, and on exit.
 *
 * Databases are created with the ICU root collation (`und`), so text sorts case-insensitively first
 * (a < B < c), as SQLite's NOCASE columns do.
 */
import { spawn, spawnSync } from 'node:child_process'
import fs from 'node:fs'
import os from 'node:os'
import path from 'node:path'
import pg from 'pg'
import { freePort } from './server'

export interface PostgresCluster {
  port: number
  /** The temporary folder (data, socket, log). */
  dir: string
  /** The superuser of the cluster (no password; local connections only). */
  user: string
  /** `postgres://user@127.0.0.1:port/name`. */
  url(database: string): string
  /** Create an empty database and return its URL. */
  createDatabase(name: string): Promise<string>
  /** Stop the server and remove its folder. */
  stop(): Promise<void>
}

const USER = 'bandlight'

/** Where Debian puts the server's programs; `initdb` is not on root's PATH by default. */
export function postgresBinDir(): string | null {
  const base = '/usr/lib/postgresql'
  if (!fs.existsSync(base)) return null
  const versions = fs.readdirSync(base).filter(v => fs.existsSync(path.join(base, v, 'bin', 'initdb'))).sort((a, b) => Number(b) - Number(a))
  return versions.length ? path.join(base, versions[0]!, 'bin') : null
}

/** True when the server's programs are installed (Debian's `postgresql` package). */
export function postgresAvailable(): boolean {
  return postgresBinDir() !== null
}

function asServerUser(cmd: string, args: string[]): [string, string[]] {
  if (process.getuid?.() !== 0) return [cmd, args]
  return ['runuser', ['-u', 'postgres', '--', cmd, ...args]]
}

function runChecked(cmd: string, args: string[]): void {
  const [c, a] = asServerUser(cmd, args)
  const r = spawnSync(c, a, { encoding: 'utf8' })
  if (r.status !== 0) throw new Error(`${path.basename(cmd)} failed (${r.status}): ${r.stderr || r.stdout}`)
}

/**
 * Start a throw-away cluster.
 * @param opts.tune - settings for a benchmark or test machine that needs no durability (default true:
 *   fsync, synchronous commit and full-page writes off — a crash loses the cluster, which is thrown away anyway)
 */
export async function startPostgres(opts: { tune?: boolean, maxConnections?: number } = {}): Promise<PostgresCluster> {
  const bin = postgresBinDir()
  if (!bin) throw new Error('PostgreSQL is not installed (Debian: apt-get install postgresql)')
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'bandlight-pg-'))
  const data = path.join(dir, 'data')
  const log = path.join(dir, 'server.log')
  if (process.getuid?.() === 0) {
    // The server's user must own its folder (and reach it: /tmp is world-traversable).
    spawnSync('chown', ['postgres:postgres', dir])
    fs.chmodSync(dir, 0o700)
  }
  runChecked(path.join(bin, 'initdb'), ['-D', data, '-A', 'trust', '-U', USER, '-E', 'UTF8', '--locale-provider=icu', '--icu-locale=und', '--locale=C.UTF-8', '-N'])
  const port = await freePort()
  const settings = [`-p ${port}`, `-k ${dir}`, '-c listen_addresses=127.0.0.1', `-c max_connections=${opts.maxConnections ?? 100}`]
  if (opts.tune !== false) settings.push('-c fsync=off', '-c synchronous_commit=off', '-c full_page_writes=off')
  runChecked(path.join(bin, 'pg_ctl'), ['-D', data, '-o', settings.join(' '), '-l', log, '-w', '-t', '60', 'start'])

  let stopped = false
  const stopSync = () => {
    if (stopped) return
    stopped = true
    const [c, a] = asServerUser(path.join(bin, 'pg_ctl'), ['-D', data, '-m', 'immediate', '-w', 'stop'])
    spawnSync(c, a, { stdio: 'ignore' })
    fs.rmSync(dir, { recursive: true, force: true })
  }
  process.once('exit', stopSync)
  // Interrupted (Ctrl+C) with nobody else listening: stop the cluster before going. A script that
  // stops it its own way registers its handlers before starting it.
  const onSignal = (signal: NodeJS.Signals) => {
    stopSync()
    process.exit(signal === 'SIGINT' ? 130 : 143)
  }
  for (const sig of ['SIGINT', 'SIGTERM'] as const) {
    if (process.listenerCount(sig) === 0) process.once(sig, onSignal)
  }

  const url = (database: string) => `postgres://${USER}@127.0.0.1:${port}/${database}`
  return {
    port,
    dir,
    user: USER,
    url,
    async createDatabase(name: string) {
      if (!/^[a-z_][a-z0-9_]*$/.test(name)) throw new Error(`not a plain database name: ${name}`)
      const client = new pg.Client({ connectionString: url('postgres') })
      await client.connect()
      try {
        await client.query(`CREATE DATABASE ${name} TEMPLATE template0 ENCODING 'UTF8' LOCALE_PROVIDER icu ICU_LOCALE 'und' LOCALE 'C.UTF-8'`)
      }
      finally {
        await client.end()
      }
      return url(name)
    },
    async stop() {
      if (stopped) return
      await new Promise<void>((resolve) => {
        const [c, a] = asServerUser(path.join(bin, 'pg_ctl'), ['-D', data, '-m', 'fast', '-w', 'stop'])
        const child = spawn(c, a, { stdio: 'ignore' })
        child.on('exit', () => resolve())
      })
      stopped = true
      process.removeListener('exit', stopSync)
      process.removeListener('SIGINT', onSignal)
      process.removeListener('SIGTERM', onSignal)
      fs.rmSync(dir, { recursive: true, force: true })
    },
  }
}
