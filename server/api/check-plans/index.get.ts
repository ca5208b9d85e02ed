import { checkPlanQuerySchema } from '#shared/schemas/check'
import { listCheckPlans } from '#server/services/checks/checks'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Check plans (active by default), each with its last check, next due date and due state. */
export default defineEventHandler(async (event) => {
  await requirePermission(event, 'check:read')
  const q = await getValidatedQuery(event, parseWith(checkPlanQuerySchema))
  return await listCheckPlans(q)
})
