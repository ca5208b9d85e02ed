/**
 * End-to-end figures through the built server (needs `npm run build`): per-request latency of
 * the calculation routes, and Monte Carlo with 10⁶ trials in worker threads, as a client sees it.
 * Run alone: `node --import tsx scripts/bench/server.ts`.
 */
import crypto from 'node:crypto'
import fs from 'node:fs'
import os from 'node:os'
import path from 'node:path'
import { SERVER_ENTRY, freePort, run, startServer } from '../lib/server'

interface Row { what: string, value: string, target: string }

async function timeRequests(n: number, fn: () => Promise<Response>): Promise<number> {
  for (let i = 0; i < 20; i++) await (await fn()).arrayBuffer()
  const t0 = performance.now()
  for (let i = 0; i < n; i++) {
    const r = await fn()
    if (!r.ok) throw new Error(`HTTP ${r.status}: ${await r.text()}`)
    await r.arrayBuffer()
  }
  return (performance.now() - t0) / n
}

function percentile(sorted: number[], p: number): number {
  return sorted[Math.min(sorted.length - 1, Math.ceil(p * sorted.length) - 1)]!
}

/**
 * Writes through the API on SQLite: the same number of instrument creations by one writer after
 * another, then by 64 concurrent writers (the write queue serves them in turn). Throughput, p50,
 * p95 and errors side by side.
 */
async function concurrentWriters(base: string, cookie: string, total: number): Promise<void> {
  const orgs = await (await fetch(`${base}/api/customers?pageSize=1`, { headers: { cookie } })).json() as { rows: { id: number }[] }
  const organizationId = orgs.rows[0]!.id
  let serial = 0
  const create = async (): Promise<{ ms: number, status: number }> => {
    const t0 = performance.now()
    const r = await fetch(`${base}/api/instruments`, {
      method: 'POST',
      headers: { 'content-type': 'application/json', cookie },
      body: JSON.stringify({
        organizationId, serial: `BENCH-${process.pid}-${++serial}`, maker: 'Ormsby Radiometrics', model: 'Spot 8', kind: 'spot-infrared',
        bandLambda1Um: 8, bandLambda2Um: 14, distanceToSpot: 12, rangeMinK: 243.15, rangeMaxK: 773.15,
        defaultEmissivity: 0.95, resolutionK: 0.1, accuracy: { kind: 'greaterOf', a: 1, b: 1 }, calibrationIntervalMonths: 12,
      }),
    })
    await r.arrayBuffer()
    return { ms: performance.now() - t0, status: r.status }
  }
  const measure = async (writers: number) => {
    const latencies: number[] = []
    let errors = 0
    let next = 0
    const t0 = performance.now()
    await Promise.all(Array.from({ length: writers }, async () => {
      while (next < total) {
        next++
        const r = await create()
        latencies.push(r.ms)
        if (r.status !== 201) errors++
      }
    }))
    const seconds = (performance.now() - t0) / 1000
    latencies.sort((a, b) => a - b)
    return { writers, perSecond: latencies.length / seconds, p50: percentile(latencies, 0.5), p95: percentile(latencies, 0.95), errors }
  }
  const one = await measure(1)
  const many = await measure(64)
  console.log(`Concurrent writes on SQLite (${total} instrument creations each way, one server)`)
  console.table([one, many].map(m => ({
    'writers': m.writers,
    'writes/s': m.perSecond.toFixed(0),
    'p50 ms': m.p50.toFixed(1),
    'p95 ms': m.p95.toFixed(1),
    'errors': m.errors,
  })))
  console.log(`64 writers vs 1: throughput ×${(many.perSecond / one.perSecond).toFixed(2)}, p95 ×${(many.p95 / one.p95).toFixed(1)}; errors ${many.errors} (target 0 → ${many.errors === 0 ? 'met' : 'NOT met'})`)
}

