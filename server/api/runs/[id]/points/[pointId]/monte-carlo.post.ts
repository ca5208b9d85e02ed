import { LAB_ROLES } from '../../../../../../shared/roles'
import { pointMonteCarloSchema, pointParamSchema } from '../../../../../../shared/schemas/run'
import { requireRole } from '../../../../../utils/access'
import { startPointMonteCarlo } from '../../../../../utils/runsMonteCarlo'
import { parseWith } from '../../../../../utils/validation'

/** Start a Monte Carlo check of a point (202 { id }); poll GET /api/calculations/monte-carlo/jobs/{id}. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, ...LAB_ROLES)
  const { id, pointId } = await getValidatedRouterParams(event, parseWith(pointParamSchema))
  const input = await readValidatedBody(event, parseWith(pointMonteCarloSchema))
  const job = await startPointMonteCarlo(user, id, pointId, input)
  setResponseStatus(event, 202)
  return { id: job.id, status: job.status, done: job.done, total: job.total }
})
