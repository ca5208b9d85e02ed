/**
 * What the points of a run are computed with, and the checks before a point is computed: the
 * instrument, its band, the procedure version and the terms agreed with the customer; the
 * reference equipment usable on the calibration date; the procedure fitting the source, the
 * instrument's band and the temperature; the source fitting the instrument (its emissivity known in
 * the instrument's band, the spot inside its aperture with the procedure's margin); the measured
 * conditions the reading model needs. Everything a point states comes from these records — never
 * from a default: the basis of the source's certified value and its uncertainty come from the source's
 * certified data, each budget line names the register entry and certificate or the procedure version
 * it came from.
 */
import type { Transaction } from 'sequelize'
import { computationConditionsFor, RUN_CONDITION_LABELS, type PointStage } from '#shared/calibration/constants'
import { computePoint } from '#shared/calibration/compute'
import { emissivityForBand, spotFit, spotProblem, type BandEmissivity } from '#shared/calibration/setup'
import { EQUATION_FIELD, equationTable } from '#shared/calibration/equation'
import { EngineInputError } from '#shared/radiometry/errors'
import { kelvinToCelsiusText } from '#shared/format'
import { CERTIFIED_BASIS_LABELS, EQUATION_KINDS, INSTRUMENT_KIND_LABELS, isImagerKind, isRatioKind, SOURCE_KIND_LABELS } from '#shared/registers/constants'
import { CENTRE_ROI, type PointCreateInput, type RoiFramesInput, type RoiInput } from '#shared/schemas/run'
import type { BandInput, EquipmentLine, PointComputationInput, PointResult, ReferenceBasisInput, RunAgreementDTO, RunEquationDTO } from '#shared/types'
import { BlackbodySource } from '#server/models/BlackbodySource'
import type { CalibrationRun } from '#server/models/CalibrationRun'
import { EquipmentCalibration } from '#server/models/EquipmentCalibration'
import { Instrument } from '#server/models/Instrument'
import { ProcedureVersion } from '#server/models/ProcedureVersion'
import { ReferenceInstrument } from '#server/models/ReferenceInstrument'
import type { RunPoint } from '#server/models/RunPoint'
import { SpectralResponse } from '#server/models/SpectralResponse'
import { engine, invalidInput } from '#server/utils/errors'
import { assertUsableOn } from '#server/services/equipment/usability'
import { agreementOf } from '#server/services/requests/agreement'
import { instrumentBand, instrumentBand2 } from './dto'

/** What every point of a run is computed with. */
export interface RunContext {
  instrument: Instrument
  table: SpectralResponse | null
  band: BandInput
  /** A ratio pyrometer's band 2 (null for other kinds, or while it is not recorded) and its table. */
  band2: BandInput | null
  table2: SpectralResponse | null
  /** The instrument is a ratio (two-colour) pyrometer: its points use the two-colour model. */
  ratio: boolean
  /** The instrument is a thermal imager: its points record regions of interest. */
  imager: boolean
  procedureVersion: ProcedureVersion
  /** The terms agreed with the customer (their decision rule and specification prevail), or null. */
  agreement: RunAgreementDTO | null
}

export async function loadRunContext(t: Transaction | undefined, instrumentId: number, procedureVersionId: number, requestId: number | null = null): Promise<RunContext> {
  const instrument = await Instrument.findByPk(instrumentId, { transaction: t })
  if (!instrument) invalidInput({ instrumentId: 'No instrument with this id' })
  const table = instrument.spectralResponseId ? await SpectralResponse.findByPk(instrument.spectralResponseId, { transaction: t }) : null
  const band = instrumentBand(instrument, table)
  if (!band) invalidInput({ instrumentId: 'The instrument has neither a spectral band nor a responsivity table' })
  const procedureVersion = await ProcedureVersion.findByPk(procedureVersionId, { transaction: t })
  if (!procedureVersion) invalidInput({ procedureVersionId: 'No procedure version with this id' })
  const ratio = isRatioKind(instrument.kind)
  const table2 = ratio && instrument.band2SpectralResponseId ? await SpectralResponse.findByPk(instrument.band2SpectralResponseId, { transaction: t }) : null
  return {
    instrument,
    table,
    band,
    band2: ratio ? instrumentBand2(instrument, table2) : null,
    table2,
    ratio,
    imager: isImagerKind(instrument.kind),
    procedureVersion,
    agreement: await agreementOf(requestId, t),
  }
}

