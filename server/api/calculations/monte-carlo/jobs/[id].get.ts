import { LAB_ROLES } from '../../../../../shared/roles'
import { jobIdParamSchema } from '../../../../../shared/schemas/jobs'
import { notFound, requireRole } from '../../../../utils/access'
import { findJob } from '../../../../utils/jobs'
import { parseWith } from '../../../../utils/validation'

/** Progress of a Monte Carlo job, and its result when done. Only its owner sees it. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, ...LAB_ROLES)
  const { id } = await getValidatedRouterParams(event, parseWith(jobIdParamSchema))
  const job = findJob(id, user.id)
  if (!job) notFound('calculation job')
  return { id: job.id, status: job.status, done: job.done, total: job.total, result: job.result ?? null, error: job.error ?? null }
})
