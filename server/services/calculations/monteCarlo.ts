/**
 * Monte Carlo propagation of distributions through the reading model (JCGM 101), run on the
 * process's worker pool (./pool.ts: at most one thread per core for all runs together, the rest
 * queued) so a 10⁶-trial run never blocks the server — the sort and summary of the values too — then compared with the GUM
 * result for the same inputs (JCGM 101 §8). Two callers: the calculator's five reading-model inputs
 * ({@link runReadingMonteCarlo}) and a stored point's plan ({@link runPlanMonteCarlo}: the point's model
 * inputs and output terms sampled together, correlated pairs jointly; a fixed number of trials over the
 * workers, or the adaptive procedure of JCGM 101 7.9 on one worker).
 */
import { createError } from 'h3'
import { monteCarloPlanInputs, type McModelSpec, type MonteCarloPlan } from '#shared/calibration/monteCarloPlan'
import { resolveConstants } from '#shared/radiometry/constants'
import { expectedReadingK, readingSensitivities } from '#shared/radiometry/reading'
import { evaluateBudget, type BudgetComponent } from '#shared/uncertainty/budget'
import { EngineInputError } from '#shared/radiometry/errors'
import { compileInputs, splitTrials, validateGumResult, type AdaptiveOptions, type MonteCarloCorrelation, type MonteCarloInput, type MonteCarloResult, type MonteCarloSummary } from '#shared/uncertainty/montecarlo'
import type { McDistributionInput, MonteCarloRequest } from '#shared/schemas/calculation'
import type { McAnswer, McWorkerData } from '#server/workers/readingMonteCarlo'
import { engine, engineError } from '#server/utils/errors'
import { monteCarloThreads, runOnPool } from './pool'

const ORDER = ['sourceTemperatureK', 'sourceEmissivity', 'reflectedTemperatureK', 'instrumentTemperatureK', 'emissivitySetting'] as const
const SENSITIVITY_KEY = {
  sourceTemperatureK: 'sourceTemperature',
  sourceEmissivity: 'sourceEmissivity',
  reflectedTemperatureK: 'reflectedTemperature',
  instrumentTemperatureK: 'instrumentTemperature',
  emissivitySetting: 'emissivitySetting',
} as const

export interface ReadingMonteCarloResult {
  trials: number
  seed: number
  coverageProbability: number
  mean: number
  standardUncertainty: number
  coverageInterval: [number, number]
  shortestCoverageInterval: [number, number]
  gum: {
    expectedReadingK: number
    combinedStandardUncertainty: number
    effectiveDegreesOfFreedom: number | null
    coverageFactor: number
    expandedUncertainty: number
    coverageInterval: [number, number]
    sensitivities: Record<string, number>
  }
  validated: boolean
  tolerance: number
  dLow: number | null
  dHigh: number | null
  durationMs: number
  /** The radiation constants used and their c₂, m·K. */
  constants: string
  c2: number
}

function toEngineInput(name: string, d: McDistributionInput): MonteCarloInput {
  switch (d.distribution) {
    case 'normal':
      return { name, distribution: 'normal', value: d.value, standardUncertainty: d.standardUncertainty }
    case 'constant':
      return { name, distribution: 'constant', value: d.value }
    default:
      return { name, distribution: d.distribution, value: d.value, halfWidth: d.halfWidth }
  }
}

function standardUncertainty(d: McDistributionInput): number {
  switch (d.distribution) {
    case 'normal': return d.standardUncertainty
    case 'rectangular': return d.halfWidth / Math.sqrt(3)
    case 'triangular': return d.halfWidth / Math.sqrt(6)
    case 'u-shaped': return d.halfWidth / Math.SQRT2
    case 'constant': return 0
  }
}

