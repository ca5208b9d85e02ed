/**
 * The instrument listing under load, the overview page and the login page's JavaScript, through the
 * built server (needs `npm run build`), side by side with the baseline (scripts/bench/baseline.ts)
 * when a built copy of it is kept, in the same run:
 *
 * - listing: 100 000 instruments, 32 clients at once, each asking for the next of a mix of list
 *   pages (first page, a deep page, a sort by due date, a serial search, a status filter sorted by
 *   maker) for a fixed time, on SQLite with one server instance: requests per second, p50, p95,
 *   errors, and the server's CPU time per request (from /proc) against the raw SQL of the same pages
 *   (./listing-sql.ts: the statements each tree's list service sends, replayed through the bare
 *   driver). Then the current tree on PostgreSQL (a throw-away cluster) with two instances taking the
 *   requests in turn as a load balancer would;
 * - the overview page (`/`, server-rendered, signed in) at 100 000 instruments: time to first byte,
 *   median of 30, beside /api/health's;
 * - the login page's JavaScript: the files its HTML loads (`<script src>`, `<link rel="modulepreload">`),
 *   bytes transferred with Accept-Encoding br, gzip and identity, and the Cache-Control of hashed files.
 * Each tree is seeded and filled by its own scripts into its own temporary database.
 * Run alone: `node --import tsx scripts/bench/listing.ts [--quick] [--base=REV]`.
 */
import type { ChildProcess } from 'node:child_process'
import { spawn } from 'node:child_process'
import crypto from 'node:crypto'
import fs from 'node:fs'
import http from 'node:http'
import os from 'node:os'
import path from 'node:path'
import { startBandlightCluster } from '../lib/cluster'
import { postgresAvailable } from '../lib/postgres'
import { ROOT, SERVER_ENTRY, freePort, run, startServer } from '../lib/server'
import { baseRevFromArgs, findBaseTree } from './baseline'

export interface ListingLoadResult {
  setup: string
  requests: number
  perSecond: number
  p50: number
  p95: number
  errors: number
  /** Server process CPU time (user + system) per request, ms; null when /proc is not readable. */
  cpuMsPerRequest: number | null
}

export interface TreeFigures {
  tree: string
  load: ListingLoadResult
  /** Raw SQL per list page, ms, in the order of {@link listPaths}; mean over them. */
  rawSql: { perPage: number[], mean: number } | null
  overview: { median: number, min: number, max: number }
  health: { median: number, min: number, max: number }
  loginJs: LoginJs
}

export interface LoginJs {
  files: number
  identity: number
  gzip: number
  br: number
  cacheControl: string
}

export interface ListingBenchResult {
  trees: TreeFigures[]
  postgres: ListingLoadResult | null
}

function percentile(sorted: number[], p: number): number {
  return sorted[Math.min(sorted.length - 1, Math.ceil(p * sorted.length) - 1)] ?? Number.NaN
}

/** The list pages the clients ask for, in turn. */
export function listPaths(rows: number): string[] {
  const deep = Math.floor((rows * 0.9) / 50)
  return [
    '/api/instruments?page=1&pageSize=50&sort=serial&dir=asc',
    `/api/instruments?page=${deep}&pageSize=50&sort=serial&dir=asc`,
    '/api/instruments?page=1&pageSize=50&sort=nextDueDate&dir=asc',
    '/api/instruments?page=1&pageSize=50&sort=serial&dir=asc&q=sn0a',
    '/api/instruments?page=20&pageSize=50&sort=maker&dir=asc&status=active',
  ]
}
const PAGE_NAMES = ['first page', 'deep page', 'due-date sort', 'search "sn0a"', 'status + maker p.20']

async function signIn(base: string): Promise<string> {
  const res = await fetch(`${base}/api/auth/login`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email: 'technician@bandlight.test', password: 'bandlight-demo' }) })
  if (!res.ok) throw new Error(`sign-in failed: ${res.status}`)
  return res.headers.getSetCookie().map(c => c.split(';')[0]).join('; ')
}

