/**
 * Instrument list queries on 100 000 rows: `node --import tsx scripts/bench/registers.ts [--quick]`.
 * Creates a temporary SQLite database, applies the migrations, bulk-inserts invented instruments
 * and times the list route's own query (server/utils/instrumentQuery.ts) for the requests a
 * table makes: first page, a deep page, sorts, filters, serial-prefix search. Prints ms per request
 * (median of several runs) and the query plan of the search.
 */
import fs from 'node:fs'
import os from 'node:os'
import path from 'node:path'
import { fileURLToPath } from 'node:url'
import type { CreationAttributes } from 'sequelize'
// Type only: the module itself is imported after DATABASE_URL is set.
import type { Instrument as InstrumentRow } from '#server/models/Instrument'

export interface RegistersBenchResult {
  rows: number
  insertMs: number
  requests: { name: string, ms: number, total: number }[]
}

/**
 * Invented instruments `start` … `end − 1` for the list benchmarks (this one and ./listing.ts):
 * scrambled serials (insertion order is not serial order), five makers, 40 models, five kinds,
 * due dates over two years, every 50th archived.
 */
export function benchInstrumentRows(start: number, end: number, organizationIds: readonly number[]): CreationAttributes<InstrumentRow>[] {
  const makers = ['Calderon Optics', 'Norrvik Instruments', 'Tessaly Thermal', 'Ardent Pyrometry', 'Quillfield Sensing']
  const kinds = ['spot-infrared', 'fixed-pyrometer', 'fibre-optic-pyrometer', 'ratio-pyrometer', 'thermal-imager'] as const
  const statuses = ['active', 'active', 'active', 'out-of-service', 'retired'] as const
  const batch: CreationAttributes<InstrumentRow>[] = []
  for (let i = start; i < end; i++) {
    const serial = `SN${((i * 7919) % 1_000_003).toString(36).toUpperCase().padStart(5, '0')}-${i}`
    const month = (i % 24) + 1
    batch.push({
      organizationId: organizationIds[i % organizationIds.length]!,
      serial,
      assetTag: `AT-${String(i).padStart(6, '0')}`,
      maker: makers[i % makers.length]!,
      model: `M-${i % 40}`,
      kind: kinds[i % kinds.length]!,
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
      status: statuses[i % statuses.length]!,
      nextDueDate: `${2026 + Math.floor((month - 1) / 12)}-${String(((month - 1) % 12) + 1).padStart(2, '0')}-${String((i % 28) + 1).padStart(2, '0')}`,
      photoUploadId: null,
      notes: null,
      archived: i % 50 === 0,
    })
  }
  return batch
}

export async function runRegistersBench(opts: { quick?: boolean, rows?: number } = {}): Promise<RegistersBenchResult> {
  const count = opts.rows ?? (opts.quick ? 20_000 : 100_000)
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'bandlight-bench-'))
  const previous = process.env.DATABASE_URL
  process.env.DATABASE_URL = `sqlite:${path.join(dir, 'bench.sqlite')}`
  // Imported after DATABASE_URL is set: db.ts opens the database on import.
  const { sequelize, closeDatabase } = await import('#server/utils/db')
  const { migrate } = await import('#server/utils/migrate')
  const { Organization } = await import('#server/models/Organization')
  const { Instrument } = await import('#server/models/Instrument')
  const { queryInstrumentPage } = await import('#server/services/instruments/query')
  try {
    await migrate()
    const orgs = await Organization.bulkCreate(Array.from({ length: 50 }, (_, i) => ({ name: `Bench Customer ${i + 1}`, contactEmails: [] })))
    const orgIds = orgs.map(o => o.id)
    const t0 = performance.now()
    const CHUNK = 2000
    for (let start = 0; start < count; start += CHUNK) {
      const batch = benchInstrumentRows(start, Math.min(count, start + CHUNK), orgIds)
      await sequelize.transaction(async t => Instrument.bulkCreate(batch, { transaction: t }))
    }
    const insertMs = performance.now() - t0
    await sequelize.query('ANALYZE')

    const base = { page: 1, pageSize: 50, sort: 'serial' as const, dir: 'asc' as const }
    const cases: { name: string, o: Parameters<typeof queryInstrumentPage>[0] }[] = [
      { name: 'first page, sort serial', o: base },
      { name: 'deep page (offset 90 % of rows)', o: { ...base, page: Math.floor((count * 0.9) / 50) } },
      { name: 'sort serial desc', o: { ...base, dir: 'desc' } },
      { name: 'sort nextDueDate', o: { ...base, sort: 'nextDueDate' } },
      { name: 'sort maker, page 100', o: { ...base, sort: 'maker', page: 100 } },
      { name: 'sort status desc', o: { ...base, sort: 'status', dir: 'desc' } },
      { name: 'sort rangeMaxK (no index: sorts in memory)', o: { ...base, sort: 'rangeMaxK' } },
      { name: 'all rows incl. archived, sort serial', o: { ...base, archived: 'all' } },
      { name: 'filter organization + status', o: { ...base, organizationId: orgs[7]!.id, status: 'active' } },
      { name: 'filter dueBefore 2026-03-01', o: { ...base, sort: 'nextDueDate', dueBefore: '2026-03-01' } },
      { name: 'search serial prefix "sn0a"', o: { ...base, q: 'sn0a' } },
      { name: 'search serial prefix, one hit', o: { ...base, q: `SN${((4242 * 7919) % 1_000_003).toString(36).toUpperCase().padStart(5, '0')}-4242` } },
      { name: 'search + organization filter', o: { ...base, q: 'SN0B', organizationId: orgs[3]!.id } },
    ]
    const requests: RegistersBenchResult['requests'] = []
    console.log(`registers bench: ${count} instruments inserted in ${Math.round(insertMs)} ms`)
    for (const c of cases) {
      const times: number[] = []
      let total = 0
      for (let run = 0; run < 7; run++) {
        const s = performance.now()
        total = (await queryInstrumentPage(c.o)).total
        times.push(performance.now() - s)
      }
      times.sort((a, b) => a - b)
      const ms = times[Math.floor(times.length / 2)]!
      requests.push({ name: c.name, ms, total })
      console.log(`  ${c.name.padEnd(40)} ${ms.toFixed(1).padStart(7)} ms/request   (${total} matching)`)
    }
    const [plan] = await sequelize.query(
      `EXPLAIN QUERY PLAN SELECT id FROM instruments AS \`Instrument\` WHERE archived = 0 AND (\`Instrument\`.\`serial\` LIKE 'sn0a%' ESCAPE '\\' OR \`Instrument\`.\`assetTag\` LIKE 'sn0a%' ESCAPE '\\' OR \`Instrument\`.\`maker\` LIKE 'sn0a%' ESCAPE '\\' OR \`Instrument\`.\`model\` LIKE 'sn0a%' ESCAPE '\\') ORDER BY serial, id LIMIT 50`,
    ) as [{ detail: string }[], unknown]
    console.log('  plan of the search:', plan.map(p => p.detail).join(' | '))
    return { rows: count, insertMs, requests }
  }
  finally {
    await closeDatabase()
    fs.rmSync(dir, { recursive: true, force: true })
    if (previous === undefined) delete process.env.DATABASE_URL
    else process.env.DATABASE_URL = previous
  }
}

if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  await runRegistersBench({ quick: process.argv.includes('--quick') })
}
