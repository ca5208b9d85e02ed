/**
 * Monte Carlo propagation of distributions through the reading model (JCGM 101), run in a
 * worker threads (one per core) so a 10⁶-trial run never blocks the server, then compared with the GUM
 * result for the same inputs (JCGM 101 §8).
 */
import { createError } from 'h3'
import os from 'node:os'
import { Worker } from 'node:worker_threads'
import workerCode from '#bandlight/mc-worker'
import { expectedReadingK, readingSensitivities } from '#shared/radiometry/reading'
import { evaluateBudget, type BudgetComponent } from '#shared/uncertainty/budget'
import { compileInputs, runMonteCarloChunk, splitTrials, summarizeMonteCarlo, validateGumResult, type MonteCarloInput } from '#shared/uncertainty/montecarlo'
import type { McDistributionInput, MonteCarloRequest } from '#shared/schemas/calculation'
import type { McWorkerData } from '#server/workers/readingMonteCarlo'
import { config } from '#server/utils/config'
import { engine } from '#server/utils/errors'

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
  const point = { band: req.band, ...at }
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

function runInWorker(data: McWorkerData, onProgress: (done: number) => void): Promise<Float64Array> {
  return new Promise((resolve, reject) => {
    const worker = new Worker(workerCode, { eval: true, workerData: data })
    let settled = false
    worker.on('message', (msg: { type: string, done?: number, values?: Float64Array, field?: string | null, message?: string }) => {
      if (msg.type === 'progress') onProgress(msg.done!)
      else if (msg.type === 'done') {
        settled = true
        resolve(msg.values!)
        void worker.terminate()
      }
      else if (msg.type === 'error') {
        settled = true
        reject(msg.field ? fieldError(msg.field, msg.message!) : new Error(msg.message))
        void worker.terminate()
      }
    })
    worker.on('error', (err) => {
      if (!settled) reject(err)
    })
    worker.on('exit', (code) => {
      if (!settled) reject(new Error(`Monte Carlo worker stopped (exit ${code})`))
    })
  })
}

/** Workers per run: one per core, at most 4 (MC_WORKERS overrides). */
function workerCount(): number {
  const n = config().monteCarloWorkers || os.availableParallelism?.() || os.cpus().length
  return Math.min(4, Math.max(1, n))
}

/** Run trials [0, M) split over worker threads; the values are the same as one run with the seed. */
async function runTrials(band: McWorkerData['band'], inputs: MonteCarloInput[], trials: number, seed: number, onProgress?: (done: number, total: number) => void): Promise<Float64Array> {
  const ranges = splitTrials(trials, workerCount())
  const done = ranges.map(() => 0)
  const chunk = Math.max(8192, Math.ceil(trials / 50))
  const parts = await Promise.all(ranges.map(([start, end], i) =>
    runInWorker({ band, inputs, start, end, seed, chunk }, (d) => {
      done[i] = d
      onProgress?.(done.reduce((a, b) => a + b, 0), trials)
    }),
  ))
  const values = new Float64Array(trials)
  ranges.forEach(([start], i) => values.set(parts[i]!, start))
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

/** Run the whole comparison: GUM first (cheap, validates the point), then M trials in a worker. */
export async function runReadingMonteCarlo(req: MonteCarloRequest, onProgress?: (done: number, total: number) => void): Promise<ReadingMonteCarloResult> {
  const started = performance.now()
  const gum = gumForReading(req)
  const inputs = ORDER.map(k => toEngineInput(k, req.inputs[k]))
  const values = await runTrials(req.band, inputs, req.trials, req.seed, onProgress)
  const summary = engine(() => summarizeMonteCarlo(values, req.coverageProbability))
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
  }
}

/** Explicit distributions for the reading model (a stored calibration point's budget, not an API body). */
export interface ExplicitReadingMonteCarloRequest {
  band: McWorkerData['band']
  /** One distribution for each model input, in its unit (K or emissivity); names are ignored. */
  inputs: Record<(typeof ORDER)[number], MonteCarloInput>
  /** Independent terms added to the model output (K), e.g. repeatability and resolution of the reading. */
  outputTerms: MonteCarloInput[]
  trials: number
  seed: number
  coverageProbability: number
  /** The GUM result to validate (JCGM 101 §8): estimate y, u(y) and U for the same coverage probability. */
  gum: { y: number, u: number, U: number }
}

export interface ExplicitReadingMonteCarloResult {
  trials: number
  seed: number
  coverageProbability: number
  mean: number
  standardUncertainty: number
  coverageInterval: [number, number]
  validated: boolean
  tolerance: number
  dLow: number | null
  dHigh: number | null
  durationMs: number
}

/**
 * Monte Carlo with explicit input distributions: the five model inputs run through the reading model
 * in the worker threads (same runner as {@link runReadingMonteCarlo}); the output terms are sampled
 * here with an independent seed (they are cheap sums) and added trial by trial; then JCGM 101 §8
 * validation against the given GUM result.
 */
export async function runReadingMonteCarloExplicit(req: ExplicitReadingMonteCarloRequest, onProgress?: (done: number, total: number) => void): Promise<ExplicitReadingMonteCarloResult> {
  const started = performance.now()
  const inputs = ORDER.map(k => ({ ...req.inputs[k], name: k }))
  engine(() => compileInputs(inputs))
  const values = await runTrials(req.band, inputs, req.trials, req.seed, onProgress)
  if (req.outputTerms.length) {
    const compiled = engine(() => compileInputs(req.outputTerms))
    const n = req.outputTerms.length
    const sum = (x: Float64Array) => {
      let s = 0
      for (let i = 0; i < n; i++) s += x[i]!
      return s
    }
    const extra = runMonteCarloChunk(sum, compiled, (req.seed + 0x5bd1e995) % 0x100000000, 0, req.trials)
    for (let i = 0; i < values.length; i++) values[i]! += extra[i]!
  }
  const summary = engine(() => summarizeMonteCarlo(values, req.coverageProbability))
  const check = req.gum.u > 0
    ? validateGumResult({ y: req.gum.y, U: req.gum.U, u: req.gum.u }, summary.coverageInterval)
    : { validated: false, tolerance: 0, dLow: null, dHigh: null }
  return {
    trials: summary.trials,
    seed: req.seed,
    coverageProbability: summary.coverageProbability,
    mean: summary.mean,
    standardUncertainty: summary.standardUncertainty,
    coverageInterval: [summary.coverageInterval.low, summary.coverageInterval.high],
    validated: check.validated,
    tolerance: check.tolerance,
    dLow: check.dLow,
    dHigh: check.dHigh,
    durationMs: Math.round(performance.now() - started),
  }
}
