import { monteCarloSchema } from '#shared/schemas/calculation'
import { startMonteCarloJob } from '#server/services/calculations/calculations'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Start a Monte Carlo check as a job to poll (202). */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'calculation:run')
  const job = await startMonteCarloJob(user, await readValidatedBody(event, parseWith(monteCarloSchema)))
  setResponseStatus(event, 202)
  return job
})
