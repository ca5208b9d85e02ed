/**
 * The process's one pool of Monte Carlo worker threads (piscina), shared by every run — the
 * calculator's synchronous route, its jobs and the points' checks. At most `MC_WORKERS` threads
 * (default: the number of cores, at most 4) compute at once, whatever the number of runs; a run's
 * chunks wait in the pool's queue for a free thread, so many runs at once queue rather than start
 * threads of their own or stall the request thread. Threads stay for a minute after their last task
 * (no start-up per run) and keep the models they prepared (server/workers/readingMonteCarlo.ts).
 * The queue is bounded: past {@link MC_QUEUE_MAX} waiting tasks a run is refused with 503 (try again
 * later), so a flood of requests cannot pile up memory.
 *
 * The worker's code is bundled at build time (virtual module `#bandlight/mc-worker`); piscina loads a
 * file, so it is written once per process into a private temporary folder (mode 0700).
 */
import { createError } from 'h3'
import crypto from 'node:crypto'
import fs from 'node:fs'
import os from 'node:os'
import path from 'node:path'
import { MessageChannel } from 'node:worker_threads'
import Piscina from 'piscina'
import workerCode from '#bandlight/mc-worker'
import type { McAnswer, McTask } from '#server/workers/readingMonteCarlo'
import { config } from '#server/utils/config'

/** Tasks that may wait for a thread before new runs are refused (503). */
export const MC_QUEUE_MAX = 64
/** A thread with nothing to do stops after this long. */
const IDLE_MS = 60_000

/** Threads in the pool: one per core, at most 4 (MC_WORKERS overrides). */
export function monteCarloThreads(): number {
  const n = config().monteCarloWorkers || os.availableParallelism?.() || os.cpus().length
  return Math.min(4, Math.max(1, n))
}

let pool: Piscina | null = null
let folder: string | null = null

function workerFile(): string {
  folder ??= fs.mkdtempSync(path.join(os.tmpdir(), 'bandlight-mc-'))
  const file = path.join(folder, `worker-${crypto.createHash('sha256').update(workerCode).digest('hex').slice(0, 16)}.cjs`)
  if (!fs.existsSync(file)) fs.writeFileSync(file, workerCode, { mode: 0o600 })
  return file
}

/** The pool (made on first use). */
export function monteCarloPool(): Piscina {
  if (!pool) {
    pool = new Piscina({
      filename: workerFile(),
      minThreads: 0,
      maxThreads: monteCarloThreads(),
      maxQueue: MC_QUEUE_MAX,
      idleTimeout: IDLE_MS,
      concurrentTasksPerWorker: 1,
    })
  }
  return pool
}

/** Threads busy and tasks waiting now (for the health route and the benchmark). */
export function monteCarloLoad(): { threads: number, queued: number, maxThreads: number } {
  if (!pool) return { threads: 0, queued: 0, maxThreads: monteCarloThreads() }
  return { threads: pool.threads.length, queued: pool.queueSize, maxThreads: pool.options.maxThreads }
}

function busy() {
  return createError({
    statusCode: 503,
    statusMessage: 'Service Unavailable',
    message: 'The server is running as many Monte Carlo calculations as it can hold; try again in a minute.',
    data: { retryAfterSeconds: 60 },
  })
}

/**
 * Run one task on a pool thread; progress messages of the task reach `onProgress`. Refuses with 503
 * when the queue is full.
 * @param task - the task without its port
 * @param onProgress - called with each progress message
 * @returns the worker's answer
 */
export async function runOnPool(task: McTask, onProgress?: (done: number, total?: number) => void): Promise<McAnswer> {
  const p = monteCarloPool()
  if (task.mode === 'summary') {
    if (p.queueSize >= MC_QUEUE_MAX) throw busy()
    // the values move to the thread (no copy); the caller does not use them afterwards
    return await p.run(task, { transferList: [task.values.buffer as ArrayBuffer] }) as McAnswer
  }
  if (p.queueSize >= MC_QUEUE_MAX) throw busy()
  const { port1, port2 } = new MessageChannel()
  port1.on('message', (msg: { type: 'progress', done: number, total?: number }) => onProgress?.(msg.done, msg.total))
  try {
    return await p.run({ ...task, port: port2 }, { transferList: [port2] }) as McAnswer
  }
  catch (err) {
    if (err instanceof Error && /queue is at limit/i.test(err.message)) throw busy()
    throw err
  }
  finally {
    port1.close()
  }
}
