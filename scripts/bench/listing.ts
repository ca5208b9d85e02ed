/**
 * The instrument listing under load, through the built server (needs `npm run build`): 100 000
 * instruments, 32 clients at once, each asking for the next of a mix of list pages (first page,
 * a deep page, a sort by due date, a serial-prefix search, a status filter sorted by maker) for a
 * fixed time. Run on SQLite with one server instance, and on PostgreSQL (a throw-away cluster of
 * Debian's `postgresql`) with two instances taking the requests in turn as a load balancer would;
 * printed side by side: requests per second, p50, p95, errors.
 * Run alone: `node --import tsx scripts/bench/listing.ts [--quick]`.
 */
import crypto from 'node:crypto'
import fs from 'node:fs'
import os from 'node:os'
import path from 'node:path'
import { startBandlightCluster } from '../lib/cluster'
import { postgresAvailable } from '../lib/postgres'
import { SERVER_ENTRY, freePort, run, startServer } from '../lib/server'

export interface ListingLoadResult {
  setup: string
  requests: number
  perSecond: number
  p50: number
  p95: number
  errors: number
}

function percentile(sorted: number[], p: number): number {
  return sorted[Math.min(sorted.length - 1, Math.ceil(p * sorted.length) - 1)] ?? Number.NaN
}

/** The list pages the clients ask for, in turn. */
function listPaths(rows: number): string[] {
  const deep = Math.floor((rows * 0.9) / 50)
  return [
    '/api/instruments?page=1&pageSize=50&sort=serial&dir=asc',
    `/api/instruments?page=${deep}&pageSize=50&sort=serial&dir=asc`,
    '/api/instruments?page=1&pageSize=50&sort=nextDueDate&dir=asc',
    '/api/instruments?page=1&pageSize=50&sort=serial&dir=asc&q=sn0a',
    '/api/instruments?page=20&pageSize=50&sort=maker&dir=asc&status=active',
  ]
}

async function signIn(base: string): Promise<string> {
  const res = await fetch(`${base}/api/auth/login`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email: 'technician@bandlight.test', password: 'bandlight-demo' }) })
  if (!res.ok) throw new Error(`sign-in failed: ${res.status}`)
  return res.headers.getSetCookie().map(c => c.split(';')[0]).join('; ')
}

/** `clients` concurrent loops for `seconds`, spreading requests over `bases` in turn. */
async function load(setup: string, bases: string[], cookie: string, rows: number, clients: number, seconds: number): Promise<ListingLoadResult> {
  const paths = listPaths(rows)
  // Warm-up: each page once on each instance.
  for (const b of bases) for (const p of paths) await (await fetch(b + p, { headers: { cookie } })).arrayBuffer()
  const latencies: number[] = []
  let errors = 0
  let n = 0
  const t0 = performance.now()
  const end = t0 + seconds * 1000
  await Promise.all(Array.from({ length: clients }, async () => {
    while (performance.now() < end) {
      const i = n++
      const url = bases[i % bases.length]! + paths[i % paths.length]!
      const s = performance.now()
      try {
        const r = await fetch(url, { headers: { cookie } })
        const body = await r.json() as { total?: number }
        if (r.status !== 200 || typeof body.total !== 'number') errors++
      }
      catch {
        errors++
      }
      latencies.push(performance.now() - s)
    }
  }))
  const elapsed = (performance.now() - t0) / 1000
  latencies.sort((a, b) => a - b)
  return { setup, requests: latencies.length, perSecond: latencies.length / elapsed, p50: percentile(latencies, 0.5), p95: percentile(latencies, 0.95), errors }
}

async function onSqlite(rows: number, clients: number, seconds: number): Promise<ListingLoadResult> {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'bandlight-bench-'))
  const env = {
    ...process.env,
    DATABASE_URL: `sqlite:${path.join(dir, 'bench.sqlite')}`,
    NUXT_SESSION_PASSWORD: crypto.randomBytes(32).toString('hex'),
    MAIL_SEND_INTERVAL_MS: '0',
  }
  try {
    if ((await run(process.execPath, ['--import', 'tsx', 'scripts/seed.ts'], env)) !== 0) throw new Error('seeding failed')
    if ((await run(process.execPath, ['--import', 'tsx', 'scripts/bench/fill-instruments.ts', String(rows)], env)) !== 0) throw new Error('filling failed')
    const port = await freePort()
    const server = await startServer(env, port, { quiet: true })
    try {
      const base = `http://127.0.0.1:${port}`
      return await load('SQLite, 1 instance', [base], await signIn(base), rows, clients, seconds)
    }
    finally {
      server.kill('SIGTERM')
      await new Promise(r => server.once('exit', r))
    }
  }
  finally {
    fs.rmSync(dir, { recursive: true, force: true })
  }
}

async function onPostgres(rows: number, clients: number, seconds: number): Promise<ListingLoadResult> {
  // The rows go in between seeding and the instances' start (the cluster helper seeds; filling is ours).
  const cluster = await startBandlightCluster({ instances: 0, quiet: true, env: { MAIL_SEND_INTERVAL_MS: '0' } })
  try {
    if ((await run(process.execPath, ['--import', 'tsx', 'scripts/bench/fill-instruments.ts', String(rows)], cluster.env)) !== 0) throw new Error('filling failed')
    const bases: string[] = []
    for (let i = 0; i < 2; i++) {
      const port = await freePort()
      cluster.servers.push(await startServer({ ...cluster.env, BANDLIGHT_DATA_DIR: path.join(cluster.pg.dir, `files-${i}`) }, port, { quiet: true }))
      bases.push(`http://127.0.0.1:${port}`)
    }
    return await load('PostgreSQL, 2 instances', bases, await signIn(bases[0]!), rows, clients, seconds)
  }
  finally {
    await cluster.stop()
  }
}

export async function runListingBench(opts: { quick?: boolean } = {}): Promise<ListingLoadResult[]> {
  if (!fs.existsSync(SERVER_ENTRY)) {
    console.log('listing bench skipped: no .output (run `npm run build` first)')
    return []
  }
  const rows = 100_000
  const clients = 32
  const seconds = opts.quick ? 5 : 20
  const results = [await onSqlite(rows, clients, seconds)]
  if (postgresAvailable()) results.push(await onPostgres(rows, clients, seconds))
  else console.log('PostgreSQL side skipped: Debian\'s postgresql is not installed')
  console.log(`Instrument listing under load (HTTP, built app): ${rows.toLocaleString('en')} instruments, ${clients} concurrent clients, ${seconds} s each; a mix of first page, deep page, due-date sort, serial-prefix search, status filter`)
  console.table(results.map(r => ({
    'setup': r.setup,
    'requests': r.requests,
    'requests/s': r.perSecond.toFixed(0),
    'p50 ms': r.p50.toFixed(1),
    'p95 ms': r.p95.toFixed(1),
    'errors': r.errors,
  })))
  console.log(`(${os.availableParallelism?.() ?? os.cpus().length} cores shared by the database, the instances and the clients)`)
  return results
}

if (import.meta.url === `file://${process.argv[1]}`) await runListingBench({ quick: process.argv.includes('--quick') })
