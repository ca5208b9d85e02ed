/**
 * One benchmark section in a process of its own: `node --import tsx scripts/bench/section.ts <name> [--quick]`.
 * Sections that open a database set DATABASE_URL before importing the server's modules, which open
 * it on import and are cached per process; so each section gets a fresh process (./index.ts).
 */
import { pathToFileURL } from 'node:url'

const SECTIONS: Record<string, (opts: { quick: boolean }) => unknown> = {
  engine: async o => (await import('./engine')).runEngineBench(o),
  registers: async o => (await import('./registers')).runRegistersBench(o),
  runs: async o => (await import('./runs')).runRunsBench(o),
  certificates: async o => (await import('./certificates')).runCertificatesBench(o),
  mail: async o => (await import('./mail')).runMailBenchSideBySide(o),
  server: async o => (await import('./server')).runServerBench(o),
  listing: async o => (await import('./listing')).runListingBench(o),
}

export const SECTION_NAMES = Object.keys(SECTIONS)

const name = process.argv[2]
if (name && process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  const run = SECTIONS[name]
  if (!run) {
    console.error(`unknown section ${name}; one of ${SECTION_NAMES.join(', ')}`)
    process.exit(2)
  }
  await run({ quick: process.argv.includes('--quick') })
  process.exit(0)
}