/** CPU time (user + system) of a process so far, ms, from /proc/<pid>/stat; null elsewhere. */
function cpuMs(pid: number | undefined): number | null {
  try {
    const stat = fs.readFileSync(`/proc/${pid}/stat`, 'utf8')
    const fields = stat.slice(stat.lastIndexOf(')') + 2).split(' ')
    return ((Number(fields[11]) + Number(fields[12])) * 1000) / 100 // utime, stime in ticks of 1/100 s (USER_HZ)
  }
  catch {
    return null
  }
}

/** `clients` concurrent loops for `seconds`, spreading requests over `bases` in turn. */
async function load(setup: string, bases: string[], cookie: string, rows: number, clients: number, seconds: number, servers: ChildProcess[]): Promise<ListingLoadResult> {
  const paths = listPaths(rows)
  // Warm-up: each page twice on each instance.
  for (let k = 0; k < 2; k++) for (const b of bases) for (const p of paths) await (await fetch(b + p, { headers: { cookie } })).arrayBuffer()
  const latencies: number[] = []
  let errors = 0
  let n = 0
  const cpu0 = servers.map(s => cpuMs(s.pid))
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
  const cpu1 = servers.map(s => cpuMs(s.pid))
  const used = cpu0.every(v => v !== null) && cpu1.every(v => v !== null) ? cpu1.reduce((a, v, i) => a + v! - cpu0[i]!, 0) : null
  latencies.sort((a, b) => a - b)
  return { setup, requests: latencies.length, perSecond: latencies.length / elapsed, p50: percentile(latencies, 0.5), p95: percentile(latencies, 0.95), errors, cpuMsPerRequest: used === null ? null : used / latencies.length }
}

/** Time to first byte (response headers) of `url`, ms: median, min and max of `n` after warm-ups. */
async function ttfb(url: string, cookie: string, n: number): Promise<{ median: number, min: number, max: number }> {
  const once = async () => {
    const s = performance.now()
    const r = await fetch(url, { headers: { cookie, accept: 'text/html,application/json' }, redirect: 'manual' })
    const t = performance.now() - s
    if (r.status !== 200) throw new Error(`${url}: HTTP ${r.status}`)
    await r.arrayBuffer()
    return t
  }
  for (let i = 0; i < 5; i++) await once()
  const times: number[] = []
  for (let i = 0; i < n; i++) times.push(await once())
  times.sort((a, b) => a - b)
  return { median: percentile(times, 0.5), min: times[0]!, max: times[times.length - 1]! }
}

/** Bytes of a response body as sent (no decoding), its Content-Encoding and Cache-Control. */
function transferred(url: string, acceptEncoding: string): Promise<{ bytes: number, encoding: string, cacheControl: string }> {
  return new Promise((resolve, reject) => {
    http.get(url, { headers: { 'accept-encoding': acceptEncoding } }, (res) => {
      let bytes = 0
      res.on('data', (c: Buffer) => (bytes += c.length))
      res.on('end', () => resolve({ bytes, encoding: String(res.headers['content-encoding'] ?? 'identity'), cacheControl: String(res.headers['cache-control'] ?? '') }))
      res.on('error', reject)
    }).on('error', reject)
  })
}

/** The JavaScript the login page loads, as transferred. */
async function loginJs(base: string): Promise<LoginJs> {
  const html = await (await fetch(`${base}/login`)).text()
  const files = new Set<string>()
  for (const m of html.matchAll(/<script\b[^>]*\bsrc="([^"]+\.js)"/g)) files.add(m[1]!)
  for (const m of html.matchAll(/<link\b[^>]*>/g)) {
    if (!/\brel="modulepreload"/.test(m[0])) continue
    const href = /\bhref="([^"]+\.js)"/.exec(m[0])
    if (href) files.add(href[1]!)
  }
  const out: LoginJs = { files: files.size, identity: 0, gzip: 0, br: 0, cacheControl: '' }
  for (const f of files) {
    const url = new URL(f, base).href
    const id = await transferred(url, 'identity')
    out.identity += id.bytes
    out.gzip += (await transferred(url, 'gzip')).bytes
    out.br += (await transferred(url, 'br, gzip')).bytes
    out.cacheControl ||= id.cacheControl
  }
  return out
}

