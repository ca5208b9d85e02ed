/**
 * The cluster tests (tests/cluster, vitest project `cluster`): two built server instances on one
 * throw-away PostgreSQL cluster with one mail server (scripts/lib/cluster.ts), the demo data seeded
 * first. The tests get the instances' addresses in BANDLIGHT_TEST_URLS (the first one also as
 * BANDLIGHT_TEST_URL) and the mailbox in BANDLIGHT_MAILBOX_DIR. `npm test` builds first.
 */
import fs from 'node:fs'
import { startBandlightCluster } from './lib/cluster'
import { SERVER_ENTRY, run } from './lib/server'

if (!fs.existsSync(SERVER_ENTRY)) {
  console.error('No .output — run `npm run build` first.')
  process.exit(1)
}

const cluster = await startBandlightCluster({ instances: 2, quiet: true, env: { TRUST_PROXY: '1', MAIL_SEND_INTERVAL_MS: '300' } })
console.log(`[test-cluster] two instances (${cluster.urls.join(', ')}) on PostgreSQL (throw-away cluster on port ${cluster.pg.port})`)
let code = 1
try {
  code = await run('npx', ['vitest', 'run', '--project', 'cluster', ...process.argv.slice(2)], {
    ...cluster.env,
    BANDLIGHT_TEST_URL: cluster.urls[0],
    BANDLIGHT_TEST_URLS: cluster.urls.join(','),
  })
}
finally {
  await cluster.stop()
}
process.exit(code)
