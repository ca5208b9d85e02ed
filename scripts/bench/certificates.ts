/**
 * Building certificate PDFs: `node --import tsx scripts/bench/certificates.ts [--quick]`.
 * Times `certificatePdf` (server/utils/certificatePdf.ts) on the data object of a 12-point
 * certificate (server/utils/certificateSample.ts), with no server and no database: the first
 * build (fonts parsed) apart, then the median and mean of the following builds. Target ≤ 150 ms.
 */
import { fileURLToPath } from 'node:url'
import { certificateFonts, certificatePdf } from '#server/services/certificates/pdf'
import { sampleCertificateData } from '#server/services/certificates/sample'

export interface CertificatesBenchResult {
  builds: number
  firstMs: number
  medianMs: number
  meanMs: number
  bytes: number
}

const TARGET_MS = 150

export async function runCertificatesBench(opts: { quick?: boolean } = {}): Promise<CertificatesBenchResult> {
  const builds = opts.quick ? 10 : Number(process.env.BENCH_CERTIFICATE_BUILDS) || 40
  const data = sampleCertificateData(12)
  const fonts = await certificateFonts()
  let t = performance.now()
  const first = await certificatePdf(data, fonts)
  const firstMs = performance.now() - t
  const times: number[] = []
  for (let i = 0; i < builds; i++) {
    t = performance.now()
    await certificatePdf(data, fonts)
    times.push(performance.now() - t)
  }
  const sorted = [...times].sort((a, b) => a - b)
  const medianMs = sorted.length % 2 ? sorted[(sorted.length - 1) / 2]! : (sorted[sorted.length / 2 - 1]! + sorted[sorted.length / 2]!) / 2
  const meanMs = times.reduce((a, b) => a + b, 0) / times.length
  console.log('Certificate PDF (12 points, pdfkit, embedded IBM Plex Sans)')
  console.log(`  first build            ${firstMs.toFixed(1)} ms (fonts parsed)`)
  console.log(`  build, median of ${String(builds).padEnd(4)}  ${medianMs.toFixed(1)} ms   (target ≤ ${TARGET_MS} ms: ${(medianMs / TARGET_MS).toFixed(2)}× of target)`)
  console.log(`  build, mean             ${meanMs.toFixed(1)} ms`)
  console.log(`  size                    ${(first.length / 1024).toFixed(1)} KiB`)
  return { builds, firstMs, medianMs, meanMs, bytes: first.length }
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  await runCertificatesBench({ quick: process.argv.includes('--quick') })
}
