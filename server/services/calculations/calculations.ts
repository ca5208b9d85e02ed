/**
 * The calculation API's computations (server/api/calculations/*): each validated input straight to
 * the pure engine in shared/, with its refusals turned into 400s naming the field and an overflow
 * into a 400 naming the input that caused it. Answers that use Planck's law name the radiation
 * constants used (`constants`, and `c2` in m·K).
 */
import type { BandRadianceInput, BudgetInput, CalibrationEquationRequest, ConformityCalcInput, ExpectedReadingInput, MonteCarloRequest, RatioReadingRequest, TemperatureInput } from '#shared/schemas/calculation'
import type { SessionUser } from '#shared/types'
import { resolveConstants, type RadiationConstantsId } from '#shared/radiometry/constants'
import { EngineInputError } from '#shared/radiometry/errors'
import { bandRadiance, type Band } from '#shared/radiometry/planck'
import { temperatureFromRadiance } from '#shared/radiometry/inversion'
import { expectedReadingFromRadianceTemperature } from '#shared/radiometry/radianceTemperature'
import { readingSensitivities } from '#shared/radiometry/reading'
import { expectedRatioReading } from '#shared/radiometry/ratio'
import { calibrationEquationAtReading, calibrationEquationAtReference, fitCalibrationEquation } from '#shared/radiometry/calibrationEquation'
import { evaluateBudget, type BudgetComponent } from '#shared/uncertainty/budget'
import { evaluateConformity } from '#shared/uncertainty/conformity'
import { engine, notFound } from '#server/utils/errors'
import { findJob, startJob } from './jobs'
import { gumForReading, runReadingMonteCarlo } from './monteCarlo'

/** The constants an answer states: their id and c₂ in m·K. */
function stated(id: RadiationConstantsId): { constants: RadiationConstantsId, c2: number } {
  return { constants: id, c2: resolveConstants(id).c2 }
}

export function bandRadianceOf(input: BandRadianceInput): { radiance: number, constants: RadiationConstantsId, c2: number } {
  return { radiance: engine(() => bandRadiance(input.band, input.temperatureK, input.constants), 'temperatureK'), ...stated(input.constants) }
}

export function temperatureOf(input: TemperatureInput): { temperatureK: number, constants: RadiationConstantsId, c2: number } {
  return { temperatureK: engine(() => temperatureFromRadiance(input.band, input.radiance, { constants: input.constants }), 'radiance'), ...stated(input.constants) }
}

/** Engine field names of the radiance-temperature basis, as the API spells them. */
const RADIANCE_FIELDS: Record<string, string> = {
  radianceTemperatureK: 'sourceRadianceTemperature.temperatureK',
  certificationReflectedTemperatureK: 'sourceRadianceTemperature.reflectedTemperatureK',
}

function apiField(field: string): string {
  if (field.startsWith('radianceTemperatureBand')) return `sourceRadianceTemperature.band${field.slice('radianceTemperatureBand'.length)}`
  return RADIANCE_FIELDS[field] ?? field
}

/**
 * The expected reading with its sensitivities, from the source's temperature T_s or from its certified
 * radiance temperature (then T_s found first, and stated as `sourceTemperatureK`); the constants used.
 */
export function expectedReadingOf(input: ExpectedReadingInput) {
  const { band, sourceEmissivity, reflectedTemperatureK, instrumentTemperatureK, emissivitySetting, constants } = input
  const common = { band: band as Band, sourceEmissivity, reflectedTemperatureK, instrumentTemperatureK, emissivitySetting, constants }
  const rad = input.sourceRadianceTemperature
  if (rad) {
    const r = engine(() => {
      try {
        return expectedReadingFromRadianceTemperature({
          ...common,
          radianceTemperatureBand: rad.band as Band,
          radianceTemperatureK: rad.temperatureK,
          certificationReflectedTemperatureK: rad.reflectedTemperatureK,
        })
      }
      catch (err) {
        if (err instanceof EngineInputError) {
          const text = err.message.startsWith(`${err.field}: `) ? err.message.slice(err.field.length + 2) : err.message
          throw new EngineInputError(apiField(err.field), text)
        }
        throw err
      }
    }, 'sourceRadianceTemperature.temperatureK')
    return { expectedReadingK: r.expectedReadingK, sensitivities: r.sensitivities, sourceTemperatureK: r.sourceTemperatureK, ...stated(constants) }
  }
  const { expectedReadingK, ...sensitivities } = engine(() => readingSensitivities({ ...common, sourceTemperatureK: input.sourceTemperatureK! }), 'sourceTemperatureK')
  return { expectedReadingK, sensitivities, sourceTemperatureK: input.sourceTemperatureK!, ...stated(constants) }
}

/**
 * A ratio (two-colour) pyrometer's expected reading with its sensitivity coefficients (shared/radiometry/ratio.ts):
 * `{ expectedReadingK, sensitivities }` as the contract says, with the constants used.
 */
