/**
 * Long calculations that report progress: the caller starts a job, then polls it.
 * Kept in memory (a restart forgets running jobs), owned by the user who started it,
 * forgotten ten minutes after it ends.
 */
import { createError } from 'h3'
import { randomUUID } from 'node:crypto'

export interface Job<T> {
  id: string
  userId: number
  status: 'running' | 'done' | 'failed'
  done: number
  total: number
  result?: T
  error?: { statusCode: number, message: string, fields?: Record<string, string> }
  startedAt: number
  endedAt?: number
}

const jobs = new Map<string, Job<unknown>>()
const KEEP_MS = 10 * 60_000
const MAX_RUNNING_PER_USER = 2

function sweep(now = Date.now()) {
  for (const [id, j] of jobs) if (j.endedAt && now - j.endedAt > KEEP_MS) jobs.delete(id)
}

export function startJob<T>(userId: number, total: number, work: (progress: (done: number, total: number) => void) => Promise<T>): Job<T> {
  sweep()
  const running = [...jobs.values()].filter(j => j.userId === userId && j.status === 'running').length
  if (running >= MAX_RUNNING_PER_USER) {
    throw createError({ statusCode: 429, statusMessage: 'Too Many Requests', message: `At most ${MAX_RUNNING_PER_USER} calculations at a time; wait for one to finish.` })
  }
  const job: Job<T> = { id: randomUUID(), userId, status: 'running', done: 0, total, startedAt: Date.now() }
  jobs.set(job.id, job as Job<unknown>)
  work((done, t) => {
    job.done = done
    job.total = t
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
      job.endedAt = Date.now()
    })
  return job
}

/** The job if it exists and belongs to the user (otherwise undefined → 404). */
export function findJob(id: string, userId: number): Job<unknown> | undefined {
  const j = jobs.get(id)
  return j && j.userId === userId ? j : undefined
}