/** The observations of a point (what the technician entered). */
export interface Observation {
  stage: PointStage
  sourceId: number
  setPointK: number
  sourceIndicatedK: number | null
  referenceInstrumentId: number | null
  referenceReadingK: number | null
  readingsK: number[]
  /** A thermal imager's regions of interest (the centre's readings are `readingsK`); null for other kinds. */
  rois: RoiInput[] | null
  /** A thermal imager's frame series for the NETD; null when none. */
  netdFrames: RoiFramesInput[] | null
}

export function observationOf(p: RunPoint): Observation {
  return {
    stage: p.stage,
    sourceId: p.sourceId,
    setPointK: p.setPointK,
    sourceIndicatedK: p.sourceIndicatedK ?? null,
    referenceInstrumentId: p.referenceInstrumentId ?? null,
    referenceReadingK: p.referenceReadingK ?? null,
    readingsK: p.readingsK,
    rois: p.rois ?? null,
    netdFrames: p.netdFrames ?? null,
  }
}

export function observationFrom(input: Omit<PointCreateInput, 'reason'>): Observation {
  return {
    stage: input.stage,
    sourceId: input.sourceId,
    setPointK: input.setPointK,
    sourceIndicatedK: input.sourceIndicatedK ?? null,
    referenceInstrumentId: input.referenceInstrumentId ?? null,
    referenceReadingK: input.referenceReadingK ?? null,
    readingsK: input.readingsK,
    rois: input.rois ?? null,
    netdFrames: input.netdFrames ?? null,
  }
}

/**
 * The measured conditions the model needs that the run header does not hold yet (400 naming them):
 * the reading model's, or a ratio pyrometer's (the reflected temperature and its ratio setting).
 */
export function assertComputable(run: CalibrationRun, ratio = false): void {
  const missing = computationConditionsFor(ratio).filter(f => run.get(f) === null || run.get(f) === undefined)
  if (missing.length) {
    invalidInput(Object.fromEntries(missing.map(f => [f, `Enter the ${RUN_CONDITION_LABELS[f].toLowerCase()} measured for this run before adding points: the expected reading depends on it`])))
  }
}

/** The reference equipment of a point with the certificates in force on the run's date (for the budget lines' origins). */
export interface UsedEquipment {
  /** Number of the source's calibration certificate in force, or null when none is recorded. */
  sourceCertificate: string | null
  /** The point's reference thermometer and its certificate in force; null for a point on the source's correction. */
  reference: { row: ReferenceInstrument, certificate: string | null } | null
}

/** How a budget line names where its value came from. */
function originOf(tag: string, certificate: string | null, what: string): string {
  return `${tag} ${what}${certificate ? `, certificate ${certificate}` : ', no certificate recorded'}`
}

/** The procedure version as a template line's origin: name, document, version. */
export function procedureOrigin(pv: ProcedureVersion): string {
  return `Procedure ${pv.name} (${pv.documentReference}), version ${pv.versionNumber}`
}

/** The basis of a source's corrected value, as the computation takes it (its band and T_w0 for a radiance temperature). */
export function sourceBasis(source: BlackbodySource): ReferenceBasisInput {
  if (source.certifiedBasis !== 'radiance-temperature') return { kind: source.certifiedBasis ?? 'surface-temperature' }
  const l1 = source.certifiedBandLambda1Um
  const l2 = source.certifiedBandLambda2Um
  const tw0 = source.certifiedReflectedTemperatureK
  if (l1 == null || l2 == null || tw0 == null) {
    invalidInput({ sourceId: `${source.assetTag}’s certificate states radiance temperatures, but the register lacks their band or the surroundings’ temperature at calibration: enter them from the certificate` })
  }
  return { kind: 'radiance-temperature', band: { kind: 'rectangular', lambda1Um: l1, lambda2Um: l2, ...(source.certifiedBandMedium === 'air' ? { medium: 'air' as const } : {}) }, reflectedTemperatureK: tw0 }
}

