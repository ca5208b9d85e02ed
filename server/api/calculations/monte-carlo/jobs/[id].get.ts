import { jobIdParamSchema } from '#shared/schemas/jobs'
import { monteCarloJobStatus } from '#server/services/calculations/calculations'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Progress of a Monte Carlo job, and its result when done (only the user who started it). */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'calculation:run')
  const { id } = await getValidatedRouterParams(event, parseWith(jobIdParamSchema))
  return monteCarloJobStatus(user, id)
})
