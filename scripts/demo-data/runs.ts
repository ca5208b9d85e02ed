/**
 * Demo procedures and calibration runs of the invented laboratory: an 8–14 µm flat-plate procedure
 * and a cavity procedure for short-wave instruments, and runs in every state (draft, submitted,
 * returned, approved) for several demo instruments — one that fails its specification and one
 * adjusted (as found and as left). Readings are invented: the expected reading plus a chosen error
 * and a little scatter, rounded to the display resolution. Performed by the demo technician;
 * approved and returned by the demo quality manager (separation of duties).
 * Idempotent by natural keys: procedure name; instrument + calibration date for a run.
 */
import type { Transaction } from 'sequelize'
import type { PointStage } from '#shared/calibration/constants'
import { computePoint } from '#shared/calibration/compute'
import type { ProcedureCreateInput } from '#shared/schemas/procedure'
import { BlackbodySource } from '#server/models/BlackbodySource'
import { CalibrationRun } from '#server/models/CalibrationRun'
import { Instrument } from '#server/models/Instrument'
import { Procedure } from '#server/models/Procedure'
import { ReferenceInstrument } from '#server/models/ReferenceInstrument'
import { User } from '#server/models/User'
import { createProcedureIn } from '#server/services/procedures/procedures'
import { addPointIn, approveRunIn, computationInput, createRunIn, loadRunContext, returnRunIn, submitRunIn, type Actor } from '#server/services/runs/runs'

const C = (celsius: number) => Math.round((celsius + 273.15) * 100) / 100

export const DEMO_PROCEDURES: ProcedureCreateInput[] = [
  {
    name: 'Wideband 8–14 µm thermometers on the flat plate',
    documentReference: 'BL-CP-07 issue 3',
    decisionRule: 'simple-acceptance',
    guardBandFactor: null,
    changeNote: 'First issue in Bandlight.',
    template: [
      { name: 'Reference thermometer in the plate (certificate)', type: 'B', distribution: 'normal', value: 0.05, coverageFactor: 2, unit: 'K', input: 'sourceTemperature', dof: null },
      { name: 'Plate emissivity', type: 'B', distribution: 'rectangular', value: 0.01, coverageFactor: null, unit: 'emissivity', input: 'sourceEmissivity', dof: null },
      { name: 'Plate non-uniformity', type: 'B', distribution: 'rectangular', value: 0.2, coverageFactor: null, unit: 'K', input: 'sourceTemperature', dof: null },
      { name: 'Reflected temperature', type: 'B', distribution: 'rectangular', value: 1, coverageFactor: null, unit: 'K', input: 'reflectedTemperature', dof: null },
      { name: 'Instrument ambient influence', type: 'B', distribution: 'standard', value: 0.1, coverageFactor: null, unit: 'K', input: 'reading', dof: null },
      { name: 'Size of source and distance', type: 'B', distribution: 'standard', value: 0.1, coverageFactor: null, unit: 'K', input: 'reading', dof: null },
    ],
    cmc: [
      { minK: C(-20), maxK: C(50), expandedUncertaintyK: 0.6 },
      { minK: C(50), maxK: C(150), expandedUncertaintyK: 0.8 },
    ],
  },
  {
    name: 'Short-wave thermometers on cavity sources',
    documentReference: 'BL-CP-11 issue 1',
    decisionRule: 'guard-band',
    guardBandFactor: 1,
    changeNote: 'First issue in Bandlight.',
    template: [
      { name: 'Reference thermometer in the cavity (certificate)', type: 'B', distribution: 'normal', value: 0.06, coverageFactor: 2, unit: 'K', input: 'sourceTemperature', dof: null },
      { name: 'Cavity emissivity', type: 'B', distribution: 'rectangular', value: 0.2, coverageFactor: null, unit: 'percent-of-emissivity', input: 'sourceEmissivity', dof: null },
      { name: 'Cavity uniformity and stability', type: 'B', distribution: 'rectangular', value: 0.15, coverageFactor: null, unit: 'K', input: 'sourceTemperature', dof: null },
      { name: 'Reflected temperature', type: 'B', distribution: 'rectangular', value: 2, coverageFactor: null, unit: 'K', input: 'reflectedTemperature', dof: null },
      { name: 'Instrument temperature', type: 'B', distribution: 'rectangular', value: 1, coverageFactor: null, unit: 'K', input: 'instrumentTemperature', dof: null },
      { name: 'Size of source', type: 'B', distribution: 'standard', value: 150, coverageFactor: null, unit: 'mK', input: 'reading', dof: 12 },
      { name: 'Atmospheric absorption', type: 'B', distribution: 'rectangular', value: 0.1, coverageFactor: null, unit: 'K', input: 'reading', dof: null },
    ],
    cmc: [
      { minK: C(50), maxK: C(300), expandedUncertaintyK: 0.5 },
      { minK: C(300), maxK: C(500), expandedUncertaintyK: 0.9 },
      { minK: C(500), maxK: C(1500), expandedUncertaintyK: 2.5 },
    ],
  },
]