export async function runServerBench(opts: { quick?: boolean } = {}): Promise<void> {
  if (!fs.existsSync(SERVER_ENTRY)) {
    console.log('server bench skipped: no .output (run `npm run build` first)')
    return
  }
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'bandlight-bench-'))
  const port = await freePort()
  const env = {
    ...process.env,
    DATABASE_URL: `sqlite:${path.join(dir, 'bench.sqlite')}`,
    NUXT_SESSION_PASSWORD: crypto.randomBytes(32).toString('hex'),
  }
  if ((await run(process.execPath, ['--import', 'tsx', 'scripts/seed.ts'], env)) !== 0) throw new Error('seeding the bench database failed')
  const server = await startServer(env, port, { quiet: true })
  const base = `http://127.0.0.1:${port}`
  try {
    const login = await fetch(`${base}/api/auth/login`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email: 'technician@bandlight.test', password: 'bandlight-demo' }) })
    const cookie = login.headers.getSetCookie().map(c => c.split(';')[0]).join('; ')
    const post = (p: string, body: unknown) => fetch(base + p, { method: 'POST', headers: { 'content-type': 'application/json', cookie }, body: JSON.stringify(body) })
    const band = { kind: 'rectangular', lambda1Um: 8, lambda2Um: 14 }
    const point = { band, sourceTemperatureK: 373.15, sourceEmissivity: 0.95, reflectedTemperatureK: 296.15, instrumentTemperatureK: 296.15, emissivitySetting: 0.95 }
    const n = opts.quick ? 100 : 500
    const rows: Row[] = []
    rows.push({ what: 'POST /api/calculations/expected-reading', value: `${(await timeRequests(n, () => post('/api/calculations/expected-reading', point))).toFixed(2)} ms/request`, target: '—' })
    const components = Array.from({ length: 12 }, (_, i) => ({ name: `c${i}`, distribution: 'rectangular', halfWidth: 0.1 + i / 100, sensitivity: 1, dof: 10 + i }))
    rows.push({ what: 'POST /api/calculations/budget (12 components)', value: `${(await timeRequests(n, () => post('/api/calculations/budget', { components }))).toFixed(2)} ms/request`, target: '—' })
    const mc = {
      band,
      inputs: {
        sourceTemperatureK: { distribution: 'normal', value: 373.15, standardUncertainty: 0.025 },
        sourceEmissivity: { distribution: 'rectangular', value: 0.95, halfWidth: 0.01 },
        reflectedTemperatureK: { distribution: 'rectangular', value: 296.15, halfWidth: 1 },
        instrumentTemperatureK: { distribution: 'rectangular', value: 296.15, halfWidth: 1 },
        emissivitySetting: { distribution: 'constant', value: 0.95 },
      },
      trials: 1_000_000,
    }
    await (await post('/api/calculations/monte-carlo', { ...mc, trials: 20_000 })).arrayBuffer()
    const runs = opts.quick ? 1 : 3
    let best = Number.POSITIVE_INFINITY
    for (let i = 0; i < runs; i++) {
      const t0 = performance.now()
      const r = await post('/api/calculations/monte-carlo', mc)
      if (!r.ok) throw new Error(await r.text())
      await r.arrayBuffer()
      best = Math.min(best, performance.now() - t0)
    }
    rows.push({ what: `POST /api/calculations/monte-carlo, 10⁶ trials (${Math.min(4, os.availableParallelism?.() ?? 1)} workers), best of ${runs}`, value: `${(best / 1000).toFixed(2)} s`, target: `≤ 2 s → ${best <= 2000 ? 'met' : 'NOT met'} (ratio ${(best / 2000).toFixed(2)})` })
    console.log('Server (HTTP, built app, one client)')
    console.table(rows)
    console.log('')
    await concurrentWriters(base, cookie, opts.quick ? 128 : 640)
  }
  finally {
    server.kill('SIGTERM')
    await new Promise(r => setTimeout(r, 300))
    fs.rmSync(dir, { recursive: true, force: true })
  }
}

if (import.meta.url === `file://${process.argv[1]}`) await runServerBench({ quick: process.argv.includes('--quick') })
