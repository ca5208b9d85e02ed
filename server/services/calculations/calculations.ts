/**
 * The calculation API's computations (server/api/calculations/*): each validated input straight to
 * the pure engine in shared/, with its refusals turned into 400s naming the field and an overflow
 * into a 400 naming the input that caused it.
 */
import type { BandRadianceInput, BudgetInput, ConformityCalcInput, ExpectedReadingInput, MonteCarloRequest, TemperatureInput } from '#shared/schemas/calculation'
import type { SessionUser } from '#shared/types'
import { bandRadiance } from '#shared/radiometry/planck'
import { temperatureFromRadiance } from '#shared/radiometry/inversion'
import { readingSensitivities } from '#shared/radiometry/reading'
import { evaluateBudget, type BudgetComponent } from '#shared/uncertainty/budget'
import { evaluateConformity } from '#shared/uncertainty/conformity'
import { engine, notFound } from '#server/utils/errors'
import { findJob, startJob } from './jobs'
import { gumForReading, runReadingMonteCarlo } from './monteCarlo'

export function bandRadianceOf(input: BandRadianceInput): { radiance: number } {
  return { radiance: engine(() => bandRadiance(input.band, input.temperatureK), 'temperatureK') }
}

export function temperatureOf(input: TemperatureInput): { temperatureK: number } {
  return { temperatureK: engine(() => temperatureFromRadiance(input.band, input.radiance), 'radiance') }
}

export function expectedReadingOf(input: ExpectedReadingInput) {
  const { expectedReadingK, ...sensitivities } = engine(() => readingSensitivities(input), 'sourceTemperatureK')
  return { expectedReadingK, sensitivities }
}

export function budgetOf(input: BudgetInput) {
  return engine(() => evaluateBudget(input.components, { coverageProbability: input.coverageProbability }), r => budgetOverflowField(input.components, r.contributions))
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
