/**
 * Worker-thread body for Monte Carlo runs of the reading model. It is bundled at build
 * time into a string (nuxt.config.ts, virtual module `#bandlight/mc-worker`) and started
 * with `new Worker(code, { eval: true })`, so it runs off the request thread in the built
 * server without a separate file. Messages out: `{ type: 'progress', done }` (trials of this chunk so far) and
 * `{ type: 'done', values }` (a transferred Float64Array) or `{ type: 'error', field, message }`.
 */
import { parentPort, workerData } from 'node:worker_threads'
import { readingModel } from '#shared/radiometry/reading'
import { EngineInputError } from '#shared/radiometry/errors'
import { compileInputs, runMonteCarloChunk, type MonteCarloInput } from '#shared/uncertainty/montecarlo'
import type { BandInput } from '#shared/schemas/calculation'

export interface McWorkerData {
  band: BandInput
  inputs: MonteCarloInput[]
  /** Trials [start, end) of the run; chunks of one seed join into exactly one run. */
  start: number
  end: number
  seed: number
  /** Trials between progress messages. */
  chunk: number
}

function main() {
  const data = workerData as McWorkerData
  try {
    const model = readingModel(data.band)
    const compiled = compileInputs(data.inputs)
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
