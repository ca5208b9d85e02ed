/**
 * All benchmarks: `npm run bench` (node --import tsx scripts/bench/index.ts [--quick]).
 * Each benchmark module exports a run function that prints its own table; add new ones here.
 * Figures and ratios against targets are printed; nothing here fails a build.
 */
import { runCertificatesBench } from './certificates'
import { runEngineBench } from './engine'
import { runListingBench } from './listing'
import { runMailBench } from './mail'
import { runRegistersBench } from './registers'
import { runRunsBench } from './runs'
import { runServerBench } from './server'

const quick = process.argv.includes('--quick')
runEngineBench({ quick })
console.log('')
await runRegistersBench({ quick })
console.log('')
await runRunsBench({ quick })
console.log('')
await runCertificatesBench({ quick })
console.log('')
await runMailBench({ quick })
console.log('')
await runServerBench({ quick })
console.log('')
await runListingBench({ quick })
