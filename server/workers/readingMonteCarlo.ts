/**
 * Worker-thread body for Monte Carlo runs of the reading model: the task function of the server's
 * worker pool (server/services/calculations/pool.ts, piscina). It is bundled at build time into one
 * CommonJS string (nuxt.config.ts, virtual module `#bandlight/mc-worker`), which the pool writes to a
 * private temporary file for its threads to load, so the built server needs no separate file.
 *
 * The model is the plan's (shared/calibration/monteCarloPlan.ts planReadingModel): the reading model
 * through a signal table for a tabulated band, or the radiance-temperature model, plus the output
 * terms; all inputs, correlated pairs included, are sampled together (compileInputs(inputs, correlations)).
 * A thread keeps the last few models it prepared (by their JSON), so the chunks of one run and later
 * runs of the same band prepare its table once per thread.
 * Modes: `chunk` runs trials [start, end) of one seed (chunks of several tasks join into exactly one
 * run) and answers the values; `adaptive` runs the whole adaptive procedure of JCGM 101 7.9 here and
 * answers its summary; `summary` sorts the joined values and summarizes them (off the request thread).
 * Progress goes to the task's `port` as `{ type: 'progress', done, total? }`. The answer is
 * `{ ok: true, values | result | summary }` or `{ ok: false, field, message }` (an input the engine refused).
 */
import type { MessagePort } from 'node:worker_threads'
import { planReadingModel, type McModelSpec } from '#shared/calibration/monteCarloPlan'
import { EngineInputError } from '#shared/radiometry/errors'
import { compileInputs, runMonteCarlo, runMonteCarloChunk, summarizeMonteCarlo, type AdaptiveOptions, type MonteCarloCorrelation, type MonteCarloInput, type MonteCarloResult, type MonteCarloSummary } from '#shared/uncertainty/montecarlo'

interface Common {
  model: McModelSpec
  /** The model inputs in the model's order, then the output terms. */
  inputs: MonteCarloInput[]
  /** Correlated pairs, indices into `inputs`. */
  correlations: MonteCarloCorrelation[]
  seed: number
}

export type McWorkerData =
  | (Common & {
    mode: 'chunk'
    /** Trials [start, end) of the run; chunks of one seed join into exactly one run. */
    start: number
    end: number
    /** Trials between progress messages. */
    chunk: number
  })
  | (Common & {
    mode: 'adaptive'
    adaptive: AdaptiveOptions
    coverageProbability: number
  })

/** A pool task: a run's part (with a port for progress), or the summary of a run's values. */
export type McTask =
  | (McWorkerData & { port?: MessagePort })
  | { mode: 'summary', values: Float64Array, coverageProbability: number }

export type McAnswer =
  | { ok: true, values?: Float64Array, result?: MonteCarloResult, summary?: MonteCarloSummary }
  | { ok: false, field: string | null, message: string }

/** Models prepared on this thread, by their spec's JSON (most recently used last). */
const prepared = new Map<string, (x: Float64Array) => number>()
const PREPARED_MAX = 8

function modelFor(spec: McModelSpec): (x: Float64Array) => number {
  const key = JSON.stringify(spec)
  let model = prepared.get(key)
  if (model) prepared.delete(key)
  else model = planReadingModel(spec)
  prepared.set(key, model)
  if (prepared.size > PREPARED_MAX) prepared.delete(prepared.keys().next().value!)
  return model
}

/**
 * Runs one task.
 * @param task - a run's chunk, an adaptive run or a summary
 * @returns the values, the adaptive result or the summary; or the engine's refusal with its field
 */
export default function runTask(task: McTask): McAnswer {
  try {
    if (task.mode === 'summary') return { ok: true, summary: summarizeMonteCarlo(task.values, task.coverageProbability) }
    const model = modelFor(task.model)
    const port = task.port
    if (task.mode === 'adaptive') {
      const result = runMonteCarlo(model, task.inputs, {
        seed: task.seed,
        coverageProbability: task.coverageProbability,
        correlations: task.correlations,
        adaptive: task.adaptive,
        chunkTrials: 65_536,
        onProgress: (done, total) => port?.postMessage({ type: 'progress', done, total }),
      })
      return { ok: true, result }
    }
    const compiled = compileInputs(task.inputs, task.correlations)
    const values = new Float64Array(task.end - task.start)
    for (let s = task.start; s < task.end; s += task.chunk) {
      const e = Math.min(task.end, s + task.chunk)
      values.set(runMonteCarloChunk(model, compiled, task.seed, s, e), s - task.start)
      port?.postMessage({ type: 'progress', done: e - task.start })
    }
    return { ok: true, values }
  }
  catch (err) {
    if (err instanceof EngineInputError) return { ok: false, field: err.field, message: err.message }
    return { ok: false, field: null, message: err instanceof Error ? err.message : String(err) }
  }
  finally {
    if (task.mode !== 'summary') task.port?.close()
  }
}