interface DemoPoint {
  stage?: PointStage
  source: string
  setC: number
  /** Reference thermometer asset tag; otherwise the source's indicated temperature (= set-point) is used. */
  reference?: string
  /** Error of the invented readings, K. */
  errorK: number
}

interface DemoRun {
  instrumentTag: string
  procedure: number
  receivedDate: string
  calibrationDate: string
  adjusted?: boolean
  emissivitySetting?: number
  status: 'draft' | 'submitted' | 'returned' | 'approved'
  comments?: string
  notes?: string
  points: DemoPoint[]
}

const PLATE = 'BB-FP-01'
const CAVITY = 'BB-CV-02'

const DEMO_RUNS: DemoRun[] = [
  { instrumentTag: 'KF-IR-013', procedure: 0, receivedDate: '2026-11-02', calibrationDate: '2026-11-09', status: 'approved', emissivitySetting: 0.95,
    points: [{ source: PLATE, setC: 0, errorK: 0.3 }, { source: PLATE, setC: 50, errorK: 0.2 }, { source: PLATE, setC: 100, errorK: -0.4 }] },
  { instrumentTag: 'BF-IR-009', procedure: 0, receivedDate: '2026-11-16', calibrationDate: '2026-11-20', status: 'submitted', emissivitySetting: 0.95,
    points: [{ source: PLATE, setC: 0, errorK: -0.6 }, { source: PLATE, setC: 50, errorK: -0.9 }, { source: PLATE, setC: 100, errorK: -1.2 }] },
  { instrumentTag: 'PG-IR-008', procedure: 0, receivedDate: '2026-11-12', calibrationDate: '2026-11-18', status: 'returned', emissivitySetting: 0.95,
    comments: 'The 100 °C readings scatter more than the other points: check the plate had settled and repeat the point.',
    points: [{ source: PLATE, setC: 0, errorK: 0.1 }, { source: PLATE, setC: 100, errorK: 0.5 }] },
  { instrumentTag: 'PG-IR-005', procedure: 1, receivedDate: '2026-11-24', calibrationDate: '2026-11-27', status: 'draft', emissivitySetting: 1,
    notes: 'Fixed 2.2 µm pyrometer; the 500 °C point still to do.',
    points: [{ source: CAVITY, setC: 300, reference: 'REF-PRT-02', errorK: 1.1 }, { source: CAVITY, setC: 400, reference: 'REF-PRT-02', errorK: 1.4 }] },
  { instrumentTag: 'BF-IR-001', procedure: 0, receivedDate: '2026-11-19', calibrationDate: '2026-11-23', status: 'submitted', emissivitySetting: 0.95,
    notes: 'Reads high across the range; the customer has been told the instrument is out of specification.',
    points: [{ source: PLATE, setC: 0, errorK: 1.6 }, { source: PLATE, setC: 50, errorK: 2.1 }, { source: PLATE, setC: 100, errorK: 2.6 }] },
  { instrumentTag: 'BF-IR-002', procedure: 0, receivedDate: '2026-11-03', calibrationDate: '2026-11-10', status: 'approved', adjusted: true, emissivitySetting: 0.95,
    notes: 'Found reading low; offset adjusted with the maker’s service software, then measured again.',
    points: [
      { stage: 'as-found', source: PLATE, setC: 0, errorK: -1.4 }, { stage: 'as-found', source: PLATE, setC: 50, errorK: -1.7 }, { stage: 'as-found', source: PLATE, setC: 100, errorK: -1.9 },
      { stage: 'as-left', source: PLATE, setC: 0, errorK: 0.1 }, { stage: 'as-left', source: PLATE, setC: 50, errorK: 0 }, { stage: 'as-left', source: PLATE, setC: 100, errorK: -0.2 },
    ] },
  { instrumentTag: 'KF-IR-016', procedure: 0, receivedDate: '2026-11-25', calibrationDate: '2026-11-30', status: 'draft', emissivitySetting: 0.95,
    points: [{ source: PLATE, setC: 50, errorK: 0.15 }] },
]

