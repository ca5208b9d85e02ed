import { monteCarloSchema } from '#shared/schemas/calculation'
import { monteCarloNow } from '#server/services/calculations/calculations'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Monte Carlo propagation (JCGM 101) for the reading model, compared with the GUM result. */
export default defineEventHandler(async (event) => {
  await requirePermission(event, 'calculation:run')
  return await monteCarloNow(await readValidatedBody(event, parseWith(monteCarloSchema)))
})