/** The GUM (first-order) result for the same inputs, from the analytic sensitivities. */
export function gumForReading(req: MonteCarloRequest) {
  const at = Object.fromEntries(ORDER.map(k => [k, req.inputs[k].value])) as Record<(typeof ORDER)[number], number>
  const point = { band: req.band, ...at, constants: req.constants }
  const sens = engine(() => readingSensitivities(point))
  const components: BudgetComponent[] = ORDER.map(k => ({
    name: k,
    standardUncertainty: standardUncertainty(req.inputs[k]),
    sensitivity: sens[SENSITIVITY_KEY[k]],
  }))
  const budget = engine(() => evaluateBudget(components, { coverageProbability: req.coverageProbability }))
  const y = engine(() => expectedReadingK(point))
  return {
    expectedReadingK: y,
    combinedStandardUncertainty: budget.combinedStandardUncertainty,
    effectiveDegreesOfFreedom: budget.effectiveDegreesOfFreedom,
    coverageFactor: budget.coverageFactor,
    expandedUncertainty: budget.expandedUncertainty,
    coverageInterval: [y - budget.expandedUncertainty, y + budget.expandedUncertainty] as [number, number],
    sensitivities: Object.fromEntries(ORDER.map(k => [SENSITIVITY_KEY[k], sens[SENSITIVITY_KEY[k]]])),
  }
}

/** A part of a run on the pool; an input the engine refused becomes a 400 naming it. */
async function runPart(data: McWorkerData, onProgress: (done: number, total?: number) => void): Promise<Extract<McAnswer, { ok: true }>> {
  const answer = await runOnPool(data, onProgress)
  if (!answer.ok) throw answer.field ? fieldError(answer.field, answer.message) : new Error(answer.message)
  return answer
}

/** The summary of a run's values (sorted on a pool thread); the values are handed over, not copied. */
async function summarize(values: Float64Array, coverageProbability: number): Promise<MonteCarloSummary> {
  const answer = await runOnPool({ mode: 'summary', values, coverageProbability })
  if (!answer.ok) throw engineError(answer.field ? new EngineInputError(answer.field, answer.message) : new Error(answer.message))
  return engine(() => answer.summary!)
}

/** Run trials [0, M) split into one part per pool thread; the values are the same as one run with the seed. */
async function runTrials(model: McModelSpec, inputs: MonteCarloInput[], correlations: MonteCarloCorrelation[], trials: number, seed: number, onProgress?: (done: number, total: number) => void): Promise<Float64Array> {
  const ranges = splitTrials(trials, monteCarloThreads())
  const done = ranges.map(() => 0)
  const chunk = Math.max(8192, Math.ceil(trials / 50))
  const parts = await Promise.all(ranges.map(([start, end], i) =>
    runPart({ mode: 'chunk', model, inputs, correlations, start, end, seed, chunk }, (d) => {
      done[i] = d
      onProgress?.(done.reduce((a, b) => a + b, 0), trials)
    }),
  ))
  const values = new Float64Array(trials)
  ranges.forEach(([start], i) => values.set(parts[i]!.values!, start))
  return values
}

function fieldError(field: string, message: string) {
  const text = message.startsWith(`${field}: `) ? message.slice(field.length + 2) : message
  return createError({
    statusCode: 400,
    statusMessage: 'Validation Error',
    message: `Invalid input: inputs.${field}: ${text}`,
    data: { fields: { [field.startsWith('inputs') ? field : `inputs.${field}`]: text } },
  })
}

/** Run the whole comparison: GUM first (cheap, validates the point), then M trials in the workers. */
export async function runReadingMonteCarlo(req: MonteCarloRequest, onProgress?: (done: number, total: number) => void): Promise<ReadingMonteCarloResult> {
  const started = performance.now()
  const gum = gumForReading(req)
  const inputs = ORDER.map(k => toEngineInput(k, req.inputs[k]))
  const values = await runTrials({ kind: 'reading', band: req.band, constants: req.constants }, inputs, [], req.trials, req.seed, onProgress)
  const summary = await summarize(values, req.coverageProbability)
  const check = gum.combinedStandardUncertainty > 0
    ? validateGumResult({ y: gum.expectedReadingK, U: gum.expandedUncertainty, u: gum.combinedStandardUncertainty }, summary.coverageInterval)
    : { validated: false, tolerance: 0, dLow: null, dHigh: null }
  return {
    trials: summary.trials,
    seed: req.seed,
    coverageProbability: summary.coverageProbability,
    mean: summary.mean,
    standardUncertainty: summary.standardUncertainty,
    coverageInterval: [summary.coverageInterval.low, summary.coverageInterval.high],
    shortestCoverageInterval: [summary.shortestCoverageInterval.low, summary.shortestCoverageInterval.high],
    gum,
    validated: check.validated,
    tolerance: check.tolerance,
    dLow: check.dLow,
    dHigh: check.dHigh,
    durationMs: Math.round(performance.now() - started),
    constants: req.constants,
    c2: resolveConstants(req.constants).c2,
  }
}

