import { LAB_ROLES } from '../../../shared/roles'
import { monteCarloSchema } from '../../../shared/schemas/calculation'
import { requireRole } from '../../utils/access'
import { runReadingMonteCarlo } from '../../utils/monteCarlo'
import { parseWith } from '../../utils/validation'

/**
 * Monte Carlo (JCGM 101) for the reading model with distributions on its inputs, compared
 * with the GUM result (§8). Runs in a worker thread; for progress use the jobs routes.
 */
export default defineEventHandler(async (event) => {
  await requireRole(event, ...LAB_ROLES)
  const req = await readValidatedBody(event, parseWith(monteCarloSchema))
  return await runReadingMonteCarlo(req)
})
