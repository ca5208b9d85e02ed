import { idParamSchema } from '#shared/schemas/common'
import { checkPlanUpdateSchema } from '#shared/schemas/check'
import { updateCheckPlan } from '#server/services/checks/checks'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Change a plan's terms, or (de)activate it, with the version last seen. */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'check:plan')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(checkPlanUpdateSchema))
  return await updateCheckPlan(user, id, input)
})