/** A source's emissivity statement as the register holds it. */
function emissivityStatement(source: BlackbodySource) {
  return {
    emissivity: source.emissivity,
    emissivityU: source.emissivityU,
    emissivityBandLambda1Um: source.emissivityBandLambda1Um ?? null,
    emissivityBandLambda2Um: source.emissivityBandLambda2Um ?? null,
    emissivityTable: source.emissivityTable ?? null,
  }
}

/**
 * The source's emissivity in the instrument's band (for a ratio pyrometer, in its band 1 or 2); 400 on
 * `sourceId` naming the numbers when none is recorded for it.
 */
export function bandEmissivity(source: BlackbodySource, band: BandInput, which: 1 | 2 | null = null): BandEmissivity {
  const e = emissivityForBand(emissivityStatement(source), band, source.assetTag)
  if ('problem' in e) invalidInput({ sourceId: which ? inBand(e.problem, which) : e.problem })
  return e
}

/** A refusal of setup.ts about "the instrument's band", said of a ratio pyrometer's band 1 or 2. */
function inBand(problem: string, which: 1 | 2): string {
  return problem.replace('the instrument’s band', `the ratio pyrometer’s band ${which}`)
}

/**
 * The budget lines of the reference equipment used (see ProcedureVersion.budgetFromEquipment): the
 * source's certified U with its k on its reference value (or the reference thermometer's calibration
 * uncertainty, k = 1, for a point read with one), the source's emissivity uncertainty for the band (k = 1),
 * its uniformity and stability (half-widths of rectangular distributions, as the register's form states
 * them: "half-width of the variation"). Each names the register entry and certificate it came from.
 */
export function equipmentLinesFor(source: BlackbodySource, used: UsedEquipment, basis: ReferenceBasisInput | null, emissivity: BandEmissivity, emissivity2: BandEmissivity | null = null): EquipmentLine[] {
  const tag = source.assetTag
  const radiance = basis?.kind === 'radiance-temperature'
  const onValue = radiance ? 'radianceTemperature' as const : 'sourceTemperature' as const
  const lines: EquipmentLine[] = []
  if (used.reference) {
    const r = used.reference.row
    lines.push({ name: `Reference thermometer ${r.assetTag} (calibration, k = 1)`, type: 'B', distribution: 'standard', value: r.standardUncertainty, coverageFactor: null, unit: 'K', input: 'sourceTemperature', dof: null, origin: originOf(r.assetTag, used.reference.certificate, 'register (standard uncertainty)') })
  }
  else {
    const U = source.certifiedExpandedUncertaintyK
    const k = source.certifiedCoverageFactor
    if (U == null || k == null) invalidInput({ sourceId: `${tag}’s certified expanded uncertainty U and its k are not recorded: enter them from its certificate (the procedure takes the source’s uncertainty from the register)` })
    lines.push({ name: `Certified value of ${tag} (${CERTIFIED_BASIS_LABELS[basis?.kind ?? source.certifiedBasis].toLowerCase()})`, type: 'B', distribution: 'normal', value: U, coverageFactor: k, unit: 'K', input: onValue, dof: null, origin: originOf(tag, used.sourceCertificate, `certified data (U = ${U} K, k = ${k})`) })
  }
  if (emissivity2) {
    // a ratio pyrometer: ε in each band, taken as independent (for a grey source the two errors would largely cancel in the ratio, so this is the larger budget)
    lines.push({ name: `Emissivity of ${tag} in band 1`, type: 'B', distribution: 'standard', value: emissivity.standardUncertainty, coverageFactor: null, unit: 'emissivity', input: 'sourceEmissivity', dof: null, origin: originOf(tag, used.sourceCertificate, `register: ${emissivity.text}`) })
    lines.push({ name: `Emissivity of ${tag} in band 2`, type: 'B', distribution: 'standard', value: emissivity2.standardUncertainty, coverageFactor: null, unit: 'emissivity', input: 'sourceEmissivity2', dof: null, origin: originOf(tag, used.sourceCertificate, `register: ${emissivity2.text}`) })
  }
  else {
    lines.push({ name: `Emissivity of ${tag} in the instrument’s band`, type: 'B', distribution: 'standard', value: emissivity.standardUncertainty, coverageFactor: null, unit: 'emissivity', input: 'sourceEmissivity', dof: null, origin: originOf(tag, used.sourceCertificate, `register: ${emissivity.text}`) })
  }
  const onSource = used.reference ? 'sourceTemperature' as const : onValue
  lines.push({ name: `Uniformity of ${tag}`, type: 'B', distribution: 'rectangular', value: source.uniformityK, coverageFactor: null, unit: 'K', input: onSource, dof: null, origin: originOf(tag, used.sourceCertificate, `register (uniformity ± ${source.uniformityK} K)`) })
  lines.push({ name: `Stability of ${tag}`, type: 'B', distribution: 'rectangular', value: source.stabilityK, coverageFactor: null, unit: 'K', input: onSource, dof: null, origin: originOf(tag, used.sourceCertificate, `register (stability ± ${source.stabilityK} K)`) })
  return lines
}

