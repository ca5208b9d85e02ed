import { LAB_ROLES } from '../../../../../shared/roles'
import { monteCarloSchema } from '../../../../../shared/schemas/calculation'
import { requireRole } from '../../../../utils/access'
import { startJob } from '../../../../utils/jobs'
import { gumForReading, runReadingMonteCarlo } from '../../../../utils/monteCarlo'
import { parseWith } from '../../../../utils/validation'

/** Start a Monte Carlo run in a worker; poll GET …/jobs/{id} for progress and the result. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, ...LAB_ROLES)
  const req = await readValidatedBody(event, parseWith(monteCarloSchema))
  gumForReading(req) // refuse an impossible point now (400), not later in the job
  const job = startJob(user.id, req.trials, progress => runReadingMonteCarlo(req, progress))
  setResponseStatus(event, 202)
  return { id: job.id, status: job.status, done: job.done, total: job.total }
})
