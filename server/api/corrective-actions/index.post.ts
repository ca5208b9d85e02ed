import { correctiveActionCreateSchema } from '#shared/schemas/correctiveAction'
import { openCorrectiveAction } from '#server/services/correctiveActions/correctiveActions'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Open a corrective action for a nonconformity or a complaint: the cause and the actions (owner, due date). */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'action:manage')
  const input = await readValidatedBody(event, parseWith(correctiveActionCreateSchema))
  const action = await openCorrectiveAction(user, input)
  setResponseStatus(event, 201)
  return action
})