/** The spot against the source's aperture at the run's distance, with the procedure's margin (shared/calibration/setup.ts). */
function spotOf(run: CalibrationRun, ctx: RunContext, source: BlackbodySource) {
  return spotFit({
    apertureMm: source.apertureMm,
    distanceMm: run.distanceMm ?? null,
    distanceToSpot: ctx.instrument.distanceToSpot ?? null,
    spotDiameterMm: run.spotDiameterMm ?? null,
    margin: ctx.procedureVersion.spotMargin ?? null,
  })
}

/** What the setup checks found, for the budget's notes (the emissivity used; the spot against the aperture). */
function setupNotes(run: CalibrationRun, ctx: RunContext, source: BlackbodySource, emissivity: BandEmissivity, emissivity2: BandEmissivity | null = null): string[] {
  const fit = spotOf(run, ctx, source)
  const spot = fit.spotDiameterMm === null
    ? `The instrument’s spot was not checked against ${source.assetTag}’s ${source.apertureMm} mm aperture: ${ctx.instrument.distanceToSpot == null ? 'the instrument states no distance-to-spot ratio and the run no spot diameter' : 'the measuring distance is not entered'}.`
    : `Spot ${fit.spotDiameterMm.toFixed(1)} mm (${fit.how}) within ${source.assetTag}’s ${source.apertureMm} mm aperture (${fit.margin === 1 ? 'the procedure states no margin: the spot must fit' : `procedure margin ${fit.margin}: at least ${fit.requiredApertureMm!.toFixed(1)} mm`}).`
  if (emissivity2) {
    return [
      `Source emissivity in band 1: ${emissivity.text}; in band 2: ${emissivity2.text} (${source.assetTag}).`,
      'The uncertainties of the source emissivity in the two bands are taken as independent: for a grey source their errors would largely cancel in the ratio, so the budget is the larger one.',
      spot,
    ]
  }
  return [`Source emissivity ${emissivity.text} (${source.assetTag}).`, spot]
}

/**
 * The computation's input for one point of a run: the agreed terms' decision rule and specification
 * when an agreement is on record (and still stands), the procedure's rule and the instrument's
 * specification otherwise; the source's corrected value on its certified basis; its emissivity for the
 * instrument's band; and, when the procedure takes them, the reference equipment's budget lines.
 * @param used - the reference equipment with its certificates ({@link usedEquipment}); needed when the
 *   procedure's budget takes the equipment's lines
 */
