/**
 * npm run demo:cluster — the demo laboratory as a lab group would run it on several machines: two
 * server instances (ports PORT and PORT + 1, default 3000 and 3001) on one PostgreSQL database, here
 * a throw-away cluster of Debian's `postgresql` package in a temporary folder (scripts/lib/postgres.ts),
 * with one local mail server on 127.0.0.1:2525. Builds first if the sources are newer than .output.
 * Everything is removed when you press Ctrl+C. In production a load balancer sits in front of the
 * instances and DATABASE_URL names your own PostgreSQL (README, "Configuration").
 */
import { startBandlightCluster, type BandlightCluster } from './lib/cluster'
import { buildIsStale, run } from './lib/server'

const port = Number(process.env.PORT) || 3000
if (buildIsStale()) {
  console.log('Building Bandlight (the sources are newer than .output)…')
  const code = await run('npx', ['nuxt', 'build'])
  if (code !== 0) process.exit(code)
}

// Our own handlers first, so the PostgreSQL helper leaves stopping to us (instances, then the database).
let cluster: BandlightCluster | null = null
let stopping = false
async function stop(code: number) {
  if (stopping) return
  stopping = true
  await cluster?.stop()
  process.exit(code)
}
for (const sig of ['SIGINT', 'SIGTERM'] as const) process.on(sig, () => void stop(0))

console.log('Starting a throw-away PostgreSQL cluster, the demo data and two server instances…')
cluster = await startBandlightCluster({ instances: 2, ports: [port, port + 1], mailPort: 2525 })
console.log(`
  Bandlight cluster demo: two server instances on one PostgreSQL database
    instance 1   http://localhost:${port}
    instance 2   http://localhost:${port + 1}
  Database: ${cluster.databaseUrl} (throw-away, removed on exit)
  Mail: local mail server on 127.0.0.1:${cluster.sink.port}, messages in ${cluster.sink.dir} (admin → Mail)

  Sign in on one instance and carry on on the other: sessions, uploads, certificate PDFs, Monte Carlo
  jobs and sign-in throttles are shared through the database; one instance at a time runs the
  reminder job.

  Demo accounts (password for each: bandlight-demo — demo only)
    admin@bandlight.test        administrator
    technician@bandlight.test   technician
    quality@bandlight.test      quality manager
    customer@bandlight.test     customer (Kestrelmoor Foundry Ltd)

  Press Ctrl+C to stop.
`)

for (const [i, server] of cluster.servers.entries()) {
  server.on('exit', (code) => {
    if (!stopping) console.error(`instance ${i + 1} exited (${code}); stopping the demo`)
    void stop(code ?? 1)
  })
}