/** The raw SQL of the list pages as the tree's own service sends it (./listing-sql.ts in a child process). */
async function rawSql(treeDir: string, file: string, rows: number, env: NodeJS.ProcessEnv): Promise<TreeFigures['rawSql']> {
  const out = await new Promise<string>((resolve) => {
    const child = spawn(process.execPath, ['--import', 'tsx', path.join(ROOT, 'scripts/bench/listing-sql.ts'), treeDir, file, JSON.stringify(listPaths(rows))], { cwd: treeDir, env, stdio: ['ignore', 'pipe', 'inherit'] })
    let text = ''
    child.stdout.on('data', (c: Buffer) => (text += c))
    child.on('exit', () => resolve(text))
  })
  try {
    const pages = (JSON.parse(out.trim().split('\n').pop()!) as { pages: { ms: number }[] }).pages.map(p => p.ms)
    return { perPage: pages, mean: pages.reduce((a, b) => a + b, 0) / pages.length }
  }
  catch {
    return null
  }
}

interface Tree { name: string, dir: string, entry: string }

async function onSqlite(tree: Tree, rows: number, clients: number, seconds: number): Promise<TreeFigures> {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'bandlight-bench-'))
  const file = path.join(dir, 'bench.sqlite')
  const env = {
    ...process.env,
    DATABASE_URL: `sqlite:${file}`,
    NUXT_SESSION_PASSWORD: crypto.randomBytes(32).toString('hex'),
    MAIL_SEND_INTERVAL_MS: '0',
  }
  try {
    if ((await run(process.execPath, ['--import', 'tsx', 'scripts/seed.ts'], env, tree.dir)) !== 0) throw new Error(`seeding failed (${tree.name})`)
    if ((await run(process.execPath, ['--import', 'tsx', 'scripts/bench/fill-instruments.ts', String(rows)], env, tree.dir)) !== 0) throw new Error(`filling failed (${tree.name})`)
    const port = await freePort()
    const server = await startServer(env, port, { quiet: true, entry: tree.entry, cwd: tree.dir })
    let figures: Omit<TreeFigures, 'rawSql'>
    try {
      const base = `http://127.0.0.1:${port}`
      const cookie = await signIn(base)
      const js = await loginJs(base)
      const overview = await ttfb(`${base}/`, cookie, 30)
      const health = await ttfb(`${base}/api/health`, '', 30)
      figures = { tree: tree.name, load: await load(`SQLite, 1 instance, ${tree.name}`, [base], cookie, rows, clients, seconds, [server]), overview, health, loginJs: js }
    }
    finally {
      server.kill('SIGTERM')
      await new Promise(r => server.exitCode === null ? server.once('exit', r) : r(null))
    }
    return { ...figures, rawSql: await rawSql(tree.dir, file, rows, env) }
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
    return await load('PostgreSQL, 2 instances, this tree', bases, await signIn(bases[0]!), rows, clients, seconds, cluster.servers)
  }
  finally {
    await cluster.stop()
  }
}

function table(head: string[], rows: string[][]): void {
  const w = head.map((h, j) => Math.max(h.length, ...rows.map(r => r[j]!.length)))
  const line = (r: string[]) => r.map((c, j) => c.padEnd(w[j]!)).join('  ')
  console.log(line(head))
  console.log(w.map(n => '-'.repeat(n)).join('  '))
  for (const r of rows) console.log(line(r))
}

const kb = (b: number) => `${(b / 1024).toFixed(1)} KB`
const verdict = (ok: boolean) => (ok ? 'met' : 'MISSED')