export function computationInput(run: CalibrationRun, ctx: RunContext, obs: Observation, source: BlackbodySource, used?: UsedEquipment): PointComputationInput {
  const pv = ctx.procedureVersion
  const agreed = ctx.agreement?.current ? ctx.agreement : null
  const rule = agreed ? agreed.decisionRule : pv.decisionRule
  const viaSource = obs.referenceInstrumentId == null
  const basis = viaSource ? sourceBasis(source) : null
  const emissivity = bandEmissivity(source, ctx.band)
  const band2 = ctx.ratio ? ctx.band2 : null
  if (ctx.ratio && !band2) invalidInput({ instrumentId: ratioBandMissing(ctx.instrument) })
  const emissivity2 = band2 ? bandEmissivity(source, band2, 2) : null
  let equipmentLines: EquipmentLine[] | undefined
  if (pv.budgetFromEquipment) {
    if (!used) throw new Error('computationInput: the procedure takes the equipment’s budget lines; pass the equipment used')
    equipmentLines = equipmentLinesFor(source, used, basis, emissivity, emissivity2)
  }
  return {
    band: ctx.band,
    reference: viaSource
      ? { kind: 'source-correction', sourceIndicatedK: obs.sourceIndicatedK!, corrections: source.corrections ?? [], basis: basis! }
      : { kind: 'reference-thermometer', referenceReadingK: obs.referenceReadingK! },
    sourceEmissivity: emissivity.emissivity,
    reflectedTemperatureK: run.reflectedTemperatureK!,
    // a ratio pyrometer's model has neither: NaN (stored as null) when they were not entered
    instrumentTemperatureK: run.instrumentTemperatureK ?? Number.NaN,
    emissivitySetting: run.emissivitySetting ?? Number.NaN,
    readingsK: [...obs.readingsK],
    resolutionK: ctx.instrument.resolutionK,
    template: pv.template,
    templateOrigin: procedureOrigin(pv),
    ...(equipmentLines ? { equipmentLines } : {}),
    ...(pv.correlations?.length ? { correlations: pv.correlations } : {}),
    setupNotes: setupNotes(run, ctx, source, emissivity, emissivity2),
    cmc: pv.cmc,
    accuracy: agreed?.specification ?? ctx.instrument.accuracy,
    rule,
    guardBandFactor: rule === 'simple-acceptance' ? null : (agreed ? agreed.guardBandFactor : pv.guardBandFactor) ?? 1,
    ...(band2 && emissivity2 ? { ratio: { band2, sourceEmissivity2: emissivity2.emissivity, emissivityRatioSetting: run.emissivityRatioSetting! } } : {}),
    ...(ctx.imager && obs.rois ? { imager: { rois: obs.rois, centreRoi: CENTRE_ROI, netdFrames: obs.netdFrames } } : {}),
  }
}

/** Why a ratio pyrometer's point cannot be computed without its second band. */
function ratioBandMissing(i: Instrument): string {
  return `${i.assetTag ?? i.serial} is a ratio pyrometer, and its second band is not recorded: enter band 2 and its emissivity-ratio setting on the instrument (the two-colour model needs both bands)`
}

export function pointColumns(obs: Observation, result: PointResult) {
  return {
    ...obs,
    referenceTemperatureK: result.referenceTemperatureK,
    expectedReadingK: result.expectedReadingK,
    errorK: result.errorK,
    statedUncertaintyK: result.budget.statedUncertaintyK,
    verdict: result.conformity.verdict,
    engineVersion: result.engineVersion,
    result,
  }
}

/** A point as the revision record keeps it: its number in the run, observations and key results. */
export function pointRecord(p: RunPoint) {
  const { rois, netdFrames, ...obs } = observationOf(p)
  return {
    point: p.seq,
    ...obs,
    ...(rois ? { rois } : {}),
    ...(netdFrames ? { netdFrames } : {}),
    referenceTemperatureK: p.referenceTemperatureK,
    expectedReadingK: p.expectedReadingK,
    errorK: p.errorK,
    statedUncertaintyK: p.statedUncertaintyK,
    verdict: p.verdict,
    engineVersion: p.engineVersion,
  }
}

/** One piece of reference equipment as an operation found it: the record, why it cannot be used (or null), its certificate in force. */
export interface EquipmentHit<R> { row: R | null, reason: string | null, certificate: string | null }

/** The reference equipment of an operation, loaded and checked once each. */
export class Equipment {
  private sources = new Map<number, EquipmentHit<BlackbodySource>>()
  private refs = new Map<number, EquipmentHit<ReferenceInstrument>>()
  constructor(private readonly t: Transaction | undefined, private readonly date: string) {}

