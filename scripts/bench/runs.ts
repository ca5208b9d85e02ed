/**
 * Saving calibration runs: `node --import tsx scripts/bench/runs.ts [--quick]`.
 * Creates a temporary SQLite database, applies the migrations, seeds a minimal laboratory (one
 * customer instrument, a flat-plate source with its certificate, a six-component procedure), then
 * times, through the same server/utils/runs.ts functions the routes use:
 * - saving a 12-point run with full budgets (the run header and 12 points in one transaction), and
 * - a header change that recomputes and stores all 12 points.
 * Prints ms per save (median and mean); the target is ≤ 50 ms per save.
 */
import fs from 'node:fs'
import os from 'node:os'
import path from 'node:path'
import { fileURLToPath } from 'node:url'

export interface RunsBenchResult {
  saves: number
  saveMedianMs: number
  saveMeanMs: number
  recomputeMedianMs: number
}

const median = (xs: number[]) => {
  const s = [...xs].sort((a, b) => a - b)
  return s.length % 2 ? s[(s.length - 1) / 2]! : (s[s.length / 2 - 1]! + s[s.length / 2]!) / 2
}

export async function runRunsBench(opts: { quick?: boolean } = {}): Promise<RunsBenchResult> {
  const saves = opts.quick ? 10 : Number(process.env.BENCH_RUNS_SAVES) || 40
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'bandlight-bench-runs-'))
  const previous = process.env.DATABASE_URL
  process.env.DATABASE_URL = `sqlite:${path.join(dir, 'bench.sqlite')}`
  // Imported after DATABASE_URL is set: db.ts opens the database on import.
  const { closeDatabase } = await import('#server/utils/db')
  const { migrate } = await import('#server/utils/migrate')
  await import('#server/models')
  const { Organization } = await import('#server/models/Organization')
  const { User } = await import('#server/models/User')
  const { Instrument } = await import('#server/models/Instrument')
  const { BlackbodySource } = await import('#server/models/BlackbodySource')
  const { EquipmentCalibration } = await import('#server/models/EquipmentCalibration')
  const { inTransaction } = await import('#server/utils/transaction')
  const { createProcedureIn } = await import('#server/services/procedures/procedures')
  const { addPointsIn, createRunIn, updateRunIn } = await import('#server/services/runs/runs')
  const { DEMO_PROCEDURES } = await import('../demo-data/runs')
  try {
    await migrate()
    const org = await Organization.create({ name: 'Bench Customer', contactEmails: [] })
    const user = await User.create({ email: 'bench@bandlight.test', name: 'Bench Technician', role: 'technician', passwordHash: 'x', organizationId: null })
    const instrument = await Instrument.create({
      organizationId: org.id, serial: 'BENCH-1', assetTag: null, maker: 'Bench', model: 'B-814', kind: 'spot-infrared',
      bandLambda1Um: 8, bandLambda2Um: 14, spectralResponseId: null, distanceToSpot: 12, rangeMinK: 243.15, rangeMaxK: 823.15,
      defaultEmissivity: 0.95, resolutionK: 0.1, accuracy: { kind: 'greaterOf', a: 1, b: 1 }, calibrationIntervalMonths: 12,
      status: 'active', nextDueDate: null, photoUploadId: null, notes: null,
    })
    const plate = await BlackbodySource.create({
      assetTag: 'BENCH-FP', kind: 'flat-plate', maker: 'Bench', model: 'Plate', serial: 'P1', apertureMm: 150,
      minTemperatureK: 253.15, maxTemperatureK: 423.15, emissivity: 0.95, emissivityU: 0.005, emissivityBandLambda1Um: 8, emissivityBandLambda2Um: 14,
      uniformityK: 0.2, stabilityK: 0.05, corrections: [[253.15, 0.35], [273.15, 0.22], [323.15, 0.1], [373.15, -0.05], [423.15, -0.18]], status: 'in-service', notes: null,
      // certified like the demo plate: radiance temperatures in 8–14 µm, surroundings 23.0 °C, U = 0.30 K (k = 2)
      emissivityTable: null, certifiedBasis: 'radiance-temperature', certifiedBandLambda1Um: 8, certifiedBandLambda2Um: 14, certifiedBandMedium: 'vacuum',
      certifiedReflectedTemperatureK: 296.15, certifiedExpandedUncertaintyK: 0.3, certifiedCoverageFactor: 2,
    })
    await EquipmentCalibration.create({ equipmentType: 'source', equipmentId: plate.id, provider: 'Bench', certificateNumber: 'B-1', calibrationDate: '2026-01-01', dueDate: '2027-01-01', results: null, uploadId: null, createdBy: null })
    const procedure = await inTransaction(t => createProcedureIn(t, user.id, DEMO_PROCEDURES[0]!))
    const actor = { id: user.id }
    const setPoints = Array.from({ length: 12 }, (_, i) => 253.15 + i * 15)
    const header = {
      instrumentId: instrument.id, procedureVersionId: procedure.currentVersionId!, calibrationDate: '2026-05-04',
      ambientTemperatureK: 296.15, relativeHumidityPct: 40, distanceMm: 300, spotDiameterMm: null, emissivitySetting: 0.95, reflectedTemperatureK: 296.15,
      instrumentTemperatureK: 296.65, emissivityRatioSetting: null, imagerSettings: null, calibrationEquation: null, ambientInstrumentId: null, adjusted: false, internalNotes: null, certificateRemarks: null,
      methodDeviations: null, placeOfCalibration: 'laboratory' as const, siteAddress: null,
    }
    const save = () => inTransaction(async (t) => {
      const run = await createRunIn(t, actor, header)
      await addPointsIn(t, actor, run.id, setPoints.map(sp => ({
        stage: 'as-found' as const, sourceId: plate.id, setPointK: sp, sourceIndicatedK: sp, referenceInstrumentId: null, referenceReadingK: null,
        readingsK: [sp + 0.1, sp + 0.2, sp + 0.1, sp + 0.3, sp + 0.2], rois: null, netdFrames: null, reason: undefined,
      })))
      return run
    })
    for (let i = 0; i < 3; i++) await save() // warm-up
    const saveMs: number[] = []
    const runIds: number[] = []
    for (let i = 0; i < saves; i++) {
      const t0 = performance.now()
      const run = await save()
      saveMs.push(performance.now() - t0)
      runIds.push(run.id)
    }
    const recomputeMs: number[] = []
    const { CalibrationRun } = await import('#server/models/CalibrationRun')
    for (const id of runIds.slice(0, Math.min(10, runIds.length))) {
      // every change moves a run's version (adding its points did): the header change names the current one
      const version = (await CalibrationRun.findByPk(id, { attributes: ['version'] }))!.version
      const t0 = performance.now()
      await inTransaction(t => updateRunIn(t, actor, id, { version, reflectedTemperatureK: 297.15, reason: undefined }))
      recomputeMs.push(performance.now() - t0)
    }
    const result: RunsBenchResult = {
      saves,
      saveMedianMs: median(saveMs),
      saveMeanMs: saveMs.reduce((a, b) => a + b, 0) / saveMs.length,
      recomputeMedianMs: median(recomputeMs),
    }
    console.log('Calibration runs (server/utils/runs.ts, temporary SQLite database)')
    console.log(`  save a 12-point run with full budgets   ${result.saveMedianMs.toFixed(1)} ms/save median, ${result.saveMeanMs.toFixed(1)} ms mean over ${saves}   target ≤ 50 ms`)
    console.log(`  header change recomputing 12 points     ${result.recomputeMedianMs.toFixed(1)} ms/save median   target ≤ 50 ms`)
    return result
  }
  finally {
    await closeDatabase()
    if (previous === undefined) delete process.env.DATABASE_URL
    else process.env.DATABASE_URL = previous
    fs.rmSync(dir, { recursive: true, force: true })
  }
}

if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  await runRunsBench({ quick: process.argv.includes('--quick') })
}
