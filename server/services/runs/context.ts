/**
 * What the points of a run are computed with, and the checks before a point is computed: the
 * instrument, its band, the procedure version and the terms agreed with the customer; the
 * reference equipment usable on the calibration date; the procedure fitting the source, the
 * instrument's band and the temperature; the measured conditions the reading model needs.
 * Everything a point states comes from these records — never from a default.
 */
import type { Transaction } from 'sequelize'
import { COMPUTATION_CONDITIONS, CONDITION_LABELS, type PointStage } from '#shared/calibration/constants'
import { computePoint } from '#shared/calibration/compute'
import { kelvinToCelsiusText } from '#shared/format'
import { SOURCE_KIND_LABELS } from '#shared/registers/constants'
import type { PointCreateInput } from '#shared/schemas/run'
import type { BandInput, PointComputationInput, PointResult, RunAgreementDTO } from '#shared/types'
import { BlackbodySource } from '#server/models/BlackbodySource'
import type { CalibrationRun } from '#server/models/CalibrationRun'
import { Instrument } from '#server/models/Instrument'
import { ProcedureVersion } from '#server/models/ProcedureVersion'
import { ReferenceInstrument } from '#server/models/ReferenceInstrument'
import type { RunPoint } from '#server/models/RunPoint'
import { SpectralResponse } from '#server/models/SpectralResponse'
import { engine, invalidInput } from '#server/utils/errors'
import { assertUsableOn } from '#server/services/equipment/usability'
import { agreementOf } from '#server/services/requests/agreement'
import { instrumentBand } from './dto'

/** What every point of a run is computed with. */
export interface RunContext {
  instrument: Instrument
  table: SpectralResponse | null
  band: BandInput
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
  return { instrument, table, band, procedureVersion, agreement: await agreementOf(requestId, t) }
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
  }
}

/** The measured conditions the reading model needs that the run header does not hold yet (400 naming them). */
export function assertComputable(run: CalibrationRun): void {
  const missing = COMPUTATION_CONDITIONS.filter(f => run.get(f) === null || run.get(f) === undefined)
  if (missing.length) {
    invalidInput(Object.fromEntries(missing.map(f => [f, `Enter the ${CONDITION_LABELS[f].toLowerCase()} measured for this run before adding points: the expected reading depends on it`])))
  }
}

/**
 * The computation's input for one point of a run: the agreed terms' decision rule and specification
 * when an agreement is on record (and still stands), the procedure's rule and the instrument's
 * specification otherwise.
 */
export function computationInput(run: CalibrationRun, ctx: RunContext, obs: Observation, source: BlackbodySource): PointComputationInput {
  const pv = ctx.procedureVersion
  const agreed = ctx.agreement?.current ? ctx.agreement : null
  const rule = agreed ? agreed.decisionRule : pv.decisionRule
  return {
    band: ctx.band,
    reference: obs.referenceInstrumentId != null
      ? { kind: 'reference-thermometer', referenceReadingK: obs.referenceReadingK! }
      : { kind: 'source-correction', sourceIndicatedK: obs.sourceIndicatedK!, corrections: source.corrections ?? [] },
    sourceEmissivity: source.emissivity,
    reflectedTemperatureK: run.reflectedTemperatureK!,
    instrumentTemperatureK: run.instrumentTemperatureK!,
    emissivitySetting: run.emissivitySetting!,
    readingsK: [...obs.readingsK],
    resolutionK: ctx.instrument.resolutionK,
    template: pv.template,
    cmc: pv.cmc,
    accuracy: agreed?.specification ?? ctx.instrument.accuracy,
    rule,
    guardBandFactor: rule === 'simple-acceptance' ? null : (agreed ? agreed.guardBandFactor : pv.guardBandFactor) ?? 1,
  }
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
  return {
    point: p.seq,
    ...observationOf(p),
    referenceTemperatureK: p.referenceTemperatureK,
    expectedReadingK: p.expectedReadingK,
    errorK: p.errorK,
    statedUncertaintyK: p.statedUncertaintyK,
    verdict: p.verdict,
    engineVersion: p.engineVersion,
  }
}

/** The reference equipment of an operation, loaded and checked once each. */
export class Equipment {
  private sources = new Map<number, { row: BlackbodySource | null, reason: string | null }>()
  private refs = new Map<number, { row: ReferenceInstrument | null, reason: string | null }>()
  constructor(private readonly t: Transaction | undefined, private readonly date: string) {}

  async source(id: number): Promise<{ row: BlackbodySource | null, reason: string | null }> {
    let hit = this.sources.get(id)
    if (!hit) {
      const row = await BlackbodySource.findByPk(id, { transaction: this.t })
      hit = row ? { row, reason: await assertUsableOn(row, this.date, this.t) } : { row: null, reason: 'No blackbody source with this id' }
      this.sources.set(id, hit)
    }
    return hit
  }

  async reference(id: number): Promise<{ row: ReferenceInstrument | null, reason: string | null }> {
    let hit = this.refs.get(id)
    if (!hit) {
      const row = await ReferenceInstrument.findByPk(id, { transaction: this.t })
      if (!row) hit = { row: null, reason: 'No reference instrument with this id' }
      else if (row.rangeUnit !== 'K') hit = { row, reason: `${row.assetTag} does not measure temperature` }
      else hit = { row, reason: await assertUsableOn(row, this.date, this.t) }
      this.refs.set(id, hit)
    }
    return hit
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
  const band = ctx.band
  const [lo, hi] = band.kind === 'rectangular' ? [band.lambda1Um, band.lambda2Um] : [band.points[0]![0], band.points[band.points.length - 1]![0]]
  if (lo < a.bandMinUm || hi > a.bandMaxUm) {
    return { field: 'procedureVersionId', message: `The instrument's band (${lo}–${hi} µm) is outside the ${a.bandMinUm}–${a.bandMaxUm} µm that procedure ${pv.name} covers` }
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
  return null
}

/** Check the setup and compute one point; 400 naming the field at fault. */
export async function evaluateObservation(run: CalibrationRun, ctx: RunContext, eq: Equipment, obs: Observation): Promise<PointResult> {
  const problem = await setupProblem(run, ctx, eq, obs)
  if (problem) invalidInput({ [problem.field]: problem.message })
  const source = (await eq.source(obs.sourceId)).row!
  return engine(() => computePoint(computationInput(run, ctx, obs, source)))
}
