import { checkResultQuerySchema } from '#shared/schemas/check'
import { listCheckResults } from '#server/services/checks/checks'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Check results, newest first, by item, plan, verdict and period. */
export default defineEventHandler(async (event) => {
  await requirePermission(event, 'check:read')
  const q = await getValidatedQuery(event, parseWith(checkResultQuerySchema))
  return await listCheckResults(q)
})
