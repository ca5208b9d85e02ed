import { checkPlanCreateSchema } from '#shared/schemas/check'
import { createCheckPlan } from '#server/services/checks/checks'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** A plan of intermediate checks for a source or reference instrument. */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'check:plan')
  const input = await readValidatedBody(event, parseWith(checkPlanCreateSchema))
  const plan = await createCheckPlan(user, input)
  setResponseStatus(event, 201)
  return plan
})