  /** The number of the calibration certificate in force on the date (the latest on or before it). */
  private async certificateOf(equipmentType: 'source' | 'reference', equipmentId: number): Promise<string | null> {
    const rows = await EquipmentCalibration.findAll({ where: { equipmentType, equipmentId }, attributes: ['calibrationDate', 'certificateNumber', 'id'], order: [['calibrationDate', 'DESC'], ['id', 'DESC']], transaction: this.t })
    return rows.find(c => c.calibrationDate <= this.date)?.certificateNumber ?? null
  }

  async source(id: number): Promise<EquipmentHit<BlackbodySource>> {
    let hit = this.sources.get(id)
    if (!hit) {
      const row = await BlackbodySource.findByPk(id, { transaction: this.t })
      hit = row
        ? { row, reason: await assertUsableOn(row, this.date, this.t), certificate: await this.certificateOf('source', id) }
        : { row: null, reason: 'No blackbody source with this id', certificate: null }
      this.sources.set(id, hit)
    }
    return hit
  }

  async reference(id: number): Promise<EquipmentHit<ReferenceInstrument>> {
    let hit = this.refs.get(id)
    if (!hit) {
      const row = await ReferenceInstrument.findByPk(id, { transaction: this.t })
      if (!row) hit = { row: null, reason: 'No reference instrument with this id', certificate: null }
      else if (row.rangeUnit !== 'K') hit = { row, reason: `${row.assetTag} does not measure temperature`, certificate: null }
      else hit = { row, reason: await assertUsableOn(row, this.date, this.t), certificate: await this.certificateOf('reference', id) }
      this.refs.set(id, hit)
    }
    return hit
  }

  /** The equipment of a point with its certificates (for {@link computationInput}). */
  async used(obs: Observation): Promise<UsedEquipment> {
    const s = await this.source(obs.sourceId)
    const r = obs.referenceInstrumentId != null ? await this.reference(obs.referenceInstrumentId) : null
    return { sourceCertificate: s.certificate, reference: r?.row ? { row: r.row, certificate: r.certificate } : null }
  }
}

export function refusal(tag: string, date: string, reason: string): string {
  return `${tag} cannot be used on ${date}: ${reason}`
}

/** A field and the reason a point cannot be taken with this setup, or null when it fits. */
export interface SetupProblem { field: string, message: string }

/**
 * The setup checks before a point is computed: the procedure states what it applies to, and the
 * source's kind, the instrument's band and the set-point fall inside it and inside the instrument's
 * range; the as-left stage only on an adjusted run; the equipment usable on the calibration date.
 */
export async function setupProblem(run: CalibrationRun, ctx: RunContext, eq: Equipment, obs: Observation): Promise<SetupProblem | null> {
  if (!run.adjusted && obs.stage === 'as-left') return { field: 'stage', message: 'This run records no adjustment, so every point is as found (mark the run adjusted to add as-left points)' }
  const pv = ctx.procedureVersion
  const a = pv.applicability
  if (!a) return { field: 'procedureVersionId', message: `Procedure ${pv.name} (version ${pv.versionNumber}) does not state the sources, band and range it applies to: edit the procedure to state them, or choose another` }
  const s = await eq.source(obs.sourceId)
  if (!s.row) return { field: 'sourceId', message: s.reason! }
  if (s.reason) return { field: 'sourceId', message: refusal(s.row.assetTag, run.calibrationDate, s.reason) }
  if (!a.sourceKinds.includes(s.row.kind)) {
    return { field: 'sourceId', message: `${s.row.assetTag} is a ${SOURCE_KIND_LABELS[s.row.kind].toLowerCase()}; procedure ${pv.name} is for ${a.sourceKinds.map(k => SOURCE_KIND_LABELS[k].toLowerCase()).join(' or ')} sources` }
  }
  const kindProblem = kindOfPointProblem(ctx, obs)
  if (kindProblem) return kindProblem
  const band = ctx.band
  const edges = (b: BandInput) => (b.kind === 'rectangular' ? [b.lambda1Um, b.lambda2Um] : [b.points[0]![0], b.points[b.points.length - 1]![0]])
  const [lo, hi1] = edges(band)
  // a ratio pyrometer's bands together: band 1's start to band 2's end
  const hi = ctx.band2 ? edges(ctx.band2)[1]! : hi1!
  if (lo! < a.bandMinUm || hi > a.bandMaxUm) {
    return { field: 'procedureVersionId', message: `The instrument's band${ctx.band2 ? 's' : ''} (${lo}–${hi} µm) ${ctx.band2 ? 'are' : 'is'} outside the ${a.bandMinUm}–${a.bandMaxUm} µm that procedure ${pv.name} covers` }
  }
  if (obs.setPointK < a.minK || obs.setPointK > a.maxK) {
    return { field: 'setPointK', message: `${kelvinToCelsiusText(obs.setPointK)} is outside procedure ${pv.name}'s range (${kelvinToCelsiusText(a.minK)} to ${kelvinToCelsiusText(a.maxK)})` }
  }
  const i = ctx.instrument
  if (obs.setPointK < i.rangeMinK || obs.setPointK > i.rangeMaxK) {
    return { field: 'setPointK', message: `${kelvinToCelsiusText(obs.setPointK)} is outside the instrument's range (${kelvinToCelsiusText(i.rangeMinK)} to ${kelvinToCelsiusText(i.rangeMaxK)})` }
  }
  if (obs.referenceInstrumentId != null) {
    const r = await eq.reference(obs.referenceInstrumentId)
    if (!r.row) return { field: 'referenceInstrumentId', message: r.reason! }
    if (r.reason) return { field: 'referenceInstrumentId', message: refusal(r.row.assetTag, run.calibrationDate, r.reason) }
  }
  return fitProblem(run, ctx, s.row, obs)
}

