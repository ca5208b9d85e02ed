/**
 * Long calculations that report progress: the caller starts a job, then polls it. The job runs on
 * the server instance that started it (in its worker threads) and writes its status, progress and
 * result to the database (table `calculation_jobs`), so a poll answered by any instance sees it.
 * A job is owned by the user who started it and forgotten ten minutes after it ends; a job whose
 * instance stopped (no heartbeat for half a minute) reads as failed.
 */
import { createError } from 'h3'
import { randomUUID } from 'node:crypto'
import { Op } from 'sequelize'
import { CalculationJob, type CalculationJobError } from '#server/models/CalculationJob'
import { serializeWrites } from '#server/utils/db'
import { INSTANCE_ID } from '#server/utils/instance'

export interface Job<T> {
  id: string
  userId: number
  status: 'running' | 'done' | 'failed'
  done: number
  total: number
  result?: T
  error?: CalculationJobError
  startedAt: number
  endedAt?: number
}

const KEEP_MS = 10 * 60_000
const MAX_RUNNING_PER_USER = 2
/** A running job's instance says it is alive this often… */
const HEARTBEAT_MS = 5_000
/** …and a job not heard of for this long is taken to have died with its instance. */
const STALE_MS = 30_000
/** Progress is written at most this often (polls come every 50–200 ms). */
const PROGRESS_EVERY_MS = 100

const LOST: CalculationJobError = { statusCode: 500, message: 'The server instance running this calculation stopped; start it again' }

async function sweep(now = Date.now()): Promise<void> {
  await serializeWrites(() => CalculationJob.destroy({ where: { endedAt: { [Op.lt]: new Date(now - KEEP_MS) } } }))
}

/**
 * Start a job: its row is written before this returns (so a poll on any instance finds it), then
 * `work` runs here and its progress and outcome are written as they come. At most two running
 * jobs per user (429).
 */
export async function startJob<T>(userId: number, total: number, work: (progress: (done: number, total: number) => void) => Promise<T>): Promise<Job<T>> {
  const now = Date.now()
  await sweep(now)
  const running = await CalculationJob.count({ where: { userId, status: 'running', heartbeatAt: { [Op.gt]: new Date(now - STALE_MS) } } })
  if (running >= MAX_RUNNING_PER_USER) {
    throw createError({ statusCode: 429, statusMessage: 'Too Many Requests', message: `At most ${MAX_RUNNING_PER_USER} calculations at a time; wait for one to finish.` })
  }
  const job: Job<T> = { id: randomUUID(), userId, status: 'running', done: 0, total, startedAt: now }
  await serializeWrites(() => CalculationJob.create({
    id: job.id, userId, status: 'running', done: 0, total, result: null, error: null,
    instanceId: INSTANCE_ID, heartbeatAt: new Date(now), startedAt: new Date(now), endedAt: null,
  }))

  // Writes in order, one at a time; progress is dropped while a write is under way (the next one carries it).
  let chain: Promise<unknown> = Promise.resolve()
  let writing = false
  let lastWrite = 0
  const write = (values: Partial<CalculationJob>) => {
    writing = true
    lastWrite = Date.now()
    chain = chain
      .then(() => serializeWrites(() => CalculationJob.update({ ...values, heartbeatAt: new Date() }, { where: { id: job.id } })))
      .catch(err => console.error('[bandlight] calculation job', job.id, err))
      .finally(() => (writing = false))
    return chain
  }
  const heartbeat = setInterval(() => {
    if (!writing) write({})
  }, HEARTBEAT_MS)
  heartbeat.unref()

  work((done, t) => {
    job.done = done
    job.total = t
    if (!writing && Date.now() - lastWrite >= PROGRESS_EVERY_MS) write({ done, total: t })
  })
    .then((result) => {
      job.result = result
      job.status = 'done'
      job.done = job.total
    })
    .catch((err: { statusCode?: number, message?: string, data?: { fields?: Record<string, string> } }) => {
      job.status = 'failed'
      job.error = { statusCode: err.statusCode ?? 500, message: err.message ?? 'The calculation failed', fields: err.data?.fields }
    })
    .finally(() => {
      clearInterval(heartbeat)
      job.endedAt = Date.now()
      write({ status: job.status, done: job.done, total: job.total, result: job.result ?? null, error: job.error ?? null, endedAt: new Date(job.endedAt) })
    })
  return job
}

/** The job if it exists and belongs to the user (otherwise undefined → 404), as any instance sees it. */
export async function findJob(id: string, userId: number): Promise<Job<unknown> | undefined> {
  const row = await CalculationJob.findByPk(id)
  if (!row || row.userId !== userId) return undefined
  const lost = row.status === 'running' && Date.now() - row.heartbeatAt.getTime() > STALE_MS
  return {
    id: row.id,
    userId: row.userId,
    status: lost ? 'failed' : row.status,
    done: row.done,
    total: row.total,
    result: row.result ?? undefined,
    error: lost ? LOST : row.error ?? undefined,
    startedAt: row.startedAt.getTime(),
    endedAt: row.endedAt?.getTime(),
  }
}
