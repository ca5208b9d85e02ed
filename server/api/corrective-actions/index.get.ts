import { correctiveActionQuerySchema } from '#shared/schemas/correctiveAction'
import { listCorrectiveActions } from '#server/services/correctiveActions/correctiveActions'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Corrective actions, newest first; `overdue=true` for those with an action past its due date. */
export default defineEventHandler(async (event) => {
  await requirePermission(event, 'action:read')
  const q = await getValidatedQuery(event, parseWith(correctiveActionQuerySchema))
  return await listCorrectiveActions(q)
})