export async function runListingBench(opts: { quick?: boolean, argv?: readonly string[] } = {}): Promise<ListingBenchResult> {
  if (!fs.existsSync(SERVER_ENTRY)) {
    console.log('listing bench skipped: no .output (run `npm run build` first)')
    return { trees: [], postgres: null }
  }
  const rows = 100_000
  const clients = 32
  const seconds = opts.quick ? 5 : 20
  const baseTree = findBaseTree(baseRevFromArgs(opts.argv))
  const trees: Tree[] = []
  if (baseTree?.serverEntry) trees.push({ name: `base ${baseTree.sha.slice(0, 7)}`, dir: baseTree.dir, entry: baseTree.serverEntry })
  trees.push({ name: 'this tree', dir: ROOT, entry: SERVER_ENTRY })
  const figures: TreeFigures[] = []
  for (const t of trees) figures.push(await onSqlite(t, rows, clients, seconds))
  let postgres: ListingLoadResult | null = null
  if (postgresAvailable()) postgres = await onPostgres(rows, clients, seconds)

  const now = figures[figures.length - 1]!
  const base = figures.length > 1 ? figures[0]! : null
  console.log(`Instrument listing under load (HTTP, built app): ${rows.toLocaleString('en')} instruments, ${clients} concurrent clients, ${seconds} s each; a mix of first page, deep page, due-date sort, serial search, status filter`)
  if (!base) console.log(`(no built baseline: \`node --import tsx scripts/bench/baseline.ts\` makes one; until then only the CPU ÷ raw SQL ratio is compared)`)
  const loadRows = [...figures.map(f => ({ ...f.load, raw: f.rawSql?.mean ?? null })), ...(postgres ? [{ ...postgres, raw: null }] : [])]
  table(['setup', 'requests', 'requests/s', 'p50 ms', 'p95 ms', 'errors', 'server CPU ms/request', 'raw SQL ms/page', 'CPU ÷ raw SQL'], loadRows.map(r => [
    r.setup, String(r.requests), r.perSecond.toFixed(0), r.p50.toFixed(1), r.p95.toFixed(1), String(r.errors),
    r.cpuMsPerRequest === null ? '—' : r.cpuMsPerRequest.toFixed(2),
    r.raw === null ? '—' : r.raw.toFixed(2),
    r.cpuMsPerRequest === null || r.raw === null ? '—' : `×${(r.cpuMsPerRequest / r.raw).toFixed(2)}`,
  ]))
  if (base) console.log(`requests/s: this tree ×${(now.load.perSecond / base.load.perSecond).toFixed(2)} the base's (target ≥ 3×: ${verdict(now.load.perSecond >= 3 * base.load.perSecond)})`)
  if (now.load.cpuMsPerRequest !== null && now.rawSql) console.log(`server CPU per request: ×${(now.load.cpuMsPerRequest / now.rawSql.mean).toFixed(2)} the raw SQL of the page (target ≤ 1.5×: ${verdict(now.load.cpuMsPerRequest <= 1.5 * now.rawSql.mean)})`)
  console.log('raw SQL per page, ms (the statements the list service sends for the page, replayed through the bare driver):')
  table(['tree', ...PAGE_NAMES], figures.map(f => [f.tree, ...(f.rawSql?.perPage.map(v => v.toFixed(2)) ?? PAGE_NAMES.map(() => '—'))]))
  console.log(`(${os.availableParallelism?.() ?? os.cpus().length} cores shared by the database, the instances and the clients; load average ${os.loadavg().map(v => v.toFixed(2)).join(', ')})`)

  console.log(`\nOverview page (/, signed in, server-rendered) at ${rows.toLocaleString('en')} instruments: time to first byte, median of 30 (min–max), beside /api/health's`)
  table(['tree', 'overview TTFB', '/api/health TTFB', 'target ≤ 50 ms'], figures.map(f => [
    f.tree, `${f.overview.median.toFixed(1)} ms (${f.overview.min.toFixed(1)}–${f.overview.max.toFixed(1)})`, `${f.health.median.toFixed(1)} ms (${f.health.min.toFixed(1)}–${f.health.max.toFixed(1)})`, verdict(f.overview.median <= 50),
  ]))

  console.log('\nLogin page JavaScript (the files its HTML loads: script src and modulepreload), bytes transferred')
  table(['tree', 'files', 'identity', 'gzip', 'br', 'target ≤ 130 KB (br)', 'Cache-Control of hashed files'], figures.map(f => [
    f.tree, String(f.loginJs.files), kb(f.loginJs.identity), kb(f.loginJs.gzip), kb(f.loginJs.br), verdict(f.loginJs.br <= 130 * 1024), f.loginJs.cacheControl,
  ]))
  return { trees: figures, postgres }
}

if (import.meta.url === `file://${process.argv[1]}`) await runListingBench({ quick: process.argv.includes('--quick') })