/** Scatter of the invented readings, K (five readings per point). */
const SCATTER = [-0.1, 0.05, 0, 0.1, -0.05]

/** Make sure the demo procedures and runs exist; returns the number of records created. */
export async function seedRuns(t: Transaction): Promise<number> {
  let created = 0
  const tech = await User.findOne({ where: { email: 'technician@bandlight.test' }, transaction: t })
  const quality = await User.findOne({ where: { email: 'quality@bandlight.test' }, transaction: t })
  if (!tech || !quality) return 0
  const technician: Actor = { id: tech.id }
  const reviewer: Actor = { id: quality.id }

  const versions: number[] = []
  for (const spec of DEMO_PROCEDURES) {
    let p = await Procedure.findOne({ where: { name: spec.name }, transaction: t })
    if (!p) {
      p = await createProcedureIn(t, quality.id, spec, 'seed')
      created++
    }
    versions.push(p.currentVersionId!)
  }

  for (const spec of DEMO_RUNS) {
    const instrument = await Instrument.findOne({ where: { assetTag: spec.instrumentTag }, transaction: t })
    if (!instrument) continue
    if (await CalibrationRun.findOne({ where: { instrumentId: instrument.id, calibrationDate: spec.calibrationDate }, transaction: t })) continue
    let run = await createRunIn(t, technician, {
      instrumentId: instrument.id,
      procedureVersionId: versions[spec.procedure]!,
      receivedDate: spec.receivedDate,
      calibrationDate: spec.calibrationDate,
      ambientTemperatureK: 296.15,
      relativeHumidityPct: 42,
      distanceMm: 300,
      emissivitySetting: spec.emissivitySetting,
      reflectedTemperatureK: 296.15,
      instrumentTemperatureK: 296.65,
      adjusted: !!spec.adjusted,
      notes: spec.notes ?? null,
    }, 'seed')
    created++
    const ctx = await loadRunContext(t, instrument.id, run.procedureVersionId)
    for (const pt of spec.points) {
      const source = await BlackbodySource.findOne({ where: { assetTag: pt.source }, transaction: t })
      const ref = pt.reference ? await ReferenceInstrument.findOne({ where: { assetTag: pt.reference }, transaction: t }) : null
      if (!source) continue
      const setPointK = C(pt.setC)
      const obs = {
        stage: pt.stage ?? 'as-found' as PointStage,
        sourceId: source.id,
        setPointK,
        sourceIndicatedK: ref ? null : setPointK,
        referenceInstrumentId: ref?.id ?? null,
        // The reference thermometer reads a little off the set-point, as it would.
        referenceReadingK: ref ? Math.round((setPointK + 0.12) * 1000) / 1000 : null,
        readingsK: [setPointK],
      }
      const expected = computePoint(computationInput(run, ctx, obs, source)).expectedReadingK
      const step = instrument.resolutionK
      const readingsK = SCATTER.map(s => Math.round(Math.round((expected - 273.15 + pt.errorK + s) / step) * step * 1000) / 1000 + 273.15)
        .map(r => Math.round(r * 1000) / 1000)
      await addPointIn(t, technician, run.id, { ...obs, readingsK, reason: undefined }, 'seed')
      created++
    }
    if (spec.status === 'draft') continue
    run = await submitRunIn(t, technician, run.id, { version: run.version }, 'seed')
    if (spec.status === 'approved') await approveRunIn(t, reviewer, run.id, { version: run.version }, 'seed')
    if (spec.status === 'returned') await returnRunIn(t, reviewer, run.id, { version: run.version, comments: spec.comments ?? 'Please check the points.' }, 'seed')
  }
  return created
}
