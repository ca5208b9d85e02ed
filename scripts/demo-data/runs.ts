/**
 * Demo procedures and calibration runs of the invented laboratory: an 8–14 µm flat-plate procedure
 * and a cavity procedure for short-wave instruments, and runs in every state (draft, submitted,
 * returned, approved) for several demo instruments — one that fails its specification and one
 * adjusted (as found and as left). Each run goes the way a real one does: a request, the lab's
 * contract review (terms and capability check), the customer's agreement (in the portal for the
 * demo customer's organization, recorded by the lab for the others), acceptance, the receipt of
 * the item, the measured conditions, the points, then review. Readings are invented: the expected
 * reading plus a chosen error and a little scatter, rounded to the display resolution. Performed by
 * the demo technician; approved and returned by the demo quality manager (separation of duties).
 * The thermal imager BF-IR-009's run records five regions of interest (the centre and four towards the
 * corners of its 320 × 240 image) at each of its three points, its lens, field of view, range setting and
 * non-uniformity correction, and a 16-frame series on the plate at 50 °C for the NETD (all invented).
 * Idempotent by natural keys: procedure name; instrument + calibration date for a run.
 */
import type { Transaction } from 'sequelize'
import type { PointStage } from '#shared/calibration/constants'
import { computePoint } from '#shared/calibration/compute'
import type { ProcedureCreateInput } from '#shared/schemas/procedure'
import type { ImagerSettings, RoiFramesInput, RoiInput } from '#shared/schemas/run'
import { BlackbodySource } from '#server/models/BlackbodySource'
import { CalibrationRun } from '#server/models/CalibrationRun'
import { Instrument } from '#server/models/Instrument'
import { Procedure } from '#server/models/Procedure'
import { ReferenceInstrument } from '#server/models/ReferenceInstrument'
import { User } from '#server/models/User'
import type { SessionUser } from '#shared/types'
import { CalibrationRequest } from '#server/models/CalibrationRequest'
import { createProcedureIn } from '#server/services/procedures/procedures'
import { acceptRequestIn, agreeRequestIn, recordAgreementIn, reviewRequestIn } from '#server/services/requests/requests'
import { addPointIn, approveRunIn, computationInput, loadRunContext, recordReceiptIn, returnRunIn, submitRunIn, updateRunIn, type Actor } from '#server/services/runs/runs'
import { Equipment } from '#server/services/runs/context'
import { recordAudit, snapshot } from '#server/utils/audit'

const C = (celsius: number) => Math.round((celsius + 273.15) * 100) / 100