/**
 * Whether the source fits the instrument and the procedure (shared/calibration/setup.ts): its emissivity
 * is known in the instrument's band; the spot fits inside its aperture with the procedure's margin (a
 * procedure that states a margin needs the distance, or a stated spot, to check it); its certified data
 * are complete for the basis and, when the procedure takes them, for the budget.
 */
export function fitProblem(run: CalibrationRun, ctx: RunContext, source: BlackbodySource, obs: Pick<Observation, 'referenceInstrumentId'>): SetupProblem | null {
  const pv = ctx.procedureVersion
  const e = emissivityForBand(emissivityStatement(source), ctx.band, source.assetTag)
  if ('problem' in e) return { field: 'sourceId', message: ctx.ratio ? inBand(e.problem, 1) : e.problem }
  if (ctx.ratio) {
    // the two-colour model needs the source's emissivity in BOTH bands
    if (!ctx.band2) return { field: 'instrumentId', message: ratioBandMissing(ctx.instrument) }
    const e2 = emissivityForBand(emissivityStatement(source), ctx.band2, source.assetTag)
    if ('problem' in e2) return { field: 'sourceId', message: inBand(e2.problem, 2) }
    if (obs.referenceInstrumentId == null && source.certifiedBasis === 'radiance-temperature') {
      return { field: 'sourceId', message: `${source.assetTag}’s certificate states radiance temperatures in one band; a ratio pyrometer is calibrated against the source’s temperature (a cavity or surface temperature) or a reference thermometer in the source` }
    }
  }
  const fit = spotOf(run, ctx, source)
  const spot = spotProblem(fit, source.apertureMm, source.assetTag, `${pv.name} (version ${pv.versionNumber})`)
  if (spot) return { field: 'sourceId', message: spot }
  if (fit.fits === null && pv.spotMargin != null) {
    const field = ctx.instrument.distanceToSpot != null && run.distanceMm == null ? 'distanceMm' : 'spotDiameterMm'
    return {
      field,
      message: field === 'distanceMm'
        ? `Procedure ${pv.name} checks the instrument’s spot against the source’s aperture: enter the measuring distance (the instrument’s distance-to-spot ratio is ${ctx.instrument.distanceToSpot}:1)`
        : `Procedure ${pv.name} checks the instrument’s spot against the source’s aperture, and the instrument states no distance-to-spot ratio: enter the spot diameter at the measuring distance`,
    }
  }
  if (obs.referenceInstrumentId == null && source.certifiedBasis === 'radiance-temperature'
    && (source.certifiedBandLambda1Um == null || source.certifiedBandLambda2Um == null || source.certifiedReflectedTemperatureK == null)) {
    return { field: 'sourceId', message: `${source.assetTag}’s certificate states radiance temperatures, but the register lacks their band or the surroundings’ temperature at calibration: enter them from the certificate` }
  }
  if (pv.budgetFromEquipment && obs.referenceInstrumentId == null && (source.certifiedExpandedUncertaintyK == null || source.certifiedCoverageFactor == null)) {
    return { field: 'sourceId', message: `${source.assetTag}’s certified expanded uncertainty U and its k are not recorded: enter them from its certificate (procedure ${pv.name} takes the source’s uncertainty from the register)` }
  }
  return null
}

