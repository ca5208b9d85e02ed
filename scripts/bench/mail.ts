/**
 * The reminder scan on 100 000 instruments: `node --import tsx scripts/bench/mail.ts [--quick]`.
 * Creates a temporary SQLite database, applies the migrations, bulk-inserts 50 invented customer
 * organizations with two contacts each and the instruments (due dates spread over two years
 * around the run date, some archived or retired), then times the scan the daily job runs
 * (server/utils/reminders.ts): the first run, which queues the messages and logs every milestone,
 * a second run on the same day, which finds nothing new, and the preview. Target: ≤ 3 s a scan.
 */
import fs from 'node:fs'
import os from 'node:os'
import path from 'node:path'
import { fileURLToPath } from 'node:url'
import type { CreationAttributes } from 'sequelize'
// Type only: the module itself is imported after DATABASE_URL is set.
import type { Instrument as InstrumentRow } from '#server/models/Instrument'

export interface MailBenchResult {
  instruments: number
  firstScanMs: number
  secondScanMs: number
  previewMs: number
  queued: number
  logged: number
}

const TODAY = '2026-12-01'

export async function runMailBench(opts: { quick?: boolean, rows?: number } = {}): Promise<MailBenchResult> {
  const count = opts.rows ?? (opts.quick ? 20_000 : 100_000)
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'bandlight-bench-mail-'))
  const previous = { db: process.env.DATABASE_URL, secret: process.env.MAIL_TOKEN_SECRET }
  process.env.DATABASE_URL = `sqlite:${path.join(dir, 'bench.sqlite')}`
  process.env.MAIL_TOKEN_SECRET ||= 'bench-only-secret-for-unsubscribe-links'
  const { sequelize, closeDatabase } = await import('#server/utils/db')
  const { migrate } = await import('#server/utils/migrate')
  await import('#server/models')
  const { Organization } = await import('#server/models/Organization')
  const { Contact } = await import('#server/models/Contact')
  const { Instrument } = await import('#server/models/Instrument')
  const { previewReminders, runReminderScan } = await import('#server/services/reminders/reminders')
  try {
    await migrate()
    const orgs = await Organization.bulkCreate(Array.from({ length: 50 }, (_, i) => ({ name: `Bench Customer ${i + 1}`, contactEmails: [] })))
    await Contact.bulkCreate(orgs.flatMap((o, i) => [
      { organizationId: o.id, name: `Metrology ${i + 1}`, email: `metrology${i + 1}@bench-customer.example`, phone: null, receivesReminders: true },
      { organizationId: o.id, name: `Quality ${i + 1}`, email: `quality${i + 1}@bench-customer.example`, phone: null, receivesReminders: i % 5 !== 0 },
    ]))
    const statuses = ['active', 'active', 'active', 'out-of-service', 'retired'] as const
    const base = Date.UTC(2025, 11, 1)
    const CHUNK = 2000
    for (let start = 0; start < count; start += CHUNK) {
      const batch: CreationAttributes<InstrumentRow>[] = []
      for (let i = start; i < Math.min(count, start + CHUNK); i++) {
        // Due dates spread evenly over the two years centred on the run date.
        const due = new Date(base + ((i * 7919) % 730) * 86_400_000).toISOString().slice(0, 10)
        batch.push({
          organizationId: orgs[i % orgs.length]!.id,
          serial: `SN-${String(i).padStart(6, '0')}`,
          assetTag: null,
          maker: 'Tessaly Thermal',
          model: `M-${i % 40}`,
          kind: 'spot-infrared',
          bandLambda1Um: 8,
          bandLambda2Um: 14,
          spectralResponseId: null,
          distanceToSpot: 12,
          rangeMinK: 253.15,
          rangeMaxK: 773.15,
          defaultEmissivity: 0.95,
          resolutionK: 0.1,
          accuracy: { kind: 'greaterOf' as const, a: 1, b: 1 },
          calibrationIntervalMonths: 12,
          status: statuses[Math.floor(i / 50) % statuses.length]!,
          nextDueDate: due,
          photoUploadId: null,
          notes: null,
          archived: i % 47 === 0,
        })
      }
      await sequelize.transaction(async t => Instrument.bulkCreate(batch, { transaction: t }))
    }
    await sequelize.query('ANALYZE')

    let s = performance.now()
    const preview = await previewReminders({ today: TODAY })
    const previewMs = performance.now() - s
    s = performance.now()
    const first = await runReminderScan({ today: TODAY })
    const firstScanMs = performance.now() - s
    s = performance.now()
    const second = await runReminderScan({ today: TODAY })
    const secondScanMs = performance.now() - s
    if (second.queued !== 0) throw new Error(`the second scan queued ${second.queued} messages`)
    if (preview.messages.length !== first.queued) throw new Error(`preview planned ${preview.messages.length} messages, the scan queued ${first.queued}`)

    console.log(`mail bench: reminder scan over ${count} instruments, 50 organizations, 100 contacts (target ≤ 3000 ms)`)
    console.log(`  preview (reads only)              ${previewMs.toFixed(0).padStart(6)} ms   (${preview.messages.length} messages planned)`)
    console.log(`  first scan (queues and logs)      ${firstScanMs.toFixed(0).padStart(6)} ms   (${first.queued} messages, ${first.logged} milestones)`)
    console.log(`  second scan, same day (no-op)     ${secondScanMs.toFixed(0).padStart(6)} ms   (${second.queued} messages)`)
    return { instruments: count, firstScanMs, secondScanMs, previewMs, queued: first.queued, logged: first.logged }
  }
  finally {
    await closeDatabase()
    fs.rmSync(dir, { recursive: true, force: true })
    if (previous.db === undefined) delete process.env.DATABASE_URL
    else process.env.DATABASE_URL = previous.db
    if (previous.secret === undefined) delete process.env.MAIL_TOKEN_SECRET
  }
}