export const DEMO_PROCEDURES: ProcedureCreateInput[] = [
  {
    name: 'Wideband 8–14 µm thermometers on the flat plate',
    documentReference: 'BL-CP-07 issue 3',
    decisionRule: 'simple-acceptance',
    guardBandFactor: null,
    changeNote: 'First issue in Bandlight.',
    applicability: { sourceKinds: ['flat-plate'], bandMinUm: 7, bandMaxUm: 15, minK: C(-20), maxK: C(150) },
    // The plate's lines (certified U, emissivity, uniformity, stability) come from its register entry;
    // the template holds the instrument-side lines.
    budgetFromEquipment: true,
    spotMargin: 2,
    correlations: [],
    template: [
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
    applicability: { sourceKinds: ['cavity'], bandMinUm: 0.6, bandMaxUm: 5, minK: C(50), maxK: C(1500) },
    // The cavity's and the reference thermometer's lines come from their register entries; the
    // reflected and the instrument temperature are read from the one room sensor (r = 1, GUM 5.2.2).
    budgetFromEquipment: true,
    spotMargin: 2,
    correlations: [{ between: [0, 1], coefficient: 1 }],
    template: [
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

interface DemoReceipt {
  packaging: string
  condition: string
  accessories?: string
  deviations?: string
  customerDecision?: string
}

interface DemoRun {
  instrumentTag: string
  procedure: number
  receivedDate: string
  calibrationDate: string
  adjusted?: boolean
  emissivitySetting: number
  /** The spot diameter at the distance, mm, for an instrument that states no distance-to-spot ratio (an imager's region of interest). */
  spotDiameterMm?: number
  status: 'draft' | 'submitted' | 'returned' | 'approved'
  comments?: string
  internalNotes?: string
  certificateRemarks?: string
  /** The customer named no specification: no statement of conformity. */
  noSpecification?: boolean
  receipt: DemoReceipt
  points: DemoPoint[]
  /** A thermal imager's run: its settings, its regions of interest and the set-point (°C) of its NETD frame series. */
  imager?: DemoImager
}

interface DemoImager {
  settings: ImagerSettings
  /** Position and size (pixels) and the ROI's offset from the centre on the uniform plate, K (invented non-uniformity). */
  rois: { name: string, xPx: number, yPx: number, widthPx: number, heightPx: number, offsetK: number }[]
  netdAtC: number
}

/** The demo imager's five regions of interest on its 320 × 240 image (invented offsets). */
const IMAGER: DemoImager = {
  settings: { lens: 'Standard 25 mm lens', fieldOfView: '24° × 18°', rangeSetting: '−20 °C to 150 °C', nonUniformityCorrection: true },
  rois: [
    { name: 'centre', xPx: 150, yPx: 110, widthPx: 20, heightPx: 20, offsetK: 0 },
    { name: 'top-left', xPx: 40, yPx: 30, widthPx: 20, heightPx: 20, offsetK: -0.3 },
    { name: 'top-right', xPx: 260, yPx: 30, widthPx: 20, heightPx: 20, offsetK: -0.2 },
    { name: 'bottom-left', xPx: 40, yPx: 190, widthPx: 20, heightPx: 20, offsetK: -0.4 },
    { name: 'bottom-right', xPx: 260, yPx: 190, widthPx: 20, heightPx: 20, offsetK: 0.1 },
  ],
  netdAtC: 50,
}

/** Invented frame-to-frame noise of the imager on the uniform plate, K (16 frames). */
const FRAME_NOISE = [0.04, -0.03, 0.01, -0.05, 0.02, 0.03, -0.01, -0.04, 0.05, -0.02, 0.0, 0.03, -0.03, 0.02, -0.01, 0.01]

const PLATE = 'BB-FP-01'
const CAVITY = 'BB-CV-02'
const CASE_OK: DemoReceipt = { packaging: 'Maker’s carry case, intact', condition: 'No visible damage; lens clean; switches on and reads.' }

const DEMO_RUNS: DemoRun[] = [
  { instrumentTag: 'KF-IR-013', procedure: 0, receivedDate: '2026-11-02', calibrationDate: '2026-11-09', status: 'approved', emissivitySetting: 0.95,
    receipt: { packaging: 'Maker’s carry case, intact', condition: 'Lens scratched near its edge; housing and display undamaged.', accessories: 'Wrist strap', deviations: 'Lens scratched near its edge.', customerDecision: 'Calibrate as received; the customer will replace the lens at the next service.' },
    points: [{ source: PLATE, setC: 0, errorK: 0.3 }, { source: PLATE, setC: 50, errorK: 0.2 }, { source: PLATE, setC: 100, errorK: -0.4 }] },
  { instrumentTag: 'BF-IR-009', procedure: 0, receivedDate: '2026-11-16', calibrationDate: '2026-11-20', status: 'submitted', emissivitySetting: 0.95, spotDiameterMm: 12, receipt: CASE_OK, imager: IMAGER,
    points: [{ source: PLATE, setC: 0, errorK: -0.6 }, { source: PLATE, setC: 50, errorK: -0.9 }, { source: PLATE, setC: 100, errorK: -1.2 }] },
  { instrumentTag: 'PG-IR-008', procedure: 0, receivedDate: '2026-11-12', calibrationDate: '2026-11-18', status: 'returned', emissivitySetting: 0.95, receipt: { packaging: 'Padded envelope', condition: 'No visible damage.' },
    comments: 'The 100 °C readings scatter more than the other points: check the plate had settled and repeat the point.',
    points: [{ source: PLATE, setC: 0, errorK: 0.1 }, { source: PLATE, setC: 100, errorK: 0.5 }] },
  { instrumentTag: 'PG-IR-005', procedure: 1, receivedDate: '2026-11-24', calibrationDate: '2026-11-27', status: 'draft', emissivitySetting: 1, receipt: { packaging: 'Wooden crate with foam inserts, intact', condition: 'Window clean; mounting flange dented, optics unaffected.' },
    internalNotes: 'Fixed 2.2 µm pyrometer; the 500 °C point still to do.',
    points: [{ source: CAVITY, setC: 300, reference: 'REF-PRT-02', errorK: 1.1 }, { source: CAVITY, setC: 400, reference: 'REF-PRT-02', errorK: 1.4 }] },
  { instrumentTag: 'BF-IR-001', procedure: 0, receivedDate: '2026-11-19', calibrationDate: '2026-11-23', status: 'submitted', emissivitySetting: 0.95, receipt: CASE_OK,
    internalNotes: 'Reads high across the range; the customer has been told the instrument is out of specification.',
    points: [{ source: PLATE, setC: 0, errorK: 1.6 }, { source: PLATE, setC: 50, errorK: 2.1 }, { source: PLATE, setC: 100, errorK: 2.6 }] },
  { instrumentTag: 'BF-IR-002', procedure: 0, receivedDate: '2026-11-03', calibrationDate: '2026-11-10', status: 'approved', adjusted: true, emissivitySetting: 0.95, receipt: CASE_OK,
    certificateRemarks: 'The instrument read low as found; its offset was adjusted with the maker’s service software and it was measured again (as left).',
    points: [
      { stage: 'as-found', source: PLATE, setC: 0, errorK: -1.4 }, { stage: 'as-found', source: PLATE, setC: 50, errorK: -1.7 }, { stage: 'as-found', source: PLATE, setC: 100, errorK: -1.9 },
      { stage: 'as-left', source: PLATE, setC: 0, errorK: 0.1 }, { stage: 'as-left', source: PLATE, setC: 50, errorK: 0 }, { stage: 'as-left', source: PLATE, setC: 100, errorK: -0.2 },
    ] },
  { instrumentTag: 'KF-IR-016', procedure: 0, receivedDate: '2026-11-25', calibrationDate: '2026-11-30', status: 'draft', emissivitySetting: 0.95, noSpecification: true, receipt: CASE_OK,
    points: [{ source: PLATE, setC: 50, errorK: 0.15 }] },
]

/** Scatter of the invented readings, K (five readings per point). */
const SCATTER = [-0.1, 0.05, 0, 0.1, -0.05]

/** The measured conditions of every demo run (invented), and the room sensor that measured them. */
const CONDITIONS = { ambientTemperatureK: 296.15, relativeHumidityPct: 42, distanceMm: 300, reflectedTemperatureK: 296.15, instrumentTemperatureK: 296.65 }

const sessionOf = (u: User): SessionUser => ({ id: u.id, name: u.name, email: u.email, role: u.role, organizationId: u.organizationId ?? null })

/**
 * The request a demo run comes from, reviewed and agreed, then accepted into work (one draft run,
 * assigned to the technician). The demo customer's organization agrees in the portal; the
 * laboratory records the others' agreement.
 */
async function requestAndAccept(t: Transaction, spec: DemoRun, instrument: Instrument, procedureVersionId: number, staff: { quality: User, technician: User, admin: User }): Promise<number> {
  const customer = await User.findOne({ where: { organizationId: instrument.organizationId, role: 'customer' }, transaction: t })
  const requester = customer ?? staff.admin
  const r = await CalibrationRequest.create({
    organizationId: instrument.organizationId,
    requestedBy: requester.id,
    instrumentIds: [instrument.id],
    preferredDate: spec.calibrationDate,
    requirements: `Calibration at ${[...new Set(spec.points.map(p => p.setC))].join(', ')} °C${customer ? '' : ' (ordered by e-mail; entered by the laboratory)'}.`,
    specification: spec.noSpecification ? null : instrument.accuracy,
    notes: null,
    terms: null, reviewedBy: null, reviewedAt: null, agreedTermsVersion: null, agreedAt: null, agreedBy: null, agreementMethod: null, agreementNote: null,
    handledBy: null, handledAt: null, response: null,
  }, { transaction: t })
  await recordAudit(t, { userId: null, action: 'seed', entity: 'CalibrationRequest', entityId: r.id, after: snapshot(r) })
  const lab = sessionOf(staff.quality)
  const proc = DEMO_PROCEDURES[spec.procedure]!
  // Each step answers the request as it now stands (its version moves on).
  let now = await reviewRequestIn(t, lab, r.id, { version: r.version, terms: {
    procedureVersionId,
    pointsK: [...new Set(spec.points.map(p => C(p.setC)))],
    distanceMm: CONDITIONS.distanceMm,
    emissivitySetting: spec.emissivitySetting,
    specification: spec.noSpecification ? null : instrument.accuracy,
    decisionRule: proc.decisionRule,
    guardBandFactor: proc.guardBandFactor,
    placeOfCalibration: 'laboratory',
    siteAddress: null,
    message: null,
  } })
  now = customer
    ? await agreeRequestIn(t, sessionOf(customer), r.id, { version: now.version, termsVersion: now.termsVersion })
    : await recordAgreementIn(t, lab, r.id, { version: now.version, termsVersion: now.termsVersion, note: `Purchase order received by e-mail on ${spec.receivedDate}, quoting the terms offered.` })
  now = await acceptRequestIn(t, lab, r.id, { version: now.version, calibrationDate: spec.calibrationDate, technicianId: staff.technician.id, response: null })
  // The invented story happened before the item arrived: date the review and agreement accordingly.
  const before = new Date(`${spec.receivedDate}T09:30:00Z`)
  before.setUTCDate(before.getUTCDate() - 3)
  await CalibrationRequest.update({ reviewedAt: before, agreedAt: new Date(before.getTime() + 26 * 3600_000), handledAt: new Date(before.getTime() + 27 * 3600_000) }, { where: { id: r.id }, transaction: t, hooks: false })
  return now.runIds[0]!
}

/** Make sure the demo procedures and runs exist; returns the number of records created. */
export async function seedRuns(t: Transaction): Promise<number> {
  let created = 0
  const tech = await User.findOne({ where: { email: 'technician@bandlight.test' }, transaction: t })
  const quality = await User.findOne({ where: { email: 'quality@bandlight.test' }, transaction: t })
  const admin = await User.findOne({ where: { email: 'admin@bandlight.test' }, transaction: t })
  if (!tech || !quality || !admin) return 0
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
  const ambientSensor = await ReferenceInstrument.findOne({ where: { assetTag: 'REF-AMB-01' }, transaction: t })

  for (const spec of DEMO_RUNS) {
    const instrument = await Instrument.findOne({ where: { assetTag: spec.instrumentTag }, transaction: t })
    if (!instrument) continue
    if (await CalibrationRun.findOne({ where: { instrumentId: instrument.id, calibrationDate: spec.calibrationDate }, transaction: t })) continue
    const runId = await requestAndAccept(t, spec, instrument, versions[spec.procedure]!, { quality, technician: tech, admin })
    created++
    const receipt = spec.receipt
    await recordReceiptIn(t, technician, runId, {
      receivedOn: spec.receivedDate,
      packaging: receipt.packaging,
      condition: receipt.condition,
      accessories: receipt.accessories ?? null,
      deviations: receipt.deviations ?? null,
      customerConsulted: !!receipt.customerDecision,
      customerDecision: receipt.customerDecision ?? null,
      reason: undefined,
    })
    let run = await CalibrationRun.findByPk(runId, { transaction: t })
    run = await updateRunIn(t, technician, runId, {
      ...CONDITIONS,
      spotDiameterMm: spec.spotDiameterMm ?? null,
      ambientInstrumentId: ambientSensor?.id ?? null,
      adjusted: !!spec.adjusted,
      ...(spec.imager ? { imagerSettings: spec.imager.settings } : {}),
      internalNotes: spec.internalNotes ?? null,
      certificateRemarks: spec.certificateRemarks ?? null,
      version: run!.version,
      reason: undefined,
    })
    const ctx = await loadRunContext(t, instrument.id, run.procedureVersionId, run.requestId)
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
        rois: null,
        netdFrames: null,
      }
      const used = await new Equipment(t, run.calibrationDate).used(obs)
      const expected = computePoint(computationInput(run, ctx, obs, source, used)).expectedReadingK
      const step = instrument.resolutionK
      const reading = (offsetK: number, s: number) => Math.round((Math.round(Math.round((expected - 273.15 + pt.errorK + offsetK + s) / step) * step * 1000) / 1000 + 273.15) * 1000) / 1000
      const readingsK = SCATTER.map(s => reading(0, s))
      let rois: RoiInput[] | null = null
      let netdFrames: RoiFramesInput[] | null = null
      if (spec.imager) {
        // each ROI with its own offset and the scatter turned round, so that ROIs do not read alike
        rois = spec.imager.rois.map(({ offsetK, ...roi }, j) => ({ ...roi, readingsK: j === 0 ? readingsK : SCATTER.map((_, i) => reading(offsetK, SCATTER[(i + j) % SCATTER.length]!)) }))
        if (pt.setC === spec.imager.netdAtC) {
          netdFrames = spec.imager.rois.map(({ name }, j) => ({ name, framesK: FRAME_NOISE.map((_, i) => Math.round((expected + pt.errorK + FRAME_NOISE[(i + 3 * j) % FRAME_NOISE.length]!) * 1000) / 1000) }))
        }
      }
      await addPointIn(t, technician, run.id, { ...obs, readingsK, rois, netdFrames, reason: undefined }, 'seed')
      created++
    }
    if (spec.status === 'draft') continue
    run = await CalibrationRun.findByPk(runId, { transaction: t })
    run = await submitRunIn(t, technician, run!.id, { version: run!.version }, 'seed')
    if (spec.status === 'approved') await approveRunIn(t, reviewer, run.id, { version: run.version }, 'seed')
    if (spec.status === 'returned') await returnRunIn(t, reviewer, run.id, { version: run.version, comments: spec.comments ?? 'Please check the points.' }, 'seed')
  }
  return created
}