export function ratioReadingOf(input: RatioReadingRequest) {
  const r = engine(() => expectedRatioReading({ ...input, band1: input.band1 as Band, band2: input.band2 as Band }), 'sourceTemperatureK')
  return { expectedReadingK: r.expectedReadingK, sensitivities: r.sensitivities, ...stated(input.constants) }
}

/** An engine refusal of one value of a list, named by its place in the request (`temperaturesK[2]`). */
function atIndex<T>(field: string, i: number, fn: () => T): T {
  try {
    return fn()
  }
  catch (err) {
    if (err instanceof EngineInputError && err.field === 'temperatureK') {
      throw new EngineInputError(`${field}[${i}]`, err.message.startsWith(`${err.field}: `) ? err.message.slice(err.field.length + 2) : err.message)
    }
    throw err
  }
}

/**
 * A calibration equation through the points (Sakuma–Hattori or straight line, a common correlation r
 * between the points) with the interpolated values at reference temperatures and at readings; a value
 * outside the points' range is a 400 naming it (`temperaturesK[i]`, `readingsK[i]`).
 */
export function calibrationEquationOf(input: CalibrationEquationRequest) {
  const n = input.points.length
  const r = input.pointCorrelation
  return engine(() => {
    const eq = fitCalibrationEquation({
      points: input.points,
      model: input.model,
      ...(input.band ? { band: input.band as Band } : {}),
      ...(r > 0 ? { correlation: Array.from({ length: n }, (_, i) => Array.from({ length: n }, (__, j) => (i === j ? 1 : r))) } : {}),
      coverageFactor: input.coverageFactor,
      constants: input.constants,
    })
    return {
      model: eq.model,
      parameterNames: eq.parameterNames,
      parameters: eq.parameters,
      parameterUnits: eq.parameterUnits,
      parameterStandardUncertainties: eq.parameterStandardUncertainties,
      covariance: eq.covariance,
      nominal: eq.nominal,
      residuals: eq.residuals,
      chiSquared: eq.chiSquared,
      degreesOfFreedom: eq.degreesOfFreedom,
      readingRangeK: eq.readingRangeK,
      referenceRangeK: eq.referenceRangeK,
      coverageFactor: eq.coverageFactor,
      pointCorrelation: r,
      atReference: input.temperaturesK.map((t, i) => atIndex('temperaturesK', i, () => calibrationEquationAtReference(eq, t))),
      atReading: input.readingsK.map((t, i) => atIndex('readingsK', i, () => calibrationEquationAtReading(eq, t))),
      ...stated(input.constants),
    }
  }, 'points')
}

/** A GUM budget, with correlated pairs when given (JCGM 100 5.2.2, eq. (16)). */
export function budgetOf(input: BudgetInput) {
  const options = { coverageProbability: input.coverageProbability, ...(input.correlations?.length ? { correlations: input.correlations } : {}) }
  return engine(() => evaluateBudget(input.components, options), r => budgetOverflowField(input.components, r.contributions))
}

export function conformityOf(input: ConformityCalcInput) {
  return engine(() => evaluateConformity(input), 'error')
}

/** The budget input to blame for an overflow: the component whose |c·u| is largest or not finite. */
export function budgetOverflowField(components: readonly BudgetComponent[], contributions: readonly { contribution: number }[]): string {
  let worst = 0
  let worstValue = -1
  contributions.forEach((c, i) => {
    const v = Number.isFinite(c.contribution) ? Math.abs(c.contribution) : Number.POSITIVE_INFINITY
    if (v > worstValue) {
      worst = i
      worstValue = v
    }
  })
  const c = components[worst]
  if (!c) return 'components'
  const valueField = c.standardUncertainty !== undefined ? 'standardUncertainty' : c.distribution === 'resolution' ? 'resolution' : 'halfWidth'
  const valueSize = Math.abs(Number(c.standardUncertainty ?? c.halfWidth ?? c.resolution ?? 0))
  return `components[${worst}].${Math.abs(c.sensitivity) > valueSize ? 'sensitivity' : valueField}`
}


/** The Monte Carlo check of a reading, at once (the route waits for it). */
export function monteCarloNow(req: MonteCarloRequest) {
  return runReadingMonteCarlo(req)
}

/** Start the Monte Carlo check of a reading as a job the caller polls; an impossible point is refused now (400). */
export async function startMonteCarloJob(user: SessionUser, req: MonteCarloRequest) {
  gumForReading(req)
  const job = await startJob(user.id, req.trials, progress => runReadingMonteCarlo(req, progress))
  return { id: job.id, status: job.status, done: job.done, total: job.total }
}

/** A job's progress and, when done, its result; 404 unless it exists and is the user's. */
export async function monteCarloJobStatus(user: SessionUser, id: string) {
  const job = await findJob(id, user.id)
  if (!job) notFound('calculation job')
  return { id: job.id, status: job.status, done: job.done, total: job.total, result: job.result ?? null, error: job.error ?? null }
}