if (process.argv[1] && fileURLToPath(import.meta.url) === path.resolve(process.argv[1])) {
  await runMailBench({ quick: process.argv.includes('--quick') })
}

/**
 * The reminder scan of this tree beside the base tree's (./baseline.ts), in the same run: the base's
 * own `scripts/bench/mail.ts` in a child process (its own modules and migrations), then this tree's.
 * Prints both first-scan times and their ratio (target: this tree ≤ 0.5× the base, and ≤ 3 s).
 * Without an unpacked base it prints this tree's figures only.
 */
export async function runMailBenchSideBySide(opts: { quick?: boolean } = {}): Promise<void> {
  const { spawn } = await import('node:child_process')
  const { baseRevFromArgs, findBaseTree } = await import('./baseline')
  const base = findBaseTree(baseRevFromArgs())
  let baseFirst: number | null = null
  if (base) {
    const out = await new Promise<string>((resolve) => {
      const child = spawn(process.execPath, ['--import', 'tsx', path.join(base.dir, 'scripts/bench/mail.ts'), ...(opts.quick ? ['--quick'] : [])], { cwd: base.dir, stdio: ['ignore', 'pipe', 'inherit'] })
      let text = ''
      child.stdout.on('data', (d: Buffer) => (text += d.toString()))
      child.on('exit', () => resolve(text))
    })
    const m = /first scan \(queues and logs\)\s+(\d+) ms/.exec(out)
    baseFirst = m ? Number(m[1]) : null
    console.log(`base ${base.rev.slice(0, 7)}:`)
    console.log(out.trimEnd())
  }
  console.log('this tree:')
  const mine = await runMailBench(opts)
  if (baseFirst !== null) {
    const ratio = mine.firstScanMs / baseFirst
    console.log(`reminder scan, first run: this tree ${mine.firstScanMs.toFixed(0)} ms, base ${baseFirst} ms → ×${ratio.toFixed(2)} (target ≤ 0.5×: ${ratio <= 0.5 ? 'met' : 'MISSED'}; ≤ 3000 ms: ${mine.firstScanMs <= 3000 ? 'met' : 'MISSED'})`)
  }
  else console.log('(no base tree unpacked: `node --import tsx scripts/bench/baseline.ts` makes one for a side-by-side figure)')
}