/**
 * What a point must hold for its instrument's kind: a thermal imager's point records its readings in
 * regions of interest (the centre among them); no other kind's point has any.
 */
function kindOfPointProblem(ctx: RunContext, obs: Pick<Observation, 'rois' | 'netdFrames'>): SetupProblem | null {
  if (ctx.imager && !obs.rois) {
    return { field: 'rois', message: `A thermal imager's point records its readings in regions of interest: the '${CENTRE_ROI}' region and the others across the field, each with its position and size in pixels` }
  }
  if (!ctx.imager && (obs.rois || obs.netdFrames)) {
    return { field: obs.rois ? 'rois' : 'netdFrames', message: 'Only a thermal imager\'s point records regions of interest and frame series' }
  }
  return null
}

/** Check the setup and compute one point; 400 naming the field at fault. */
export async function evaluateObservation(run: CalibrationRun, ctx: RunContext, eq: Equipment, obs: Observation): Promise<PointResult> {
  const problem = await setupProblem(run, ctx, eq, obs)
  if (problem) invalidInput({ [problem.field]: problem.message })
  const source = (await eq.source(obs.sourceId)).row!
  const used = await eq.used(obs)
  return engine(() => computePoint(computationInput(run, ctx, obs, source, used)))
}

/** The message when a run of this kind of instrument asks for a calibration equation, or null when it may. */
export function equationKindProblem(instrument: Instrument): string | null {
  if (EQUATION_KINDS.includes(instrument.kind)) return null
  return `A calibration equation is stated for spot and reference pyrometers (single band); this instrument is a ${INSTRUMENT_KIND_LABELS[instrument.kind].toLowerCase()}`
}

/**
 * The calibration equation through the run's as-left points with its table (shared/calibration/equation.ts),
 * when the run asks for one; null when it does not. A refusal (too few points, a table temperature outside
 * the calibrated range, a kind that has none) is returned with its field, not thrown: the run page shows it
 * while points are still being entered; submission and the certificate refuse it ({@link assertEquation}).
 */
export function runEquation(run: CalibrationRun, ctx: Pick<RunContext, 'instrument' | 'band'>, points: readonly RunPoint[]): RunEquationDTO | null {
  const settings = run.calibrationEquation
  if (!settings) return null
  const kind = equationKindProblem(ctx.instrument)
  if (kind) return { fit: null, problem: { field: EQUATION_FIELD, message: kind } }
  try {
    const fit = equationTable({
      band: ctx.band,
      points: points.filter(p => !p.voidedAt).map(p => ({
        stage: p.stage,
        referenceTemperatureK: p.result.referenceTemperatureK,
        meanReadingK: p.result.meanReadingK,
        expandedUncertaintyK: p.result.budget.statedUncertaintyK,
        // the CMC is stated at k = 2 where it replaced the computed U
        coverageFactor: p.result.budget.cmcApplied ? 2 : p.result.budget.coverageFactor,
      })),
      adjusted: !!run.adjusted,
      temperaturesK: settings.temperaturesK,
      pointCorrelation: settings.pointCorrelation ?? 0,
    })
    return { fit, problem: null }
  }
  catch (err) {
    if (!(err instanceof EngineInputError)) throw err
    const message = err.message.startsWith(`${err.field}: `) ? err.message.slice(err.field.length + 2) : err.message
    return { fit: null, problem: { field: err.field, message } }
  }
}
