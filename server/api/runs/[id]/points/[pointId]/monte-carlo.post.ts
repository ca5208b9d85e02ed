import { pointMonteCarloSchema, pointParamSchema } from '#shared/schemas/run'
import { requirePermission } from '#server/utils/access'
import { startPointMonteCarlo } from '#server/services/runs/monteCarlo'
import { parseWith } from '#server/utils/validation'

/** Start a Monte Carlo check of a point (202 { id }); poll GET /api/calculations/monte-carlo/jobs/{id}. */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'run:edit')
  const { id, pointId } = await getValidatedRouterParams(event, parseWith(pointParamSchema))
  const input = await readValidatedBody(event, parseWith(pointMonteCarloSchema))
  const job = await startPointMonteCarlo(user, id, pointId, input)
  setResponseStatus(event, 202)
  return { id: job.id, status: job.status, done: job.done, total: job.total }
})
