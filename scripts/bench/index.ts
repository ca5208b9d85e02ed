/**
 * All benchmarks: `npm run bench` (node --import tsx scripts/bench/index.ts [--quick] [--base=REV]).
 * Each section (./section.ts) runs in a process of its own, in turn, and prints its own table;
 * add new ones there. Figures and ratios against targets are printed; nothing here fails a build.
 */
import { spawnSync } from 'node:child_process'
import path from 'node:path'
import { fileURLToPath } from 'node:url'

const here = path.dirname(fileURLToPath(import.meta.url))
const ORDER = ['engine', 'registers', 'runs', 'certificates', 'mail', 'server', 'listing']
let failed = 0
for (const name of ORDER) {
  const r = spawnSync(process.execPath, ['--import', 'tsx', path.join(here, 'section.ts'), name, ...process.argv.slice(2)], { stdio: 'inherit' })
  if (r.status !== 0) {
    failed++
    console.log(`(${name} section ended with status ${r.status ?? r.signal})`)
  }
  console.log('')
}
process.exit(failed ? 1 : 0)
