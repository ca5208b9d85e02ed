/**
 * Worker-thread body for Monte Carlo runs of the reading model. It is bundled at build
 * time into a string (nuxt.config.ts, virtual module `#bandlight/mc-worker`) and started
 * with `new Worker(code, { eval: true })`, so it runs off the request thread in the built
 * server without a separate file.
 *
 * The model is the plan's (shared/calibration/monteCarloPlan.ts planReadingModel): the reading model
 * through a signal table for a tabulated band, or the radiance-temperature model, plus the output
 * terms; all inputs, correlated pairs included, are sampled together (compileInputs(inputs, correlations)).
 * Two modes: `chunk` runs trials [start, end) of one seed (chunks of several workers join into exactly
 * one run) and answers the values; `adaptive` runs the whole adaptive procedure of JCGM 101 7.9 on this
 * thread and answers its summary.
 * Messages out: `{ type: 'progress', done, total? }`, `{ type: 'done', values }` (a transferred
 * Float64Array) or `{ type: 'done', result }` (adaptive), or `{ type: 'error', field, message }`.
 */
import { parentPort, workerData } from 'node:worker_threads'
import { planReadingModel, type McModelSpec } from '#shared/calibration/monteCarloPlan'
import { EngineInputError } from '#shared/radiometry/errors'
import { compileInputs, runMonteCarlo, runMonteCarloChunk, type AdaptiveOptions, type MonteCarloCorrelation, type MonteCarloInput } from '#shared/uncertainty/montecarlo'

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

function main() {
  const data = workerData as McWorkerData
  try {
    const model = planReadingModel(data.model)
    if (data.mode === 'adaptive') {
      const result = runMonteCarlo(model, data.inputs, {
        seed: data.seed,
        coverageProbability: data.coverageProbability,
        correlations: data.correlations,
        adaptive: data.adaptive,
        chunkTrials: 65_536,
        onProgress: (done, total) => parentPort!.postMessage({ type: 'progress', done, total }),
      })
      parentPort!.postMessage({ type: 'done', result })
      return
    }
    const compiled = compileInputs(data.inputs, data.correlations)
    const values = new Float64Array(data.end - data.start)
    for (let s = data.start; s < data.end; s += data.chunk) {
      const e = Math.min(data.end, s + data.chunk)
      values.set(runMonteCarloChunk(model, compiled, data.seed, s, e), s - data.start)
      parentPort!.postMessage({ type: 'progress', done: e - data.start })
    }
    parentPort!.postMessage({ type: 'done', values }, [values.buffer])
  }
  catch (err) {
    if (err instanceof EngineInputError) parentPort!.postMessage({ type: 'error', field: err.field, message: err.message })
    else parentPort!.postMessage({ type: 'error', field: null, message: err instanceof Error ? err.message : String(err) })
  }
}

if (parentPort) main()