/** How a stored point's plan is run. */
export interface PlanMonteCarloOptions {
  /** Trials M of a fixed run (ignored with `adaptive`). */
  trials: number
  seed: number
  coverageProbability: number
  /** The adaptive procedure of JCGM 101 7.9 instead of M trials (n_dig of the tolerance, default 2). */
  adaptive?: AdaptiveOptions | null
}

export interface PlanMonteCarloResult {
  /** Trials run (for an adaptive run: batches × batch size). */
  trials: number
  seed: number
  coverageProbability: number
  mean: number
  standardUncertainty: number
  coverageInterval: [number, number]
  /** JCGM 101 §8 comparison with the plan's GUM result. */
  validated: boolean
  tolerance: number
  dLow: number | null
  dHigh: number | null
  adaptive: { batchTrials: number, batches: number, significantDigits: number, tolerance: number, converged: boolean } | null
  correlations: { between: [number, number], coefficient: number, normalCoefficient: number }[]
  durationMs: number
}

/**
 * A point's Monte Carlo check from its plan (shared/calibration/monteCarloPlan.ts): the model inputs and
 * the output terms in the same trials, correlated pairs sampled jointly; then the JCGM 101 §8 comparison
 * with the GUM result. The inputs are checked here first (a refusal is a 400 before any worker starts).
 */
export async function runPlanMonteCarlo(plan: MonteCarloPlan, options: PlanMonteCarloOptions, onProgress?: (done: number, total: number) => void): Promise<PlanMonteCarloResult> {
  const started = performance.now()
  const { inputs, correlations } = monteCarloPlanInputs(plan)
  const compiled = engine(() => compileInputs(inputs, correlations))
  const stated = compiled.copula?.pairs.map(q => ({ between: [q.i, q.j] as [number, number], coefficient: q.coefficient, normalCoefficient: q.normalCoefficient })) ?? []
  let summary: { trials: number, mean: number, standardUncertainty: number, coverageProbability: number, coverageInterval: { low: number, high: number } }
  let adaptive: PlanMonteCarloResult['adaptive'] = null
  if (options.adaptive) {
    const r: MonteCarloResult = (await runPart(
      { mode: 'adaptive', model: plan.model, inputs, correlations, seed: options.seed, coverageProbability: options.coverageProbability, adaptive: options.adaptive },
      (done, total) => onProgress?.(done, Math.max(total ?? done, done)),
    )).result!
    summary = r
    const a = r.adaptive!
    adaptive = { batchTrials: a.batchTrials, batches: a.batches, significantDigits: a.significantDigits, tolerance: a.tolerance, converged: a.converged }
  }
  else {
    const values = await runTrials(plan.model, inputs, correlations, options.trials, options.seed, onProgress)
    summary = await summarize(values, options.coverageProbability)
  }
  const check = plan.gum.u > 0
    ? validateGumResult({ y: plan.gum.y, U: plan.gum.U, u: plan.gum.u }, summary.coverageInterval)
    : { validated: false, tolerance: 0, dLow: null, dHigh: null }
  return {
    trials: summary.trials,
    seed: options.seed,
    coverageProbability: summary.coverageProbability,
    mean: summary.mean,
    standardUncertainty: summary.standardUncertainty,
    coverageInterval: [summary.coverageInterval.low, summary.coverageInterval.high],
    validated: check.validated,
    tolerance: check.tolerance,
    dLow: check.dLow,
    dHigh: check.dHigh,
    adaptive,
    correlations: stated,
    durationMs: Math.round(performance.now() - started),
  }
}
